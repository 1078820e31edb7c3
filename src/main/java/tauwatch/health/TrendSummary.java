package tauwatch.health;

import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import tauwatch.event.EventKind;
import tauwatch.event.MonitorEvent;
import tauwatch.fit.Parameter;

/**
 * One parameter's course over a recorded session: baseline, final, minimum and maximum of the
 * accepted values, change from baseline, and time spent in each health state.
 *
 * <p>Immutable; computed after a session from its logs.
 *
 * @param secondsInState stream seconds per {@link HealthState}, in ordinal order
 */
public record TrendSummary(
    Parameter parameter,
    int count,
    double baseline,
    double last,
    double min,
    double max,
    double changePercent,
    double[] secondsInState) {

  private static final Pattern BASELINE_ITEM =
      Pattern.compile("(\\w+) (-?[0-9.]+(?:[eE][-+]?[0-9]+)?) ");
  private static final Pattern STATE_CHANGE =
      Pattern.compile(
          "^(\\w+) (steady|drifting|breach|no signal) -> (steady|drifting|breach|no signal)");

  /** The summary of {@code p}, or null when the log has no accepted value of it. */
  public static TrendSummary of(Parameter p, List<LoggedPulse> pulses, List<MonitorEvent> events) {
    int n = 0;
    double last = Double.NaN;
    double min = Double.POSITIVE_INFINITY;
    double max = Double.NEGATIVE_INFINITY;
    double t0 = Double.NaN;
    double t1 = Double.NaN;
    for (LoggedPulse r : pulses) {
      if (Double.isNaN(t0)) {
        t0 = r.streamTimeS();
      }
      t1 = r.streamTimeS();
      double v = r.values()[p.ordinal()];
      if (!r.accepted() || Double.isNaN(v)) {
        continue;
      }
      n++;
      last = v;
      min = Math.min(min, v);
      max = Math.max(max, v);
    }
    if (n == 0) {
      return null;
    }
    double baseline = baselineOf(p, events);
    double change =
        Double.isNaN(baseline) || baseline == 0
            ? Double.NaN
            : 100 * (last - baseline) / Math.abs(baseline);
    return new TrendSummary(
        p, n, baseline, last, min, max, change, secondsInState(p, events, t0, t1));
  }

  /** The first baseline of {@code p} named in a {@code baseline_set} event, or NaN. */
  public static double baselineOf(Parameter p, List<MonitorEvent> events) {
    for (MonitorEvent e : events) {
      if (e.kind() != EventKind.BASELINE_SET) {
        continue;
      }
      int colon = e.detail().indexOf(':');
      Matcher m = BASELINE_ITEM.matcher(e.detail().substring(colon + 1));
      while (m.find()) {
        if (m.group(1).equals(p.key())) {
          return Double.parseDouble(m.group(2));
        }
      }
    }
    return Double.NaN;
  }

  /** Seconds {@code p} spent in each state between {@code t0} and {@code t1}, by state ordinal. */
  static double[] secondsInState(Parameter p, List<MonitorEvent> events, double t0, double t1) {
    double[] out = new double[HealthState.values().length];
    HealthState state = HealthState.STEADY;
    double since = t0;
    for (StateChange c : changes(p, events)) {
      double t = Math.min(Math.max(c.streamTimeS(), t0), t1);
      out[state.ordinal()] += t - since;
      state = c.state();
      since = t;
    }
    out[state.ordinal()] += Math.max(0, t1 - since);
    return out;
  }

  /** A parameter's entry into a state, read from the event log. */
  public record StateChange(double streamTimeS, HealthState state) {}

  /** The state changes of a parameter in stream order, from the event log. */
  public static List<StateChange> changes(Parameter p, List<MonitorEvent> events) {
    List<StateChange> out = new java.util.ArrayList<>();
    for (MonitorEvent e : events) {
      if (e.kind() != EventKind.STATE_CHANGE || Double.isNaN(e.streamTimeS())) {
        continue;
      }
      Matcher m = STATE_CHANGE.matcher(e.detail());
      if (m.find() && m.group(1).equals(p.key())) {
        out.add(new StateChange(e.streamTimeS(), LoggedPulse.stateOf(m.group(3))));
      }
    }
    return out;
  }
}
