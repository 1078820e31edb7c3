package tauwatch.monitor;

import tauwatch.fit.CurrentClampEstimator;
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
    if (format.mode() == ClampMode.CURRENT_CLAMP) {
      return new CurrentClampEstimator(config.estimator());
    }
    throw new IllegalArgumentException("no estimator for clamp mode " + format.mode());
  }
}
