package tauwatch.health;

/**
 * The settings of the per-parameter change detector: a two-sided CUSUM (Page 1954) on the accepted
 * estimates, in units of the noise measured while the parameter was steady.
 *
 * <p>Immutable; validated once at start-up. Defaults chosen from the alarm-quality benchmark
 * ({@code docs/drift.md}).
 *
 * @param enabled whether the detector runs; without it {@code drifting} comes only from the warning
 *     share of the allowed span
 * @param allowanceSigma k: the shift, in noise sigmas, the statistic ignores per pulse (half the
 *     smallest shift worth detecting quickly)
 * @param thresholdSigma h: the CUSUM level, in noise sigmas, at which a change is declared
 * @param winsorSigma each innovation is clipped to ±this many sigmas, so that one outlier adds at
 *     most {@code winsorSigma − allowanceSigma} to the statistic
 * @param minNoisePercent the noise scale is at least this percentage of the baseline: a floor for a
 *     noise-free source and the size of change below which drift is not worth reporting
 * @param noiseWindowPulses steady pulses over which the noise is measured (robustly, from
 *     successive differences)
 * @param noiseMinPulses accepted pulses needed for a noise estimate before the detector is armed
 */
public record DriftDetection(
    boolean enabled,
    double allowanceSigma,
    double thresholdSigma,
    double winsorSigma,
    double minNoisePercent,
    int noiseWindowPulses,
    int noiseMinPulses) {

  public static final double DEFAULT_ALLOWANCE_SIGMA = 1.0;
  public static final double DEFAULT_THRESHOLD_SIGMA = 8;
  public static final double DEFAULT_WINSOR_SIGMA = 3;
  public static final double DEFAULT_MIN_NOISE_PERCENT = 1.0;
  public static final int DEFAULT_NOISE_WINDOW_PULSES = 240;
  public static final int DEFAULT_NOISE_MIN_PULSES = 60;

  public DriftDetection {
    if (!(allowanceSigma >= 0)) {
      throw new IllegalArgumentException("allowance_sigma must be >= 0, got " + allowanceSigma);
    }
    if (!(thresholdSigma > 0)) {
      throw new IllegalArgumentException("threshold_sigma must be positive, got " + thresholdSigma);
    }
    if (!(winsorSigma > allowanceSigma)) {
      throw new IllegalArgumentException(
          "winsor_sigma must exceed allowance_sigma (" + allowanceSigma + "), got " + winsorSigma);
    }
    if (!(minNoisePercent > 0)) {
      throw new IllegalArgumentException(
          "min_noise_percent must be positive, got " + minNoisePercent);
    }
    if (noiseMinPulses < 3) {
      throw new IllegalArgumentException("noise_min_pulses must be >= 3, got " + noiseMinPulses);
    }
    if (noiseWindowPulses < noiseMinPulses) {
      throw new IllegalArgumentException(
          "noise_window_pulses must be >= noise_min_pulses ("
              + noiseMinPulses
              + "), got "
              + noiseWindowPulses);
    }
  }

  public static DriftDetection defaults() {
    return new DriftDetection(
        true,
        DEFAULT_ALLOWANCE_SIGMA,
        DEFAULT_THRESHOLD_SIGMA,
        DEFAULT_WINSOR_SIGMA,
        DEFAULT_MIN_NOISE_PERCENT,
        DEFAULT_NOISE_WINDOW_PULSES,
        DEFAULT_NOISE_MIN_PULSES);
  }

  /** The same settings with another allowance and threshold (for the benchmark). */
  public DriftDetection with(double allowance, double threshold) {
    return new DriftDetection(
        enabled,
        allowance,
        threshold,
        Math.max(winsorSigma, allowance + 1),
        minNoisePercent,
        noiseWindowPulses,
        noiseMinPulses);
  }
}
