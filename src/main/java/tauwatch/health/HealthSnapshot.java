package tauwatch.health;

import java.util.Map;
import tauwatch.fit.Parameter;

/**
 * The health of every judged parameter at one moment.
 *
 * <p>Immutable; published by the analysis thread and read by any thread.
 *
 * @param pulseNumber the latest pulse judged, 0 before the first
 * @param streamTimeS stream time of that pulse's onset
 * @param overall the worst state of all parameters
 * @param parameters status per judged parameter, in {@link Parameter} order
 * @param baselineSet whether the baseline is known
 * @param baselinePulses accepted pulses the baseline was (or is being) formed from
 */
public record HealthSnapshot(
    long pulseNumber,
    double streamTimeS,
    HealthState overall,
    Map<Parameter, ParameterStatus> parameters,
    boolean baselineSet,
    int baselinePulses) {

  /** The state of one parameter, or {@code steady} for a parameter that is not judged. */
  public HealthState state(Parameter p) {
    ParameterStatus s = parameters.get(p);
    return s == null ? HealthState.STEADY : s.state();
  }
}
