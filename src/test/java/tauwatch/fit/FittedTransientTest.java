package tauwatch.fit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.junit.jupiter.api.Test;
import tauwatch.pulse.PulseWindow;

/**
 * The fitted curve the estimator hands to the view is the RC transient itself: I(t) = I_∞ + (I₀ −
 * I_∞)·e^(−t/τ), I₀ = ΔV/Ra, I_∞ = ΔV/(Ra + Rm), τ = Ra·Rm·Cm/(Ra + Rm) (Gillis 1995 in Sakmann
 * &amp; Neher, Single-Channel Recording; from memory; CHECKS.md).
 */
class FittedTransientTest {
  @Test
  void theOnTransientCurveFollowsTheTextbookTransientOfAnUnfilteredCell() {
    AnalyticVcPulse a = new AnalyticVcPulse().cell(10, 500, 30);
    PulseWindow w = a.window();
    PulseEstimate e = new VoltageClampEstimator().estimate(w);
    assertTrue(e.accepted(), e.rejectReason());
    List<FittedTransient> curves = e.fittedTransients();
    assertEquals(2, curves.size(), "on- and off-transient");
    FittedTransient on = curves.get(0);
    FittedTransient off = curves.get(1);
    assertEquals(0, on.edgeMs(), 1e-12);
    assertEquals(a.stepMs, off.edgeMs(), 1e-9);
    assertTrue(on.fitStartMs() > 0 && on.fitEndMs() <= a.stepMs, on.toString());
    assertTrue(off.fitStartMs() > a.stepMs, off.toString());

    // Noise-free, unfiltered: the curve matches the formula to 0.5 % of I₀ over the fitted span
    // (the same tolerance class as the estimator's 2 % grid check, tighter because no noise).
    double i0 = 1000 * a.stepMv / a.raMOhm;
    double iInf = 1000 * a.stepMv / (a.raMOhm + a.rinMOhm);
    double tau = a.tauMs();
    for (double t = on.fitStartMs(); t <= on.fitEndMs(); t += 0.25) {
      double expected = a.holdPa + iInf + (i0 - iInf) * Math.exp(-t / tau);
      assertEquals(expected, on.levelAt(t), 0.005 * Math.abs(i0), "t = " + t + " ms");
    }
    assertEquals(a.holdPa + i0, on.edgeLevel(), 0.02 * Math.abs(i0), "I₀ at the onset");
    assertEquals(tau, on.timeConstantMs(0), 0.02 * tau);
    assertEquals(a.holdPa + iInf, on.steadyLevel(), 0.01 * Math.abs(iInf));
  }

  @Test
  void aPulseRejectedBeforeAnyFitCarriesNoCurve() {
    AnalyticVcPulse a = new AnalyticVcPulse().cell(10, 500, 30);
    a.stepMv = -0.01;
    PulseEstimate e = new VoltageClampEstimator().estimate(a.window());
    assertTrue(!e.accepted());
    assertTrue(e.fittedTransients().isEmpty());
    assertTrue(e.rejected("again").fittedTransients().isEmpty());
  }
}
