package tauwatch.health;

import java.util.Collections;
import java.util.EnumMap;
import java.util.Map;
import java.util.concurrent.atomic.AtomicBoolean;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.concurrent.atomic.AtomicReferenceArray;
import tauwatch.event.EventKind;
import tauwatch.event.EventSink;
import tauwatch.event.StreamClock;
import tauwatch.fit.Parameter;
import tauwatch.fit.PulseEstimate;

/**
 * Applies the acceptance criteria to every accepted estimate and raises state changes and alarms.
 *
 * <p>{@link #onEstimate}, {@link #onSignalLost}, {@link #onSignalRestored} and {@link
 * #onStreamTime} are called on the analysis thread only. {@link #requestBaselineNow}, {@link
 * #acknowledge} and {@link #snapshot} may be called from any thread: requests cross by atomics and
 * the snapshot is an immutable object behind a volatile. {@link #onStreamTime} runs per block and
 * allocates nothing unless the state changes.
 */
public final class HealthMonitor {
  private final HealthCriteria criteria;
  private final EventSink events;
  private final StreamClock clock;
  private final Baseline baseline;
  private final EnumMap<Parameter, ParameterJudge> judges = new EnumMap<>(Parameter.class);
  private final Parameter[] judged;
  private final AtomicBoolean baselineRequested = new AtomicBoolean();
  private final AtomicInteger pendingAlarms = new AtomicInteger();
  // The latest alarm raised per parameter (by ordinal); shown while its pending bit is set. Written
  // on the analysis thread before the bit is set, read by whichever thread builds a snapshot.
  private final AtomicReferenceArray<AlarmRecord> raised =
      new AtomicReferenceArray<>(Parameter.values().length);
  private final double[] lastValue;
  private final WeightedRunningAverage average;

  private volatile HealthSnapshot snapshot;
  private double lastPulseTimeS = Double.NaN;
  private long lastPulseNumber;
  private boolean signalLost;

  public HealthMonitor(HealthCriteria criteria, EventSink events, StreamClock clock) {
    this.criteria = criteria;
    this.events = events;
    this.clock = clock;
    this.baseline = new Baseline(criteria.baselinePulses());
    this.average = new WeightedRunningAverage(criteria.averagePulses());
    for (ParameterLimits l : criteria.limits().values()) {
      if (l.hasAnyRule()) {
        judges.put(l.parameter(), new ParameterJudge(l, criteria));
      }
    }
    judged = judges.keySet().toArray(new Parameter[0]);
    lastValue = new double[Parameter.values().length];
    java.util.Arrays.fill(lastValue, Double.NaN);
    snapshot = buildSnapshot(0, Double.NaN);
  }

  public HealthCriteria criteria() {
    return criteria;
  }

  /** Judges one estimate (accepted or not) and returns the health after it. */
  public HealthSnapshot onEstimate(PulseEstimate e) {
    double t = e.onsetTimeS();
    lastPulseTimeS = t;
    lastPulseNumber = e.pulseNumber();
    if (!e.accepted()) {
      // A rejected pulse never moves the baseline or the states; the pulse still counts as signal.
      return publish(e.pulseNumber(), t);
    }
    signalLost = false;
    average.add(e);
    boolean completed = baseline.add(e);
    if (baselineRequested.getAndSet(false)) {
      baseline.setNow();
      completed = true;
      // A new reference chosen by the user: every detector measures its level afresh.
      for (Parameter p : judged) {
        judges.get(p).detector().restart();
      }
    }
    if (completed) {
      events.onEvent(clock.event(t, EventKind.BASELINE_SET, baselineText()));
    }
    for (Parameter p : judged) {
      double v = e.value(p);
      if (Double.isNaN(v)) {
        continue;
      }
      lastValue[p.ordinal()] = v;
      ParameterJudge j = judges.get(p);
      HealthState before = j.state();
      double b = baseline.isSet() ? baseline.value(p) : Double.NaN;
      if (j.judge(e.pulseNumber(), t, v, e.standardError(p), b, changeSignificant(p, b))) {
        onStateChange(p, before, j.state(), v, b, t);
      }
    }
    return publish(e.pulseNumber(), t);
  }

  /**
   * Whether the running average of {@code p} has moved from the baseline by more than {@link
   * HealthCriteria#changeSigmas()} of its standard error; true when either is unknown (no gate).
   */
  private boolean changeSignificant(Parameter p, double b) {
    double avg = average.value(p);
    double se = average.standardError(p);
    if (Double.isNaN(b) || Double.isNaN(avg) || Double.isNaN(se)) {
      return true;
    }
    return Math.abs(avg - b) >= criteria.changeSigmas() * se;
  }

  /** The uncertainty-weighted average of {@code p} over the latest accepted pulses, or NaN. */
  public double runningAverage(Parameter p) {
    return average.value(p);
  }

  /** The standard error of {@link #runningAverage}, or NaN. Analysis thread only. */
  public double runningAverageStandardError(Parameter p) {
    return average.standardError(p);
  }

  /** The source lost its signal: every parameter goes to {@code no signal}. */
  public void onSignalLost(double streamTimeS) {
    signalLost = true;
    loseAll(streamTimeS, "signal lost");
  }

  /** The signal is back; states resume with the next accepted pulse. */
  public void onSignalRestored(double streamTimeS) {
    signalLost = false;
    lastPulseTimeS = streamTimeS;
  }

  /** Checks, per block, that pulses still arrive. */
  public void onStreamTime(double streamTimeS) {
    if (!signalLost
        && !Double.isNaN(lastPulseTimeS)
        && streamTimeS - lastPulseTimeS > criteria.noPulseTimeoutS()) {
      signalLost = true;
      loseAll(streamTimeS, String.format("no test pulse for %.1f s", streamTimeS - lastPulseTimeS));
    }
  }

  /** Asks for the baseline to be set from the latest accepted pulses at the next pulse. */
  public void requestBaselineNow() {
    baselineRequested.set(true);
  }

  /** Acknowledges the alarm on a parameter; the alarm stays in the event log. */
  public void acknowledge(Parameter p) {
    int bit = 1 << p.ordinal();
    int prev = pendingAlarms.getAndUpdate(m -> m & ~bit);
    if ((prev & bit) != 0) {
      events.onEvent(clock.eventNow(EventKind.ALARM_ACK, p.key() + " alarm acknowledged"));
      HealthSnapshot s = snapshot;
      snapshot = buildSnapshot(s.pulseNumber(), s.streamTimeS());
    }
  }

  /** The health after the latest pulse; any thread. */
  public HealthSnapshot snapshot() {
    return snapshot;
  }

  private void loseAll(double t, String why) {
    boolean any = false;
    for (Parameter p : judged) {
      HealthState before = judges.get(p).state();
      if (judges.get(p).lose()) {
        any = true;
        events.onEvent(
            clock.event(
                t,
                EventKind.STATE_CHANGE,
                p.key()
                    + " "
                    + before.label()
                    + " -> "
                    + HealthState.NO_SIGNAL.label()
                    + ": "
                    + why));
      }
    }
    if (any) {
      publish(lastPulseNumber, t);
    }
  }

  private void onStateChange(
      Parameter p, HealthState from, HealthState to, double v, double b, double t) {
    ParameterJudge judge = judges.get(p);
    String rule = judge.reading(v, b).text();
    ChangeDetector d = judge.detector();
    if (to == HealthState.DRIFTING && d.flagged() != ChangeDetector.NONE) {
      // Name when the change began, not only when it was noticed.
      String change =
          String.format(
              "%s since pulse #%d, t = %.1f s, noticed at #%d",
              d.flagged() == ChangeDetector.UP ? "rising" : "falling",
              d.changePulse(),
              d.changeTimeS(),
              d.noticedPulse());
      rule = rule.isEmpty() ? change : change + "; " + rule;
    }
    String value = String.format("%s %.4g %s", p.symbol(), v, p.unit());
    events.onEvent(
        clock.event(
            t,
            EventKind.STATE_CHANGE,
            p.key()
                + " "
                + from.label()
                + " -> "
                + to.label()
                + ": "
                + value
                + (rule.isEmpty() ? "" : " (" + rule + ")")));
    if (to == HealthState.BREACH) {
      int bit = 1 << p.ordinal();
      double change = Double.isNaN(b) || b == 0 ? Double.NaN : 100 * (v - b) / Math.abs(b);
      raised.set(p.ordinal(), new AlarmRecord(p, lastPulseNumber, t, v, b, change, rule));
      pendingAlarms.getAndUpdate(m -> m | bit);
      events.onEvent(
          clock.event(
              t, EventKind.ALARM, p.description() + " breach: " + value + ", rule " + rule));
    }
  }

  private String baselineText() {
    StringBuilder sb = new StringBuilder("from ").append(baseline.span()).append(':');
    for (Parameter p : Parameter.values()) {
      double v = baseline.value(p);
      if (!Double.isNaN(v)) {
        sb.append(String.format(" %s %.4g %s;", p.key(), v, p.unit()));
      }
    }
    return sb.toString();
  }

  private HealthSnapshot publish(long pulse, double t) {
    HealthSnapshot s = buildSnapshot(pulse, t);
    snapshot = s;
    return s;
  }

  private HealthSnapshot buildSnapshot(long pulse, double t) {
    EnumMap<Parameter, ParameterStatus> m = new EnumMap<>(Parameter.class);
    HealthState overall = HealthState.STEADY;
    int alarms = pendingAlarms.get();
    for (Parameter p : judged) {
      ParameterJudge j = judges.get(p);
      double v = lastValue[p.ordinal()];
      double b = baseline.isSet() ? baseline.value(p) : Double.NaN;
      double change = Double.isNaN(b) || b == 0 ? Double.NaN : 100 * (v - b) / Math.abs(b);
      boolean pending = (alarms & (1 << p.ordinal())) != 0;
      m.put(
          p,
          new ParameterStatus(
              p,
              j.state(),
              v,
              b,
              change,
              j.reading(v, b),
              pending,
              pending ? raised.get(p.ordinal()) : null));
      overall = HealthState.worse(overall, j.state());
    }
    Map<Parameter, ParameterStatus> view = Collections.unmodifiableMap(m);
    return new HealthSnapshot(pulse, t, overall, view, baseline.isSet(), baseline.pulsesHeld());
  }
}
