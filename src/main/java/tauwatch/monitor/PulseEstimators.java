package tauwatch.monitor;

import tauwatch.fit.PulseEstimator;
import tauwatch.fit.VoltageClampEstimator;
import tauwatch.stream.ClampMode;
import tauwatch.stream.StreamFormat;

/** Chooses the estimator for a stream's clamp mode. */
public final class PulseEstimators {
  private PulseEstimators() {}

  /**
   * @throws IllegalArgumentException when no estimator handles the stream's mode
   */
  public static PulseEstimator forFormat(StreamFormat format, MonitorConfig config) {
    if (format.mode() == ClampMode.VOLTAGE_CLAMP) {
      return new VoltageClampEstimator(config.estimator());
    }
    throw new IllegalArgumentException(
        "current-clamp streams need the current-clamp estimator, not in this version");
  }
}
