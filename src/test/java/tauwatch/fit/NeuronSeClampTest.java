package tauwatch.fit;

import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.io.InputStream;
import java.util.ArrayList;
import java.util.List;
import java.util.Objects;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import tauwatch.pulse.PulseWindow;

/**
 * The estimator on traces simulated independently by NEURON 8.2.2: a passive soma under SEClamp
 * with series resistance rs ({@code src/test/python/neuron/passive_seclamp.py}; fixtures under
 * {@code fixtures/neuron}, NEURON's version in each sidecar). Truth: Ra = rs, Rin = 1/(g_pas·area),
 * Cm = cm·area with cm = 1 µF/cm² (Hille 2001; Gentet et al. 2000 — from memory).
 */
class NeuronSeClampTest {
  private static final String DIR = "/fixtures/neuron/";

  private static JsonNode sidecar(String stem) throws IOException {
    try (InputStream in =
        Objects.requireNonNull(NeuronSeClampTest.class.getResourceAsStream(DIR + stem + ".json"))) {
      return new ObjectMapper().readTree(in);
    }
  }

  private static double rel(double got, double want) {
    return Math.abs(got / want - 1);
  }

  @ParameterizedTest(name = "{0}: NEURON SEClamp soma gives Ra, Rin, Cm within 2 %")
  @ValueSource(strings = {"soma20", "soma30", "soma60"})
  void recoversTheNeuronCellWithin2Percent(String cell) throws IOException {
    // Tolerance 2 % from the backbone issue; NEURON's backward Euler at dt = 0.5 µs lengthens τ by
    // ≈ dt/2 (< 0.1 %), so the reached error is printed.
    JsonNode truth = sidecar(cell + "_clean");
    List<PulseWindow> pulses =
        InterchangeTrace.load(DIR + cell + "_clean.csv")
            .pulses(truth.get("filter_cutoff_hz").asDouble());
    assertTrue(pulses.size() >= 3);
    VoltageClampEstimator est = new VoltageClampEstimator();
    double worst = 0;
    for (PulseWindow w : pulses) {
      PulseEstimate e = est.estimate(w);
      assertTrue(e.accepted(), cell + ": " + e);
      double eRa = rel(e.value(Parameter.ACCESS_RESISTANCE), truth.get("ra_mohm").asDouble());
      double eRin = rel(e.value(Parameter.INPUT_RESISTANCE), truth.get("rin_mohm").asDouble());
      double eCm = rel(e.value(Parameter.MEMBRANE_CAPACITANCE), truth.get("cm_pf").asDouble());
      double eCq = rel(e.value(Parameter.CHARGE_CAPACITANCE), truth.get("cm_pf").asDouble());
      assertTrue(eRa < 0.02 && eRin < 0.02 && eCm < 0.02 && eCq < 0.02, cell + ": " + e);
      worst = Math.max(worst, Math.max(Math.max(eRa, eRin), Math.max(eCm, eCq)));
    }
    System.out.printf("NEURON %s clean: worst error %.2e%n", cell, worst);
  }

  @Test
  void recoversTheFilteredNoisyNeuronCellWithin5PercentMedian() throws IOException {
    // The NEURON current through SciPy's analog 4-pole Bessel (10 kHz) plus 2.5 pA rms noise;
    // tolerance 5 % on the median over 12 pulses (backbone issue).
    JsonNode truth = sidecar("soma30_filtered_noisy");
    List<PulseWindow> pulses =
        InterchangeTrace.load(DIR + "soma30_filtered_noisy.csv")
            .pulses(truth.get("filter_cutoff_hz").asDouble());
    VoltageClampEstimator est = new VoltageClampEstimator();
    List<PulseEstimate> ok = new ArrayList<>();
    for (PulseWindow w : pulses) {
      PulseEstimate e = est.estimate(w);
      if (e.accepted()) {
        ok.add(e);
      }
    }
    assertTrue(ok.size() >= 10, "only " + ok.size() + " of " + pulses.size() + " accepted");
    double eRa =
        rel(
            VoltageClampEstimatorTest.median(ok, Parameter.ACCESS_RESISTANCE),
            truth.get("ra_mohm").asDouble());
    double eRin =
        rel(
            VoltageClampEstimatorTest.median(ok, Parameter.INPUT_RESISTANCE),
            truth.get("rin_mohm").asDouble());
    double eCm =
        rel(
            VoltageClampEstimatorTest.median(ok, Parameter.MEMBRANE_CAPACITANCE),
            truth.get("cm_pf").asDouble());
    System.out.printf(
        "NEURON soma30 filtered+noisy: median errors Ra %.2f %%, Rin %.2f %%, Cm %.2f %%%n",
        100 * eRa, 100 * eRin, 100 * eCm);
    assertTrue(eRa < 0.05 && eRin < 0.05 && eCm < 0.05);
  }
}
