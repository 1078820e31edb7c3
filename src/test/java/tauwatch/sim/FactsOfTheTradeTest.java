package tauwatch.sim;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/**
 * The unfiltered, noiseless simulated cell against the textbook voltage-clamp transient (CHECKS.md:
 * I(t) = I_∞ + (I_0 − I_∞)e^(−t/τ), I_0 = ΔV/Ra, I_∞ = ΔV/(Ra + Rm), τ = Ra·Rm·Cm/(Ra + Rm); Gillis
 * in Sakmann & Neher, Single-Channel Recording, 1995 — from memory) and Ohm's law.
 */
class FactsOfTheTradeTest {
  // Ra 10 MΩ, Rm 240 MΩ, Cm 25 pF: τ = (Ra ∥ Rm)·Cm = 9.6 MΩ · 25 pF = 0.24 ms = 24 samples at 100
  // kHz.
  private static final double FS = 100_000;
  private static final CellParameters CELL = CellParameters.soma(10, 240, 25, -65);
  private static final TestPulseProtocol PROTOCOL = new TestPulseProtocol(-70, -5, 10, 50, 5);
  private static final int ONSET = 500; // 5 ms at 100 kHz
  private static final int TAU_SAMPLES = 24;

  private static double[] run(CellParameters cell, int n) {
    Scenario s =
        new Scenario(
            "facts",
            "",
            1,
            1,
            PROTOCOL,
            AmplifierSettings.ideal(FS),
            ParameterSchedule.constant(cell));
    double[] cmd = new double[n];
    double[] im = new double[n];
    new SimulatedRecording(s, 1).fill(cmd, im, 0, n);
    return im;
  }

  @Test
  void transientHasGoneSixtyThreePercentOfTheWayAtOneTau() {
    // 1 − 1/e = 0.632 at t = τ (circuit theory; rule of thumb of the trade).
    double[] im = run(CELL, 2000);
    double hold = im[ONSET];
    double i0 = hold + (-5.0 / 0.010); // ΔV/Ra in pA with Ra in GΩ
    double iInf = im[ONSET + 999];
    double fractionDone = (i0 - im[ONSET + TAU_SAMPLES]) / (i0 - iInf);
    assertEquals(1 - 1 / Math.E, fractionDone, 1e-9);
    assertEquals(0.632, fractionDone, 5e-4);
  }

  @Test
  void instantaneousCurrentIsStepOverAccessResistance() {
    // I_0 = ΔV/Ra: one sample after the onset the current is I_∞ + (I_0 − I_∞)e^(−h/τ).
    double[] im = run(CELL, 2000);
    double hold = im[ONSET];
    double iInf = -5.0 / 0.250;
    double i0 = -5.0 / 0.010;
    double expected = hold + iInf + (i0 - iInf) * Math.exp(-1.0 / TAU_SAMPLES);
    assertEquals(expected, im[ONSET + 1], 1e-9 * Math.abs(i0));
  }

  @Test
  void steadyStateIsStepOverTotalResistanceAndHoldingObeysOhmsLaw() {
    // I_∞ = ΔV/(Ra + Rm); V = I·R for the holding current through Ra + Rm against E_L.
    double[] im = run(CELL, 2000);
    assertEquals((-70 - -65) / 0.250, im[ONSET], 1e-9);
    assertEquals(-5.0 / 0.250, im[ONSET + 999] - im[ONSET], 1e-9);
  }

  @Test
  void timeConstantIsParallelResistanceTimesCapacitance() {
    // τ = R·C with R = Ra ∥ Rm: the log-slope of (I − I_∞) over any stretch of the transient.
    double[] im = run(CELL, 2000);
    double iInf = im[ONSET + 999];
    double d1 = im[ONSET + 10] - iInf;
    double d2 = im[ONSET + 60] - iInf;
    double tauMs = 50 * 0.01 / Math.log(d1 / d2);
    assertEquals((10.0 * 240 / 250) * 1e-3 * 25, tauMs, 1e-9);
  }

  @Test
  void truthThroughALeakySealMatchesWhatTheSimulatedPipetteSees() {
    // CellTruth's derivation (seal in parallel with the access path) against the simulated trace.
    CellParameters leaky = CELL.withSealGOhm(1.0);
    double[] im = run(leaky, 2000);
    CellTruth truth = CellTruth.of(0, leaky, -70);
    double hold = im[ONSET];
    double iInf = im[ONSET + 999];
    double d1 = im[ONSET + 1] - iInf;
    double d2 = im[ONSET + 2] - iInf;
    double ratio = d1 / d2; // e^(h/τ)
    double i0 = iInf + d1 * ratio; // extrapolated to the onset
    assertEquals(truth.holdingPa(), hold, 1e-9);
    assertEquals(truth.accessMOhm(), -5.0 / (i0 - hold) * 1000, 1e-6);
    assertEquals(truth.totalMOhm(), -5.0 / (iInf - hold) * 1000, 1e-6);
    assertEquals(truth.tauMs(), 0.01 / Math.log(ratio), 1e-9);
    // With a perfect seal the truth is the textbook cell.
    CellTruth ideal = CellTruth.of(0, CELL, -70);
    assertEquals(10, ideal.accessMOhm(), 1e-12);
    assertEquals(240, ideal.inputMOhm(), 1e-9);
    assertEquals(250, ideal.totalMOhm(), 1e-9);
    assertEquals(25, ideal.capacitancePf(), 1e-9);
    assertEquals(25, ideal.chargeCapacitancePf(), 1e-9);
    assertEquals(0.24, ideal.tauMs(), 1e-12);
  }

  @Test
  void dendriteTruthMatchesTheSimulatedChargeAndSteadyState() {
    // Q = ∫(I − I_∞)dt of the simulated transient (trapezoid on a 1 MHz grid) against CellTruth.
    CellParameters cell = CellParameters.soma(10, 400, 15, -65).withDendrite(60, 600, 25);
    double fs = 1_000_000;
    TestPulseProtocol p = new TestPulseProtocol(-70, -5, 200, 400, 1);
    Scenario s =
        new Scenario(
            "dend", "", 1, 1, p, AmplifierSettings.ideal(fs), ParameterSchedule.constant(cell));
    int n = 201_000;
    double[] cmd = new double[n];
    double[] im = new double[n];
    new SimulatedRecording(s, 1).fill(cmd, im, 0, n);
    int onset = 1000;
    double hold = im[onset];
    double iInf = im[n - 1];
    CellTruth truth = CellTruth.of(0, cell, -70);
    assertEquals(truth.holdingPa(), hold, 1e-9);
    assertEquals(truth.totalMOhm(), -5.0 / (iInf - hold) * 1000, 1e-6);
    // The first interval is [0+, h]: I(0+) = hold + ΔV/Ra, not the sample at the onset.
    double i0 = hold - 5.0 / 0.010;
    double q = 0.5 * ((i0 - iInf) + (im[onset + 1] - iInf)) * 1e-3;
    for (int k = onset + 2; k < n; k++) {
      q += 0.5 * ((im[k - 1] - iInf) + (im[k] - iInf)) * 1e-3;
    }
    double chargeC = q / -5.0 * Math.pow(truth.totalMOhm() / truth.inputMOhm(), 2);
    assertEquals(truth.chargeCapacitancePf(), chargeC, 1e-3 * truth.chargeCapacitancePf());
    assertEquals(q / (i0 - iInf), truth.tauMs(), 1e-3 * truth.tauMs());
  }

  @Test
  void storedChargeCapacitanceOfAUniformMembraneEqualsItsTimeConstantOverRin() {
    // Rall's uniform membrane (Rm·Cm = Rd·Cd = τ_m): every compartment's steady leak current is
    // C_k·ΔV_k/τ_m, so Σ C_k·ΔV_k = I_∞·τ_m and the charged capacitance is τ_m/Rin (circuit theory,
    // CHECKS.md's stored-charge definition); a soma alone charges exactly Cm.
    CellParameters cell = CellParameters.soma(10, 400, 15, -65).withDendrite(60, 300, 20);
    CellTruth t = CellTruth.of(0, cell, -70);
    double tauMMs = 400 * 15 / 1000.0; // MΩ·pF = µs → ms
    assertEquals(tauMMs / (t.cellInputMOhm() / 1000.0), t.storedChargeCapacitancePf(), 1e-9);
    assertEquals(15 + 20 * 300 / 360.0, t.storedChargeCapacitancePf(), 1e-9);
    assertTrue(t.storedChargeCapacitancePf() < t.totalCapacitancePf());
    assertTrue(t.chargeCapacitancePf() < t.storedChargeCapacitancePf());
    CellTruth soma = CellTruth.of(0, CellParameters.soma(10, 400, 15, -65), -70);
    assertEquals(15, soma.storedChargeCapacitancePf(), 1e-12);
  }
}
