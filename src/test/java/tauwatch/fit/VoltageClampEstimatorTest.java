package tauwatch.fit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;
import tauwatch.pulse.PulseWindow;
import tauwatch.stream.ClampMode;

/**
 * The estimator against the analytic voltage-clamp transient of CHECKS.md (Gillis 1995 in Sakmann
 * &amp; Neher, Single-Channel Recording; from memory), sampled under the interchange timing
 * contract, over the grid of common practice: Ra 5–40 MΩ, Rin 100 MΩ–2 GΩ, Cm 5–200 pF.
 */
class VoltageClampEstimatorTest {
  private static final double[] RA = {5, 10, 20, 40};
  private static final double[] RIN = {100, 300, 1000, 2000};
  private static final double[] CM = {5, 20, 60, 200};

  private static AnalyticVcPulse cell(double ra, double rin, double cm, double rateHz) {
    AnalyticVcPulse a = new AnalyticVcPulse().cell(ra, rin, cm);
    a.sampleRateHz = rateHz;
    // A lab lengthens the pulse for slow cells; keep ≥ 12 τ so the transient decays in the step.
    a.stepMs = Math.max(10, 12 * a.tauMs());
    a.afterMs = a.stepMs;
    return a;
  }

  private static double rel(double got, double want) {
    return Math.abs(got / want - 1);
  }

  @Test
  void recoversRaRinCmOfCleanAnalyticTransientsOverTheGridWithin2Percent() {
    // Tolerance 2 % from the backbone issue; reached: ≤ 1e-5 (LM stopping tolerance) for Ra, Rin,
    // Cm at 20, 50 and 100 kHz. Cm(Q) uses trapezoidal sums whose bias is (h/2τ)·coth(h/2τ) − 1
    // (standard quadrature error), so it is held to 2 % only where τ ≥ 5 samples.
    VoltageClampEstimator est = new VoltageClampEstimator();
    double worst = 0;
    for (double rate : new double[] {20_000, 50_000, 100_000}) {
      for (double ra : RA) {
        for (double rin : RIN) {
          for (double cm : CM) {
            AnalyticVcPulse a = cell(ra, rin, cm, rate);
            PulseEstimate e = est.estimate(a.window());
            String where = rate + " Hz, Ra " + ra + ", Rin " + rin + ", Cm " + cm + ": " + e;
            assertTrue(e.accepted(), where);
            assertEquals(ra, e.value(Parameter.ACCESS_RESISTANCE), 1e-5 * ra, where);
            assertEquals(rin, e.value(Parameter.INPUT_RESISTANCE), 1e-5 * rin, where);
            assertEquals(ra + rin, e.value(Parameter.TOTAL_RESISTANCE), 1e-5 * (ra + rin), where);
            assertEquals(cm, e.value(Parameter.MEMBRANE_CAPACITANCE), 1e-5 * cm, where);
            assertEquals(a.tauMs(), e.value(Parameter.TIME_CONSTANT), 1e-5 * a.tauMs(), where);
            assertEquals(a.holdPa, e.value(Parameter.HOLDING_CURRENT), 1e-9, where);
            if (a.tauMs() >= 5 * 1000 / rate) {
              assertEquals(cm, e.value(Parameter.CHARGE_CAPACITANCE), 0.02 * cm, where);
            }
            worst = Math.max(worst, rel(e.value(Parameter.ACCESS_RESISTANCE), ra));
          }
        }
      }
    }
    System.out.printf("clean grid: worst |Ra error| %.1e%n", worst);
  }

  @Test
  void medianOverNoisyPulsesIsWithin5PercentAt2point5PaRmsNoise() {
    // 2.5 pA rms white Gaussian noise (CHECKS.md: 1–5 pA rms, common practice), fixed seed, median
    // over 25 pulses per cell; tolerance 5 % from the backbone issue. The worst median error seen
    // is printed; Rin at 2 GΩ (a 2.5 pA steady-state step) is the hardest.
    VoltageClampEstimator est = new VoltageClampEstimator();
    Random rng = new Random(20_26);
    double worst = 0;
    for (double ra : new double[] {5, 15, 40}) {
      for (double rin : new double[] {100, 500, 2000}) {
        for (double cm : new double[] {5, 30, 200}) {
          AnalyticVcPulse a = cell(ra, rin, cm, 50_000);
          a.noisePa = 2.5;
          List<PulseEstimate> got = new ArrayList<>();
          for (int p = 0; p < 25; p++) {
            PulseEstimate e = est.estimate(a.window(rng));
            if (e.accepted()) {
              got.add(e);
            }
          }
          String where = "Ra " + ra + ", Rin " + rin + ", Cm " + cm;
          assertTrue(got.size() >= 20, where + ": only " + got.size() + " of 25 accepted");
          double eRa = rel(median(got, Parameter.ACCESS_RESISTANCE), ra);
          double eRin = rel(median(got, Parameter.INPUT_RESISTANCE), rin);
          double eCm = rel(median(got, Parameter.MEMBRANE_CAPACITANCE), cm);
          assertTrue(eRa < 0.05, where + ": Ra off by " + eRa);
          assertTrue(eRin < 0.05, where + ": Rin off by " + eRin);
          assertTrue(eCm < 0.05, where + ": Cm off by " + eCm);
          worst = Math.max(worst, Math.max(eRa, Math.max(eRin, eCm)));
        }
      }
    }
    System.out.printf("noisy grid (2.5 pA rms): worst median error %.2f %%%n", 100 * worst);
  }

  @Test
  void standardErrorsMatchTheScatterOverNoisyPulses() {
    // The fit's standard errors (Commons Math covariance scaled by RSS/(n − p), STACK.md) should
    // describe the pulse-to-pulse scatter: within a factor 1.5 of the sample standard deviation
    // over 200 pulses (delta method; the tolerance allows for its first-order approximation).
    VoltageClampEstimator est = new VoltageClampEstimator();
    AnalyticVcPulse a = cell(15, 500, 30, 50_000);
    a.noisePa = 2.5;
    Random rng = new Random(7);
    for (Parameter p :
        new Parameter[] {
          Parameter.ACCESS_RESISTANCE, Parameter.INPUT_RESISTANCE, Parameter.MEMBRANE_CAPACITANCE
        }) {
      double[] v = new double[200];
      double seSum = 0;
      for (int i = 0; i < v.length; i++) {
        PulseEstimate e = est.estimate(a.window(rng));
        v[i] = e.value(p);
        seSum += e.standardError(p);
      }
      double sd = sd(v);
      double se = seSum / v.length;
      assertTrue(
          se > sd / 1.5 && se < sd * 1.5, p + ": standard error " + se + " vs scatter " + sd);
    }
  }

  @Test
  void peakReadoutReadsRaHighOnASampledTransient() {
    // Common practice (CHECKS.md): the raw peak of a sampled transient is smaller than I₀, so a
    // peak-based Ra reads high; here by e^(dt/τ) since the first sample is dt after the onset.
    AnalyticVcPulse a = cell(10, 500, 30, 50_000);
    PulseEstimate naive = new PeakReadout().estimate(a.window());
    double expected = 10 * Math.exp(0.02 / a.tauMs());
    assertEquals(expected, naive.value(Parameter.ACCESS_RESISTANCE), 0.01 * expected);
    assertTrue(naive.value(Parameter.ACCESS_RESISTANCE) > 10.3);
  }

  @Test
  void rejectsAWindowThatSpansAGap() {
    PulseWindow w = cell(10, 500, 30, 50_000).window();
    w.spansGap = true;
    PulseEstimate e = new VoltageClampEstimator().estimate(w);
    assertFalse(e.accepted());
    assertTrue(e.rejectReason().contains("gap"), e.rejectReason());
  }

  @Test
  void rejectsAStepTooSmallToMeasure() {
    AnalyticVcPulse a = cell(10, 500, 30, 50_000);
    a.stepMv = -0.2;
    PulseEstimate e = new VoltageClampEstimator().estimate(a.window());
    assertFalse(e.accepted());
    assertTrue(e.rejectReason().contains("step"), e.rejectReason());
  }

  @Test
  void rejectsATransientThatDoesNotDecayWithinTheStep() {
    AnalyticVcPulse a = new AnalyticVcPulse().cell(40, 2000, 200); // τ ≈ 7.8 ms, step 10 ms
    PulseEstimate e = new VoltageClampEstimator().estimate(a.window());
    assertFalse(e.accepted());
    assertNotNull(e.rejectReason());
  }

  @Test
  void rejectsACurrentClampWindowAndNonFiniteSamples() {
    PulseWindow w = cell(10, 500, 30, 50_000).window();
    w.mode = ClampMode.CURRENT_CLAMP;
    assertFalse(new VoltageClampEstimator().estimate(w).accepted());
    PulseWindow v = cell(10, 500, 30, 50_000).window();
    v.response[v.onsetIndex + 40] = Double.NaN;
    PulseEstimate e = new VoltageClampEstimator().estimate(v);
    assertFalse(e.accepted());
    assertTrue(e.rejectReason().contains("non-finite"), e.rejectReason());
  }

  @Test
  void rejectsAPulseWithASynapticEventOnItsTransient() {
    // A 60 pA inward event riding on the off-transient is not an RC response: the off-fit's
    // residual or its disagreement with the on-fit must reject it, never average it in.
    AnalyticVcPulse a = cell(10, 500, 30, 50_000);
    a.noisePa = 2;
    PulseWindow w = a.window(new Random(3));
    for (int i = 0; i < 150; i++) {
      double t = i * 0.02;
      w.response[w.offsetIndex + 5 + i] -= 60 * (Math.exp(-t / 1.0) - Math.exp(-t / 0.2));
    }
    PulseEstimate e = new VoltageClampEstimator().estimate(w);
    assertFalse(e.accepted(), e.toString());
    System.out.println("synaptic event rejected: " + e.rejectReason());
  }

  @Test
  void rejectsAFlatResponseWithNoTransient() {
    // A step on the command with no current response (an open-circuit headstage, say).
    AnalyticVcPulse a = cell(10, 500, 30, 50_000);
    a.noisePa = 2;
    PulseWindow w = a.window(new Random(9));
    Random rng = new Random(10);
    for (int i = 0; i < w.length; i++) {
      w.response[i] = -20 + 2 * rng.nextGaussian();
    }
    PulseEstimate e = new VoltageClampEstimator().estimate(w);
    assertFalse(e.accepted(), e.toString());
    System.out.println("flat response rejected: " + e.rejectReason());
  }

  @Test
  void rejectsWhenTheOffTransientDisagreesWithTheOnTransient() {
    // The off-transient's capacitive part scaled by 1.4 (as if Ra changed within the pulse): each
    // fit is a clean exponential, so only the on/off comparison can catch it.
    AnalyticVcPulse a = cell(10, 500, 30, 50_000);
    a.noisePa = 1;
    PulseWindow w = a.window(new Random(4));
    AnalyticVcPulse clean = cell(10, 500, 30, 50_000);
    PulseWindow c = clean.window();
    double iss = c.response[w.onsetIndex - 1];
    for (int i = w.offsetIndex + 1; i < w.length; i++) {
      w.response[i] += 0.4 * (c.response[i] - iss);
    }
    PulseEstimate e = new VoltageClampEstimator().estimate(w);
    assertFalse(e.accepted(), e.toString());
    assertTrue(e.rejectReason().contains("disagree"), e.rejectReason());
  }

  @Test
  void fitsATwoCompartmentTransientWithTwoExponentials() {
    // A slow second exponential (a dendrite charging through its axial resistance, Rall's cable
    // theory, CHECKS.md) of 40 pA, τ 3 ms, on a 1 pA-noise trace: not mono-exponential, so the
    // F-test picks two exponentials and reads both time constants.
    AnalyticVcPulse a = cell(10, 500, 30, 50_000);
    a.stepMs = 20;
    a.afterMs = 20;
    a.noisePa = 1;
    PulseWindow w = a.window(new Random(6));
    for (int i = w.onsetIndex + 1; i < w.length; i++) {
      double t = w.timeFromOnsetS(i);
      double tOff = t - w.stepSamples() * w.sampleIntervalS;
      w.response[i] -= 40 * (Math.exp(-t / 3e-3) - (tOff > 0 ? Math.exp(-tOff / 3e-3) : 0));
    }
    PulseEstimate e = new VoltageClampEstimator().estimate(w);
    assertTrue(e.accepted(), e.toString());
    assertEquals("bi", e.model());
    // τ_fast = Ra·Rin·Cm/(Ra + Rin) of the RC cell (CHECKS.md), τ_slow the added 3 ms.
    assertEquals(10 * 500 * 30e-3 / 510, e.value(Parameter.FAST_TIME_CONSTANT), 0.05 * 0.294);
    assertEquals(3.0, e.value(Parameter.SLOW_TIME_CONSTANT), 0.05 * 3);
    // The onset current gains the slow component's 40 pA: Ra = 5 mV / (500 + 40) pA.
    assertEquals(5000.0 / 540, e.value(Parameter.ACCESS_RESISTANCE), 0.02 * 9.26);
  }

  @Test
  void rejectsImplausibleAccessResistance() {
    AnalyticVcPulse a = cell(10, 500, 30, 50_000);
    EstimatorOptions strict =
        EstimatorOptions.defaults().toBuilder().maxRaMOhm(8).residualFloorFraction(0.01).build();
    PulseEstimate e = new VoltageClampEstimator(strict).estimate(a.window());
    assertFalse(e.accepted());
    assertTrue(e.rejectReason().startsWith("Ra"), e.rejectReason());
  }

  @Test
  void optionsNameTheKeyThatIsOutOfRange() {
    IllegalArgumentException x =
        org.junit.jupiter.api.Assertions.assertThrows(
            IllegalArgumentException.class,
            () ->
                EstimatorOptions.defaults().toBuilder()
                    .filterCompensation(FilterCompensation.NONE)
                    .baselineFraction(1.5)
                    .build());
    assertTrue(x.getMessage().contains("baselineFraction"), x.getMessage());
  }

  @Test
  void printsMicrosecondsPerPulse() {
    // Not asserted (speed belongs in benchmarks): printed for the report. 50 kHz, 10 ms step and
    // 10 ms after, on + off fits.
    VoltageClampEstimator est = new VoltageClampEstimator();
    AnalyticVcPulse a = cell(10, 500, 30, 50_000);
    a.noisePa = 2.5;
    PulseWindow[] ws = new PulseWindow[20];
    Random rng = new Random(5);
    for (int i = 0; i < ws.length; i++) {
      ws[i] = a.window(rng);
    }
    double sink = 0;
    for (int i = 0; i < 2000; i++) {
      sink += est.estimate(ws[i % ws.length]).value(Parameter.ACCESS_RESISTANCE);
    }
    long t0 = System.nanoTime();
    int n = 2000;
    for (int i = 0; i < n; i++) {
      sink += est.estimate(ws[i % ws.length]).value(Parameter.ACCESS_RESISTANCE);
    }
    double us = (System.nanoTime() - t0) / 1e3 / n;
    System.out.printf("VoltageClampEstimator: %.0f µs per pulse (checksum %.1f)%n", us, sink);
  }

  static double median(List<PulseEstimate> es, Parameter p) {
    double[] v = es.stream().mapToDouble(e -> e.value(p)).toArray();
    Arrays.sort(v);
    int n = v.length;
    return n % 2 == 1 ? v[n / 2] : 0.5 * (v[n / 2 - 1] + v[n / 2]);
  }

  private static double sd(double[] v) {
    double m = Arrays.stream(v).average().orElse(Double.NaN);
    double s = 0;
    for (double x : v) {
      s += (x - m) * (x - m);
    }
    return Math.sqrt(s / (v.length - 1));
  }
}
