package tauwatch.health;

import tauwatch.health.RuleReading.Rule;

/**
 * Judges one parameter's accepted values against its limits and baseline, with debounce and
 * hysteresis.
 *
 * <p>Single-threaded (the analysis thread). Allocation-free per call; a {@link RuleReading} is made
 * per pulse for the snapshot and worded only when read.
 *
 * <p>Each rule is turned into a "usage": 0 at the baseline, 1 at the limit. The largest usage
 * decides: at or above 1 a breach, at or above the warning fraction drifting. Without a baseline
 * only the absolute range is judged, as plainly inside or outside. Below the limits, a {@link
 * ChangeDetector} flags a sustained change toward a limit as drifting, at once (the CUSUM already
 * integrates over pulses, so it gets no extra debounce); leaving drifting is debounced as before.
 */
final class ParameterJudge {
  private final ParameterLimits limits;
  private final int debounce;
  private final double hysteresis;
  private final double warning;
  private final ChangeDetector detector;

  private HealthState state = HealthState.STEADY;
  private HealthState candidate = HealthState.STEADY;
  private int candidateRun;
  private double usage;
  private Rule usageRule = Rule.NONE;

  ParameterJudge(ParameterLimits limits, HealthCriteria criteria) {
    this.limits = limits;
    this.debounce = criteria.debouncePulses();
    this.hysteresis = criteria.hysteresisPercent() / 100.0;
    this.warning = criteria.driftWarningFraction();
    boolean changeRule =
        !Double.isNaN(limits.maxChangePercent()) || !Double.isNaN(limits.maxChangeAbs());
    this.detector =
        new ChangeDetector(
            criteria.drift(),
            changeRule || !Double.isNaN(limits.max()),
            changeRule || !Double.isNaN(limits.min()));
  }

  ChangeDetector detector() {
    return detector;
  }

  HealthState state() {
    return state;
  }

  double usage() {
    return usage;
  }

  /**
   * Judges a new accepted value.
   *
   * @return true if the state changed
   */
  boolean judge(long pulse, double timeS, double v, double standardError, double baseline) {
    return judge(pulse, timeS, v, standardError, baseline, true);
  }

  /**
   * Judges a new accepted value; with {@code changeSignificant} false (the running average's change
   * from the baseline is within its uncertainty) the relative and absolute change rules do not
   * count, so only the absolute limits and the change detector can move the state.
   *
   * @return true if the state changed
   */
  boolean judge(
      long pulse,
      double timeS,
      double v,
      double standardError,
      double baseline,
      boolean changeSignificant) {
    detector.update(pulse, timeS, v, standardError, baseline);
    computeUsage(v, baseline, changeSignificant);
    HealthState target = targetFor(usage);
    boolean detected = target == HealthState.STEADY && detector.flagged() != ChangeDetector.NONE;
    if (detected) {
      target = HealthState.DRIFTING;
      if (state == HealthState.STEADY) {
        state = target;
        candidate = state;
        candidateRun = 0;
        return true;
      }
    }
    if (state == HealthState.NO_SIGNAL) {
      // Back from no signal: resume at once, but a breach still needs its debounce.
      state = target == HealthState.BREACH ? HealthState.DRIFTING : target;
      candidate = state;
      candidateRun = 0;
      return true;
    }
    if (target == state) {
      candidateRun = 0;
      candidate = state;
      return false;
    }
    if (target != candidate) {
      candidate = target;
      candidateRun = 0;
    }
    if (++candidateRun >= debounce) {
      state = target;
      candidateRun = 0;
      return true;
    }
    return false;
  }

  /** Forces {@code no signal}; returns true if that is a change. */
  boolean lose() {
    if (state == HealthState.NO_SIGNAL) {
      return false;
    }
    state = HealthState.NO_SIGNAL;
    candidate = state;
    candidateRun = 0;
    return true;
  }

  private HealthState targetFor(double u) {
    // Hysteresis: a state is left downward only once the usage is clearly below its threshold.
    double breachExit = state == HealthState.BREACH ? 1 - hysteresis : 1;
    double driftExit =
        state == HealthState.DRIFTING || state == HealthState.BREACH
            ? warning - hysteresis
            : warning;
    if (u >= breachExit) {
      return HealthState.BREACH;
    }
    if (u >= driftExit) {
      return HealthState.DRIFTING;
    }
    return HealthState.STEADY;
  }

  private void computeUsage(double v, double b, boolean changeSignificant) {
    usage = 0;
    usageRule = Rule.NONE;
    boolean hasBaseline = !Double.isNaN(b);
    if (!Double.isNaN(limits.max())) {
      double u;
      if (hasBaseline && b < limits.max()) {
        u = (v - b) / (limits.max() - b);
      } else {
        u = v > limits.max() ? 1 + (v - limits.max()) / Math.abs(limits.max()) : 0;
      }
      take(u, Rule.MAX);
    }
    if (!Double.isNaN(limits.min())) {
      double u;
      if (hasBaseline && b > limits.min()) {
        u = (b - v) / (b - limits.min());
      } else {
        u = v < limits.min() ? 1 + (limits.min() - v) / Math.max(1e-12, Math.abs(limits.min())) : 0;
      }
      take(u, Rule.MIN);
    }
    if (changeSignificant && hasBaseline && !Double.isNaN(limits.maxChangePercent()) && b != 0) {
      take(
          Math.abs(v - b) / (limits.maxChangePercent() / 100.0 * Math.abs(b)), Rule.CHANGE_PERCENT);
    }
    if (changeSignificant && hasBaseline && !Double.isNaN(limits.maxChangeAbs())) {
      take(Math.abs(v - b) / limits.maxChangeAbs(), Rule.CHANGE_ABS);
    }
  }

  private void take(double u, Rule rule) {
    if (u > usage) {
      usage = u;
      usageRule = rule;
    }
  }

  /** The rule nearest to (or past) its limit at value v and baseline b, for events and the view. */
  RuleReading reading(double v, double b) {
    return new RuleReading(usageRule, limits, v, b);
  }
}
