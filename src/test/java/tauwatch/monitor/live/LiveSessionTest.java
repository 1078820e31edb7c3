package tauwatch.monitor.live;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import tauwatch.event.EventKind;
import tauwatch.fit.Parameter;
import tauwatch.monitor.MonitorConfig;
import tauwatch.monitor.PulseEstimators;
import tauwatch.sim.ScenarioLoader;
import tauwatch.sim.SimulatedRecording;
import tauwatch.source.SimulatedSource;

/** The whole pipeline feeding the live model, as the window sees it. */
class LiveSessionTest {
  @Test
  void aSimulatedSessionFillsTheSnapshotAndTheTrendsAndLogsAMark(@TempDir Path logDir)
      throws Exception {
    MonitorConfig config = MonitorConfig.defaults();
    SimulatedSource src =
        new SimulatedSource(new SimulatedRecording(ScenarioLoader.load("steady-cell"), 3), false);
    LiveSession s =
        LiveSession.start(
            src,
            config,
            PulseEstimators.forFormat(src.format(), config),
            logDir,
            Duration.ofSeconds(20));
    // The mark may come before the monitor has opened its logs: wait for the first pulse.
    long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(60);
    while (s.model().snapshot().pulses() == 0 && System.nanoTime() < deadline) {
      Thread.sleep(5);
    }
    s.mark("drug on");
    assertTrue(s.awaitEnd(60, TimeUnit.SECONDS));
    assertNull(s.failure());
    assertFalse(s.running());

    LiveSnapshot snap = s.model().snapshot();
    // 20 s at 2 pulses/s (steady-cell protocol, period 500 ms).
    assertEquals(s.result().pulses(), snap.pulses());
    assertTrue(snap.pulses() >= 38, "pulses " + snap.pulses());
    assertEquals(snap.pulses(), s.model().trends().rowCount());
    assertNotNull(snap.trace());
    assertEquals(snap.latest().pulseNumber(), snap.trace().pulseNumber());
    assertNotNull(snap.baselineTrace(), "baseline set after 20 accepted pulses");
    assertFalse(snap.lastAccepted().fittedTransients().isEmpty());
    assertTrue(snap.health().baselineSet());
    List<EventKind> kinds = snap.recentEvents().stream().map(e -> e.kind()).toList();
    assertTrue(
        kinds.contains(EventKind.SESSION_START) && kinds.contains(EventKind.MARK),
        kinds.toString());
    double ra = snap.lastAccepted().value(Parameter.ACCESS_RESISTANCE);
    assertTrue(ra > 5 && ra < 25, "Ra " + ra);

    List<String> events = Files.readAllLines(s.sessionDir().resolve("events.csv"));
    assertTrue(events.stream().anyMatch(l -> l.contains(",mark,") && l.contains("drug on")));
    SourceStatus st = SourceStatus.read(src.name(), 50_000, s.counters(), null);
    assertEquals(s.result().samples(), st.samples());
  }

  @Test
  void theRaCreepScenarioBreachesAccessResistanceAndRaisesAnAlarm(@TempDir Path logDir)
      throws Exception {
    // ra-creep: Ra 10 MΩ until 120 s, then linearly to 20 MΩ at 480 s (simulator/ra-creep.toml).
    // The default rule (20 % change from baseline, common practice) is crossed at 12 MΩ, ≈ 192 s.
    MonitorConfig config = MonitorConfig.defaults();
    SimulatedSource src =
        new SimulatedSource(new SimulatedRecording(ScenarioLoader.load("ra-creep")), false);
    LiveSession s =
        LiveSession.start(
            src,
            config,
            PulseEstimators.forFormat(src.format(), config),
            logDir,
            Duration.ofSeconds(215));
    assertTrue(s.awaitEnd(120, TimeUnit.SECONDS));
    assertNull(s.failure());
    LiveSnapshot snap = s.model().snapshot();
    assertEquals(
        tauwatch.health.HealthState.BREACH, snap.health().state(Parameter.ACCESS_RESISTANCE));
    assertTrue(snap.health().parameters().get(Parameter.ACCESS_RESISTANCE).alarmPending());
    assertEquals(1, snap.alarmHistory().size(), snap.alarmHistory().toString());
    double breachS = snap.alarmHistory().get(0).streamTimeS();
    assertTrue(breachS > 180 && breachS < 205, "breach at " + breachS + " s");
    TrendHistory h = s.model().trends();
    assertEquals(
        tauwatch.health.HealthState.BREACH.ordinal(),
        h.stateOrdinal(h.rowCount() - 1, Parameter.ACCESS_RESISTANCE));
  }
}
