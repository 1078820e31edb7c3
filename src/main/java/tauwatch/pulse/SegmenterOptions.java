package tauwatch.pulse;

/**
 * How test pulses are found and cut: edge thresholds, window lengths and the fallback schedule.
 *
 * <p>Immutable; validated on construction so that errors name the option.
 *
 * @param edgeThreshold command change that counts as an edge, in the command unit (mV in voltage
 *     clamp, pA in current clamp)
 * @param baselineMs window before the onset kept as baseline
 * @param maxStepMs steps longer than this are not test pulses (an experiment's own steps, a change
 *     of holding level) and are ignored
 * @param offWindowMs window kept after the step ends, for the off-transient
 * @param schedule where pulses are when the stream carries no command channel, or null
 */
public record SegmenterOptions(
    double edgeThreshold,
    double baselineMs,
    double maxStepMs,
    double offWindowMs,
    PulseSchedule schedule) {

  /** 0.5 mV: well above a recorded command's noise, well below any test step (common practice). */
  public static final double DEFAULT_EDGE_THRESHOLD_MV = 0.5;

  public static final double DEFAULT_BASELINE_MS = 3.0;
  public static final double DEFAULT_MAX_STEP_MS = 200.0;
  public static final double DEFAULT_OFF_WINDOW_MS = 20.0;

  public SegmenterOptions {
    requirePositive("edge_threshold", edgeThreshold);
    requirePositive("baseline_ms", baselineMs);
    requirePositive("max_step_ms", maxStepMs);
    requirePositive("off_window_ms", offWindowMs);
  }

  public static SegmenterOptions defaults() {
    return new SegmenterOptions(
        DEFAULT_EDGE_THRESHOLD_MV,
        DEFAULT_BASELINE_MS,
        DEFAULT_MAX_STEP_MS,
        DEFAULT_OFF_WINDOW_MS,
        null);
  }

  public SegmenterOptions withSchedule(PulseSchedule s) {
    return new SegmenterOptions(edgeThreshold, baselineMs, maxStepMs, offWindowMs, s);
  }

  public SegmenterOptions withEdgeThreshold(double threshold) {
    return new SegmenterOptions(threshold, baselineMs, maxStepMs, offWindowMs, schedule);
  }

  private static void requirePositive(String key, double v) {
    if (!(v > 0) || Double.isInfinite(v)) {
      throw new IllegalArgumentException(key + " must be a positive number, got " + v);
    }
  }
}
