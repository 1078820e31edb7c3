package tauwatch.fit;

import tauwatch.pulse.PulseWindow;
import tauwatch.stream.ClampMode;

/**
 * The checks and set-up both clamp modes make before any fit: the window is whole and long enough,
 * the step is large enough, every sample is finite; then the baseline's rows, its noise (widened
 * for the filter's correlation) and the amplifier filter's model.
 *
 * <p>One per estimator, used on its thread; {@link #prepare} refills the fields per pulse and keeps
 * the filter model while the cutoff stays the same.
 */
final class PulsePreamble {
  private final EstimatorOptions options;
  private BesselFilterModel filter = new BesselFilterModel(0);

  /** Sample interval in ms. */
  double dtMs;

  /** Rows in the running average of the residual-excursion test. */
  int excursionWindow;

  /** First baseline row; the baseline runs to the onset row, still sampled before the step acts. */
  int baselineFrom;

  /** The baseline's mean and noise. */
  BaselineNoise noise;

  PulsePreamble(EstimatorOptions options) {
    this.options = options;
  }

  /** The amplifier filter of the last prepared window. */
  BesselFilterModel filter() {
    return filter;
  }

  /**
   * Checks {@code w} for a {@code mode} pulse whose step must reach {@code minStep} ({@code unit})
   * and prepares the baseline.
   *
   * @return why the pulse cannot be fitted, or null
   */
  String prepare(PulseWindow w, ClampMode mode, double minStep, String unit) {
    if (w.mode != mode) {
      return mode == ClampMode.VOLTAGE_CLAMP
          ? "not a voltage-clamp pulse"
          : "not a current-clamp pulse";
    }
    if (w.spansGap) {
      return "window spans a gap in the stream";
    }
    double step = w.stepAmplitude();
    if (!Double.isFinite(step) || Math.abs(step) < minStep) {
      return "step of " + fmt(step) + " " + unit + " is below " + fmt(minStep) + " " + unit;
    }
    int onset = w.onsetIndex;
    int end = w.length - 1;
    if (onset + 1 < options.minBaselineSamples() || end >= w.capacity() || w.offsetIndex <= onset) {
      return "window too short for a baseline";
    }
    if (!(w.sampleIntervalS > 0)) {
      return "sample interval is not positive";
    }
    for (int i = 0; i <= end; i++) {
      if (!Double.isFinite(w.response[i])) {
        return "response has a non-finite sample at row " + i;
      }
    }
    dtMs = w.sampleIntervalS * 1e3;
    excursionWindow = Math.max(1, (int) Math.round(options.excursionWindowMs() / dtMs));
    int nPre = onset + 1;
    int nb =
        Math.min(
            nPre,
            Math.max(options.minBaselineSamples(), (int) (options.baselineFraction() * nPre)));
    baselineFrom = nPre - nb;
    double cutoffHz =
        options.filterCutoffHz() > 0
            ? options.filterCutoffHz()
            : options.filterCutoffHz() < 0 ? 0 : Math.max(0, w.filterCutoffHz);
    if (filter.cutoffHz() != cutoffHz) {
      filter = new BesselFilterModel(cutoffHz);
    }
    noise =
        BaselineNoise.of(w.response, baselineFrom, onset)
            .atLeast(filter.noiseVarianceInflation(w.sampleIntervalS));
    return null;
  }

  /** Why {@code v} is implausible ("Ra 250 MΩ outside 0.5–200"), or null when within [lo, hi]. */
  static String outside(String name, double v, String unit, double lo, double hi) {
    if (v >= lo && v <= hi) {
      return null;
    }
    return name + " " + fmt(v) + " " + unit + " outside " + fmt(lo) + "–" + fmt(hi);
  }

  static String fmt(double v) {
    return String.format(java.util.Locale.ROOT, "%.3g", v);
  }
}
