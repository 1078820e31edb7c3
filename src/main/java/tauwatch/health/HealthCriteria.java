package tauwatch.health;

import java.util.EnumMap;
import java.util.Map;
import tauwatch.fit.Parameter;

/**
 * The lab's acceptance criteria and how strictly they are applied.
 *
 * <p>Immutable; validated once at start-up.
 *
 * @param baselinePulses accepted pulses whose median forms the baseline
 * @param debouncePulses consecutive pulses a condition must hold before the state changes
 * @param hysteresisPercent how far back inside a limit (in percent of the allowed span) a value
 *     must come before leaving {@code breach} or {@code drifting}
 * @param driftWarningFraction share of the allowed span at which a parameter counts as drifting
 * @param noPulseTimeoutS stream seconds without any pulse before the state is {@code no signal}
 * @param limits the rules per parameter; parameters absent here are not judged
 * @param drift the change detector's settings
 * @param averagePulses accepted pulses in the uncertainty-weighted running average
 * @param changeSigmas a change from the baseline smaller than this many standard errors of the
 *     running average is not a drift (the relative and absolute change rules stay quiet)
 */
public record HealthCriteria(
    int baselinePulses,
    int debouncePulses,
    double hysteresisPercent,
    double driftWarningFraction,
    double noPulseTimeoutS,
    Map<Parameter, ParameterLimits> limits,
    DriftDetection drift,
    int averagePulses,
    double changeSigmas) {

  /** 10 pulses: 5 s at 2 pulses/s, a tenth of the noise of one pulse's estimate at most. */
  public static final int DEFAULT_AVERAGE_PULSES = 10;

  /** 2 standard errors: a two-sided 95 % band (common practice). */
  public static final double DEFAULT_CHANGE_SIGMAS = 2;

  /** 20 pulses: 10 s at 2 pulses/s, long enough to average noise, short against drift. */
  public static final int DEFAULT_BASELINE_PULSES = 20;

  public static final int DEFAULT_DEBOUNCE_PULSES = 3;
  public static final double DEFAULT_HYSTERESIS_PERCENT = 5;
  public static final double DEFAULT_DRIFT_WARNING_FRACTION = 0.5;
  public static final double DEFAULT_NO_PULSE_TIMEOUT_S = 5;

  public HealthCriteria {
    if (baselinePulses < 1) {
      throw new IllegalArgumentException("baseline pulses must be >= 1, got " + baselinePulses);
    }
    if (debouncePulses < 1) {
      throw new IllegalArgumentException("debounce_pulses must be >= 1, got " + debouncePulses);
    }
    if (!(hysteresisPercent >= 0 && hysteresisPercent < 50)) {
      throw new IllegalArgumentException(
          "hysteresis_percent must be in [0, 50), got " + hysteresisPercent);
    }
    if (!(driftWarningFraction > 0 && driftWarningFraction < 1)) {
      throw new IllegalArgumentException(
          "drift_warning_fraction must be in (0, 1), got " + driftWarningFraction);
    }
    if (!(noPulseTimeoutS > 0)) {
      throw new IllegalArgumentException(
          "no_pulse_timeout_s must be positive, got " + noPulseTimeoutS);
    }
    if (averagePulses < 1) {
      throw new IllegalArgumentException("average_pulses must be >= 1, got " + averagePulses);
    }
    if (!(changeSigmas >= 0) || Double.isInfinite(changeSigmas)) {
      throw new IllegalArgumentException("change_sigmas must be >= 0, got " + changeSigmas);
    }
    EnumMap<Parameter, ParameterLimits> copy = new EnumMap<>(Parameter.class);
    copy.putAll(limits);
    limits = java.util.Collections.unmodifiableMap(copy);
    java.util.Objects.requireNonNull(drift, "drift");
  }

  /** Criteria with the default change detector and running average. */
  public HealthCriteria(
      int baselinePulses,
      int debouncePulses,
      double hysteresisPercent,
      double driftWarningFraction,
      double noPulseTimeoutS,
      Map<Parameter, ParameterLimits> limits) {
    this(
        baselinePulses,
        debouncePulses,
        hysteresisPercent,
        driftWarningFraction,
        noPulseTimeoutS,
        limits,
        DriftDetection.defaults(),
        DEFAULT_AVERAGE_PULSES,
        DEFAULT_CHANGE_SIGMAS);
  }

  /** The same criteria with other change-detector settings. */
  public HealthCriteria withDrift(DriftDetection d) {
    return new HealthCriteria(
        baselinePulses,
        debouncePulses,
        hysteresisPercent,
        driftWarningFraction,
        noPulseTimeoutS,
        limits,
        d,
        averagePulses,
        changeSigmas);
  }

  /**
   * Defaults from common practice (no single source): Ra at most 25 MΩ and within 20 % of its
   * baseline; Rin at least 50 MΩ and within 30 %; Cm within 30 %; holding current not beyond −200
   * pA.
   */
  public static HealthCriteria defaults() {
    EnumMap<Parameter, ParameterLimits> m = new EnumMap<>(Parameter.class);
    m.put(
        Parameter.ACCESS_RESISTANCE,
        new ParameterLimits(Parameter.ACCESS_RESISTANCE, Double.NaN, 25, 20, Double.NaN));
    m.put(
        Parameter.INPUT_RESISTANCE,
        new ParameterLimits(Parameter.INPUT_RESISTANCE, 50, Double.NaN, 30, Double.NaN));
    m.put(
        Parameter.MEMBRANE_CAPACITANCE,
        new ParameterLimits(
            Parameter.MEMBRANE_CAPACITANCE, Double.NaN, Double.NaN, 30, Double.NaN));
    m.put(
        Parameter.HOLDING_CURRENT,
        new ParameterLimits(Parameter.HOLDING_CURRENT, -200, Double.NaN, Double.NaN, Double.NaN));
    return new HealthCriteria(
        DEFAULT_BASELINE_PULSES,
        DEFAULT_DEBOUNCE_PULSES,
        DEFAULT_HYSTERESIS_PERCENT,
        DEFAULT_DRIFT_WARNING_FRACTION,
        DEFAULT_NO_PULSE_TIMEOUT_S,
        m);
  }
}
