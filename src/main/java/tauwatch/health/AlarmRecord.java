package tauwatch.health;

import tauwatch.fit.Parameter;

/**
 * One breach alarm as raised: the parameter, its value, its baseline and the rule it crossed, at
 * the pulse that crossed it.
 *
 * <p>Immutable; made by {@link HealthMonitor} on the analysis thread when a parameter enters {@code
 * breach} (one per alarm, never per sample) and read by any thread.
 *
 * @param parameter which parameter
 * @param pulseNumber the pulse that crossed the rule
 * @param streamTimeS stream time of that pulse's onset
 * @param value the value that crossed, in {@link Parameter#unit()}
 * @param baseline the baseline in force, NaN while it was being learnt
 * @param changePercent change from baseline in percent, NaN without baseline
 * @param rule the rule crossed, human-readable (as {@link ParameterStatus#rule()})
 */
public record AlarmRecord(
    Parameter parameter,
    long pulseNumber,
    double streamTimeS,
    double value,
    double baseline,
    double changePercent,
    String rule) {}
