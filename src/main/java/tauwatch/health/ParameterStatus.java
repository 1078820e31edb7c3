package tauwatch.health;

import tauwatch.fit.Parameter;

/**
 * The health of one parameter after the latest pulse.
 *
 * <p>Immutable.
 *
 * @param parameter which parameter
 * @param state its health state
 * @param value latest accepted value, NaN if none
 * @param baseline baseline value, NaN while the baseline is being learnt
 * @param changePercent change from baseline in percent, NaN without baseline
 * @param reading the rule closest to being crossed (or crossed) at the latest value
 * @param alarmPending a breach alarm raised and not yet acknowledged
 * @param alarm the pending alarm as raised, or null when none is pending
 */
public record ParameterStatus(
    Parameter parameter,
    HealthState state,
    double value,
    double baseline,
    double changePercent,
    RuleReading reading,
    boolean alarmPending,
    AlarmRecord alarm) {

  /** A status without a pending alarm's record. */
  public ParameterStatus(
      Parameter parameter,
      HealthState state,
      double value,
      double baseline,
      double changePercent,
      RuleReading reading,
      boolean alarmPending) {
    this(parameter, state, value, baseline, changePercent, reading, alarmPending, null);
  }

  /** The rule closest to being crossed (or crossed), human-readable; empty if none. */
  public String rule() {
    return reading.text();
  }
}
