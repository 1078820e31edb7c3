package tauwatch.health;

/**
 * One row of a session's parameter log as read back: what the span and summary logic need.
 *
 * <p>Immutable.
 *
 * @param pulse pulse number
 * @param streamTimeS stream time of the onset
 * @param timeIso wall-clock time of the onset as logged
 * @param accepted whether the estimate was accepted
 * @param state the overall health state after the pulse
 * @param alarms the parameters in breach, separated by ';', empty if none
 * @param sweep the acquisition sweep, −1 when the log has none
 * @param values the logged values in {@link tauwatch.fit.Parameter} order, NaN where empty
 */
public record LoggedPulse(
    long pulse,
    double streamTimeS,
    String timeIso,
    boolean accepted,
    HealthState state,
    String alarms,
    long sweep,
    double[] values) {

  /** The state whose {@link HealthState#label()} is {@code label}, or null. */
  public static HealthState stateOf(String label) {
    for (HealthState s : HealthState.values()) {
      if (s.label().equals(label)) {
        return s;
      }
    }
    return null;
  }
}
