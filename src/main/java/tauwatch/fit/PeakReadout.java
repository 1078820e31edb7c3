package tauwatch.fit;

import tauwatch.pulse.PulseWindow;
import tauwatch.stream.ClampMode;

/**
 * The naive test-pulse readout that an accuracy benchmark compares {@link VoltageClampEstimator}
 * against: Ra from the raw peak current, Rt from the mean of the step's last fifth, τ from the time
 * the transient takes to fall to 1/e of its peak, and Cm = τ/Ra from τ alone.
 *
 * <p>Stateless and thread-safe; allocates only the returned estimate. It is meant to be honest, not
 * good: the raw peak of a sampled, filtered transient is smaller than I₀, so its Ra reads high
 * (common practice, CHECKS.md), and Cm = τ/Ra ignores the Rin term of τ = Ra·Rm·Cm/(Ra + Rm).
 */
public final class PeakReadout implements PulseEstimator {
  @Override
  public PulseEstimate estimate(PulseWindow w) {
    PulseEstimate.Builder b = PulseEstimate.builderFor(w).model("peak");
    int onset = w.onsetIndex;
    int offset = w.offsetIndex;
    double stepMv = w.stepAmplitude();
    if (w.mode != ClampMode.VOLTAGE_CLAMP || w.spansGap || offset - onset < 10 || onset < 1) {
      return b.reject("no usable voltage-clamp step").build();
    }
    double hold = 0;
    for (int i = 0; i <= onset; i++) {
      hold += w.response[i];
    }
    hold /= onset + 1;
    int tailFrom = offset - (offset - onset) / 5;
    double steady = 0;
    for (int i = tailFrom; i <= offset; i++) {
      steady += w.response[i];
    }
    steady /= offset - tailFrom + 1;
    int peak = onset + 1;
    for (int i = onset + 1; i <= offset; i++) {
      if (Math.abs(w.response[i] - hold) > Math.abs(w.response[peak] - hold)) {
        peak = i;
      }
    }
    double peakAbove = w.response[peak] - steady;
    double tauMs = Double.NaN;
    for (int i = peak + 1; i <= offset; i++) {
      double prev = (w.response[i - 1] - steady) / peakAbove;
      double cur = (w.response[i] - steady) / peakAbove;
      if (cur <= 1 / Math.E) {
        double frac = (prev - 1 / Math.E) / (prev - cur);
        tauMs = (i - 1 - peak + frac) * w.sampleIntervalS * 1e3;
        break;
      }
    }
    double ra = 1000 * stepMv / (w.response[peak] - hold);
    double rt = 1000 * stepMv / (steady - hold);
    b.value(Parameter.HOLDING_CURRENT, hold)
        .value(Parameter.ACCESS_RESISTANCE, ra)
        .value(Parameter.TOTAL_RESISTANCE, rt)
        .value(Parameter.INPUT_RESISTANCE, rt - ra)
        .value(Parameter.TIME_CONSTANT, tauMs)
        .value(Parameter.MEMBRANE_CAPACITANCE, 1000 * tauMs / ra);
    if (!Double.isFinite(tauMs) || !Double.isFinite(ra)) {
      b.reject("transient did not fall to 1/e of its peak within the step");
    }
    return b.build();
  }
}
