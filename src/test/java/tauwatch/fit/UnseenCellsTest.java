package tauwatch.fit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.io.InputStream;
import java.util.ArrayList;
import java.util.List;
import java.util.Objects;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import tauwatch.pulse.PulseWindow;

/**
 * The estimator on passive cells it has never seen: interchange CSVs written by {@code
 * src/test/python/unseen/make_unseen.py}, whose transients come from SciPy's analog 4-pole Bessel
 * ({@code scipy.signal.bessel(4, 2π·10 kHz, analog=True, norm='mag')}) applied exactly to the RC
 * cell's current, sampled at 50 kHz under the interchange timing contract. Truth is in each CSV's
 * {@code .truth.json} sidecar.
 */
class UnseenCellsTest {
  private static final String DIR = "/fixtures/unseen/";

  record Fixture(List<PulseWindow> pulses, JsonNode truth) {
    double ra() {
      return truth.get("ra_mohm").asDouble();
    }

    double rin() {
      return truth.get("rin_mohm").asDouble();
    }

    double cm() {
      return truth.get("cm_pf").asDouble();
    }

    double tauMs() {
      return truth.get("tau_ms").asDouble();
    }
  }

  static Fixture load(String stem) throws IOException {
    InterchangeTrace trace = InterchangeTrace.load(DIR + stem + ".csv");
    JsonNode truth;
    try (InputStream in =
        Objects.requireNonNull(
            UnseenCellsTest.class.getResourceAsStream(DIR + stem + ".truth.json"))) {
      truth = new ObjectMapper().readTree(in);
    }
    // The filter cutoff comes from the sidecar, as it would from the device profile.
    return new Fixture(trace.pulses(truth.get("filter_cutoff_hz").asDouble()), truth);
  }

  @ParameterizedTest(name = "{0}: every clean filtered pulse within 2 % (SciPy Bessel reference)")
  @ValueSource(strings = {"cellA", "cellB", "cellC"})
  void cleanFilteredPulsesGiveRaRinCmWithin2Percent(String cell) throws IOException {
    // Tolerance 2 % from the backbone issue; reached ≈ 1e-4 (printed).
    Fixture f = load(cell + "_clean");
    VoltageClampEstimator est = new VoltageClampEstimator();
    double worst = 0;
    assertTrue(f.pulses().size() >= 3);
    for (PulseWindow w : f.pulses()) {
      PulseEstimate e = est.estimate(w);
      assertTrue(e.accepted(), cell + ": " + e);
      worst = Math.max(worst, check(e, Parameter.ACCESS_RESISTANCE, f.ra(), 0.02));
      worst = Math.max(worst, check(e, Parameter.INPUT_RESISTANCE, f.rin(), 0.02));
      worst = Math.max(worst, check(e, Parameter.MEMBRANE_CAPACITANCE, f.cm(), 0.02));
      worst = Math.max(worst, check(e, Parameter.CHARGE_CAPACITANCE, f.cm(), 0.02));
      check(e, Parameter.TIME_CONSTANT, f.tauMs(), 0.02);
      assertEquals(
          f.truth().get("hold_pa").asDouble(), e.value(Parameter.HOLDING_CURRENT), 1e-3, cell);
    }
    System.out.printf("unseen %s clean: worst error %.2e%n", cell, worst);
  }

  @ParameterizedTest(name = "{0}: median over noisy filtered pulses within 5 % (SciPy reference)")
  @ValueSource(strings = {"cellA", "cellB", "cellC"})
  void noisyFilteredPulsesGiveMediansWithin5Percent(String cell) throws IOException {
    // 2.5 pA rms filter-shaped noise, 12 pulses; tolerance 5 % (median) from the backbone issue.
    Fixture f = load(cell + "_noisy");
    VoltageClampEstimator est = new VoltageClampEstimator();
    List<PulseEstimate> ok = new ArrayList<>();
    for (PulseWindow w : f.pulses()) {
      PulseEstimate e = est.estimate(w);
      if (e.accepted()) {
        ok.add(e);
      }
    }
    assertTrue(ok.size() >= 10, cell + ": only " + ok.size() + " accepted");
    double eRa = rel(VoltageClampEstimatorTest.median(ok, Parameter.ACCESS_RESISTANCE), f.ra());
    double eRin = rel(VoltageClampEstimatorTest.median(ok, Parameter.INPUT_RESISTANCE), f.rin());
    double eCm = rel(VoltageClampEstimatorTest.median(ok, Parameter.MEMBRANE_CAPACITANCE), f.cm());
    System.out.printf(
        "unseen %s noisy: median errors Ra %.2f %%, Rin %.2f %%, Cm %.2f %%%n",
        cell, 100 * eRa, 100 * eRin, 100 * eCm);
    assertTrue(eRa < 0.05 && eRin < 0.05 && eCm < 0.05, cell);
  }

  @ParameterizedTest(name = "{0}: ignoring the filter delay reads Ra low by about e^(delay/tau)")
  @ValueSource(strings = {"cellA", "cellB", "cellC"})
  void extrapolatingToTheOnsetItselfReadsRaLowByTheFilterDelay(String cell) throws IOException {
    // Bessel filter theory (CHECKS.md): a 4-pole Bessel delays the transient by ≈ 0.336/f_c, so
    // extrapolating to the onset overestimates I₀ by ≈ e^(delay/τ). Evaluating at onset + delay
    // (GROUP_DELAY) removes it to first order; BESSEL_GAIN (the default) uses H(−1/τ) exactly.
    Fixture f = load(cell + "_clean");
    PulseWindow w = f.pulses().get(0);
    double delayMs = 0.336 / f.truth().get("filter_cutoff_hz").asDouble() * 1e3;
    double plain =
        new VoltageClampEstimator(
                EstimatorOptions.defaults().withFilterCompensation(FilterCompensation.NONE))
            .estimate(w)
            .value(Parameter.ACCESS_RESISTANCE);
    double delayed =
        new VoltageClampEstimator(
                EstimatorOptions.defaults().withFilterCompensation(FilterCompensation.GROUP_DELAY))
            .estimate(w)
            .value(Parameter.ACCESS_RESISTANCE);
    double expectedPlain = f.ra() * Math.exp(-delayMs / f.tauMs());
    System.out.printf(
        "unseen %s: Ra plain %.3f (e^(-d/tau) predicts %.3f), at onset+delay %.3f, truth %.3f%n",
        cell, plain, expectedPlain, delayed, f.ra());
    assertEquals(expectedPlain, plain, 0.02 * f.ra(), "plain extrapolation");
    // The correction matters: without it every cell misses the 2 % tolerance (by 4–16 % here).
    assertTrue(plain < 0.97 * f.ra(), "plain Ra " + plain + " should miss the 2 % tolerance");
    assertEquals(f.ra(), delayed, 0.02 * f.ra(), "extrapolated to onset + group delay");
  }

  @ParameterizedTest(name = "{0}: the naive peak readout reads Ra high on filtered pulses")
  @ValueSource(strings = {"cellA", "cellB", "cellC"})
  void peakReadoutReadsRaHigh(String cell) throws IOException {
    // Common practice (CHECKS.md): the raw peak of a filtered, sampled transient is below I₀.
    Fixture f = load(cell + "_clean");
    double ra = new PeakReadout().estimate(f.pulses().get(0)).value(Parameter.ACCESS_RESISTANCE);
    assertTrue(ra > 1.05 * f.ra(), cell + ": peak Ra " + ra);
  }

  private static double rel(double got, double want) {
    return Math.abs(got / want - 1);
  }

  private static double check(PulseEstimate e, Parameter p, double want, double tol) {
    double err = rel(e.value(p), want);
    assertTrue(err < tol, p + " " + e.value(p) + " vs " + want + " (" + e + ")");
    return err;
  }
}
