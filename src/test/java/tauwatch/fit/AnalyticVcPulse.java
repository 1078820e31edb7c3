package tauwatch.fit;

import java.util.Random;
import tauwatch.pulse.PulseWindow;

/**
 * Builds test-pulse windows from the analytic voltage-clamp transient of a single RC cell behind an
 * access resistance, honouring the interchange timing contract.
 *
 * <p>Formula (Gillis 1995 in Sakmann &amp; Neher, Single-Channel Recording; from memory;
 * CHECKS.md): after a step ΔV at t = 0, I(t) = I_∞ + (I₀ − I_∞)·e^(−t/τ), I₀ = ΔV/Ra, I_∞ = ΔV/(Ra
 * + Rm), τ = Ra·Rm·Cm/(Ra + Rm). The off-step superposes the same response with −ΔV. Row k is
 * sampled just before a command change on row k acts, so the onset row is still baseline.
 */
final class AnalyticVcPulse {
  double raMOhm = 10;
  double rinMOhm = 500;
  double cmPf = 30;
  double holdingMv = -70;
  double stepMv = -5;
  double holdPa = -20;
  double sampleRateHz = 50_000;
  double baselineMs = 5;
  double stepMs = 10;
  double afterMs = 10;
  double noisePa = 0;
  long seed = 1;

  AnalyticVcPulse cell(double raMOhm, double rinMOhm, double cmPf) {
    this.raMOhm = raMOhm;
    this.rinMOhm = rinMOhm;
    this.cmPf = cmPf;
    return this;
  }

  double tauMs() {
    return raMOhm * rinMOhm / (raMOhm + rinMOhm) * cmPf * 1e-3; // MΩ·pF = µs
  }

  /** pA for a step of {@code mv} through {@code mOhm}: mV/MΩ = nA. */
  private static double pa(double mv, double mOhm) {
    return 1000 * mv / mOhm;
  }

  /** Response to a step of ΔV applied at t = 0, relative to the holding current, t in ms. */
  private double stepResponse(double tMs) {
    if (tMs <= 0) {
      return 0;
    }
    double i0 = pa(stepMv, raMOhm);
    double iInf = pa(stepMv, raMOhm + rinMOhm);
    return iInf + (i0 - iInf) * Math.exp(-tMs / tauMs());
  }

  PulseWindow window() {
    return window(new Random(seed));
  }

  PulseWindow window(Random rng) {
    double dtMs = 1000 / sampleRateHz;
    int onset = (int) Math.round(baselineMs / dtMs);
    int steps = (int) Math.round(stepMs / dtMs);
    int after = (int) Math.round(afterMs / dtMs);
    int n = onset + steps + after;
    PulseWindow w = new PulseWindow(n);
    w.length = n;
    w.onsetIndex = onset;
    w.offsetIndex = onset + steps;
    w.sampleIntervalS = dtMs * 1e-3;
    w.holdingLevel = holdingMv;
    w.stepLevel = holdingMv + stepMv;
    w.pulseNumber = 1;
    for (int i = 0; i < n; i++) {
      double t = (i - onset) * dtMs;
      boolean inStep = i >= onset && i < onset + steps;
      w.command[i] = inStep ? holdingMv + stepMv : holdingMv;
      w.response[i] =
          holdPa
              + stepResponse(t)
              - stepResponse(t - steps * dtMs)
              + (noisePa > 0 ? noisePa * rng.nextGaussian() : 0);
    }
    return w;
  }
}
