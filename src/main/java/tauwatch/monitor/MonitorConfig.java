package tauwatch.monitor;

import java.util.Map;
import tauwatch.fit.EstimatorOptions;
import tauwatch.health.HealthCriteria;
import tauwatch.health.OutlierScreening;
import tauwatch.pulse.SegmenterOptions;
import tauwatch.stream.ClampMode;

/**
 * The whole monitor's configuration, one part per component.
 *
 * <p>Immutable; built and validated once at start-up (by the command line's config loader or by a
 * test).
 *
 * @param segmenter how pulses are found; its edge threshold is the voltage-clamp one (mV)
 * @param edgeThresholdPa the current-clamp edge threshold (pA)
 * @param filterCutoffHz amplifier filter cutoff to assume when the source does not say, 0 = none
 * @param estimator the voltage-clamp estimator's options
 * @param health the acceptance criteria
 * @param outliers the screen of isolated outlier pulses
 * @param asLoaded the configuration as read, for {@code session.json}
 */
public record MonitorConfig(
    SegmenterOptions segmenter,
    double edgeThresholdPa,
    double filterCutoffHz,
    EstimatorOptions estimator,
    HealthCriteria health,
    OutlierScreening outliers,
    Map<String, Object> asLoaded) {

  /** 5 pA: above a current command's noise, below any test step (common practice). */
  public static final double DEFAULT_EDGE_THRESHOLD_PA = 5.0;

  public MonitorConfig {
    asLoaded = Map.copyOf(asLoaded);
  }

  public static MonitorConfig defaults() {
    return new MonitorConfig(
        SegmenterOptions.defaults(),
        DEFAULT_EDGE_THRESHOLD_PA,
        0,
        EstimatorOptions.defaults(),
        HealthCriteria.defaults(),
        OutlierScreening.defaults(),
        Map.of());
  }

  /** The segmenter options for a mode (its edge threshold is in that mode's command unit). */
  public SegmenterOptions segmenterFor(ClampMode mode) {
    return mode == ClampMode.CURRENT_CLAMP
        ? segmenter.withEdgeThreshold(edgeThresholdPa)
        : segmenter;
  }
}
