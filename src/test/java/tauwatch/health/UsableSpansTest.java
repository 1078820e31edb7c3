package tauwatch.health;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import tauwatch.event.EventKind;
import tauwatch.event.MonitorEvent;
import tauwatch.fit.Parameter;

/** Usable spans from logged pulses and events with known breach, loss and baseline times. */
class UsableSpansTest {
  private static LoggedPulse row(long n, HealthState s, boolean accepted, String alarms) {
    double[] v = new double[Parameter.values().length];
    java.util.Arrays.fill(v, Double.NaN);
    return new LoggedPulse(n, 0.1 + (n - 1) * 0.5, "t" + n, accepted, s, alarms, n / 10, v);
  }

  @Test
  void breachesSignalLossAndANewBaselineEndSpansAndDriftingDoesNot() {
    List<LoggedPulse> rows = new ArrayList<>();
    for (long n = 1; n <= 100; n++) {
      HealthState s =
          n >= 40 && n < 50
              ? HealthState.BREACH
              : n >= 30 ? HealthState.DRIFTING : HealthState.STEADY;
      rows.add(row(n, s, n != 20, s == HealthState.BREACH ? "ra" : ""));
    }
    // Pulses 61–69 missing (no signal), then a user's baseline at pulse 90.
    rows.removeIf(r -> r.pulse() > 60 && r.pulse() < 70);
    List<MonitorEvent> ev =
        List.of(
            new MonitorEvent(
                0, 10.1, EventKind.BASELINE_SET, "from accepted pulses #1–#20: ra 10 MΩ;"),
            new MonitorEvent(
                0, 32.1, EventKind.STATE_CHANGE, "ra steady -> no signal: no test pulse for 5.0 s"),
            new MonitorEvent(
                0,
                44.6,
                EventKind.BASELINE_SET,
                "from last 20 accepted pulses up to #90: ra 11 MΩ;"));
    List<UsableSpan> spans = UsableSpans.find(rows, ev, 5);
    assertEquals(4, spans.size(), spans.toString());
    assertEquals(1, spans.get(0).firstPulse());
    assertEquals(39, spans.get(0).lastPulse());
    assertEquals("breach: ra", spans.get(0).endReason());
    assertEquals(38, spans.get(0).pulses()); // pulse 20 was rejected
    assertEquals(50, spans.get(1).firstPulse());
    assertEquals(60, spans.get(1).lastPulse());
    assertEquals("no signal", spans.get(1).endReason());
    assertEquals(70, spans.get(2).firstPulse());
    assertEquals(89, spans.get(2).lastPulse());
    assertEquals("baseline set anew", spans.get(2).endReason());
    assertEquals(90, spans.get(3).firstPulse());
    assertEquals("end of recording", spans.get(3).endReason());
    assertEquals(10, spans.get(3).lastSweep()); // pulse 100, sweep = n / 10
  }

  @Test
  void aStretchWithoutAcceptedPulsesLongerThanTheTimeoutEndsASpan() {
    List<LoggedPulse> rows = new ArrayList<>();
    for (long n = 1; n <= 40; n++) {
      rows.add(row(n, HealthState.STEADY, n <= 10 || n > 25, ""));
    }
    List<UsableSpan> spans = UsableSpans.find(rows, List.of(), 5);
    assertEquals(2, spans.size());
    assertEquals("no accepted pulse for 8.0 s", spans.get(0).endReason());
  }
}
