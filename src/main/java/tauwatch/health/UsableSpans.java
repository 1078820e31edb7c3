package tauwatch.health;

import java.util.ArrayList;
import java.util.List;
import tauwatch.event.EventKind;
import tauwatch.event.MonitorEvent;

/**
 * Finds the usable spans of a recorded session from its logged pulses and events.
 *
 * <p>Stateless; runs after a session (or on its logs), so it may allocate freely.
 *
 * <p>A pulse is good when it was accepted and the overall state after it is {@code steady} or
 * {@code drifting} (a drift is a warning, the criteria are still met). Rejected pulses neither
 * extend nor end a span. A span ends at the last good pulse before a breach, a loss of signal, a
 * new baseline set by the user (the reference changed), a stretch without accepted pulses longer
 * than the no-signal timeout, or the end of the recording.
 */
public final class UsableSpans {
  private UsableSpans() {}

  public static List<UsableSpan> find(
      List<LoggedPulse> pulses, List<MonitorEvent> events, double maxGapS) {
    List<UsableSpan> spans = new ArrayList<>();
    List<MonitorEvent> breaks = new ArrayList<>();
    boolean firstBaseline = true;
    for (MonitorEvent e : events) {
      if (e.kind() == EventKind.BASELINE_SET) {
        if (!firstBaseline) {
          breaks.add(e);
        }
        firstBaseline = false;
      } else if (e.kind() == EventKind.STATE_CHANGE && e.detail().contains("-> no signal")) {
        breaks.add(e);
      }
    }
    int nextBreak = 0;
    LoggedPulse first = null;
    LoggedPulse last = null;
    int count = 0;
    for (LoggedPulse p : pulses) {
      if (!p.accepted()) {
        continue;
      }
      String reason = null;
      while (nextBreak < breaks.size() && breaks.get(nextBreak).streamTimeS() <= p.streamTimeS()) {
        MonitorEvent b = breaks.get(nextBreak++);
        if (reason == null && last != null && b.streamTimeS() >= last.streamTimeS()) {
          reason = b.kind() == EventKind.BASELINE_SET ? "baseline set anew" : "no signal";
        }
      }
      boolean good = p.state() == HealthState.STEADY || p.state() == HealthState.DRIFTING;
      if (first != null && reason == null && p.streamTimeS() - last.streamTimeS() > maxGapS) {
        reason =
            String.format(
                java.util.Locale.ROOT,
                "no accepted pulse for %.1f s",
                p.streamTimeS() - last.streamTimeS());
      }
      if (first != null && reason == null && !good) {
        reason =
            p.state().label()
                + (p.alarms() == null || p.alarms().isEmpty() ? "" : ": " + p.alarms());
      }
      if (first != null && reason != null) {
        spans.add(span(first, last, count, reason));
        first = null;
      }
      if (good) {
        if (first == null) {
          first = p;
          count = 0;
        }
        last = p;
        count++;
      }
    }
    if (first != null) {
      spans.add(span(first, last, count, "end of recording"));
    }
    return spans;
  }

  private static UsableSpan span(LoggedPulse a, LoggedPulse b, int n, String reason) {
    return new UsableSpan(
        a.pulse(),
        b.pulse(),
        a.streamTimeS(),
        b.streamTimeS(),
        a.timeIso(),
        b.timeIso(),
        n,
        reason,
        a.sweep(),
        b.sweep());
  }
}
