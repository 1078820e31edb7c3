package tauwatch.health;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import tauwatch.event.EventKind;
import tauwatch.event.MonitorEvent;
import tauwatch.monitor.Monitor;
import tauwatch.monitor.MonitorConfig;
import tauwatch.monitor.PulseEstimators;
import tauwatch.sim.ScenarioLoader;
import tauwatch.sim.SimulatedRecording;
import tauwatch.source.SimulatedSource;

/**
 * The Ra-creep scenario through the whole chain (unpaced simulator, segmenter, estimator, health):
 * Ra is 10 MΩ to 120 s, then rises linearly to 20 MΩ at 480 s (scenario {@code ra-creep}, seed 2).
 */
class RaCreepDriftTest {
  @TempDir Path dir;

  @Test
  void accessResistanceDriftsBeforeItBreachesAndTheChangePointIsNearTheTrueStart()
      throws Exception {
    SimulatedSource src =
        new SimulatedSource(
            new SimulatedRecording(ScenarioLoader.loadBuiltIn("ra-creep"), 2), false);
    MonitorConfig config = MonitorConfig.defaults();
    List<MonitorEvent> events = new ArrayList<>();
    Monitor m =
        new Monitor(src, config, PulseEstimators.forFormat(src.format(), config), dir)
            .addEventListener(events::add);
    // 300 s is past the breach at +20 % (12 MΩ at 192 s) and keeps the test short.
    m.run(Duration.ofSeconds(300));
    double drifting = Double.NaN;
    double breach = Double.NaN;
    String driftText = null;
    for (MonitorEvent e : events) {
      if (e.kind() != EventKind.STATE_CHANGE || !e.detail().startsWith("ra ")) {
        continue;
      }
      if (e.detail().contains("-> drifting") && Double.isNaN(drifting)) {
        drifting = e.streamTimeS();
        driftText = e.detail();
      }
      if (e.detail().contains("-> breach") && Double.isNaN(breach)) {
        breach = e.streamTimeS();
      }
    }
    assertTrue(!Double.isNaN(drifting) && !Double.isNaN(breach), events.toString());
    assertTrue(drifting < breach, "drifting at " + drifting + " s, breach at " + breach + " s");
    Matcher cp = Pattern.compile("since pulse #(\\d+), t = ([0-9.]+) s").matcher(driftText);
    assertTrue(cp.find(), driftText);
    long pulse = Long.parseLong(cp.group(1));
    // True start: 120 s; pulses at 0.1 s + k·0.5 s, so pulse 241 is the first at or after 120 s.
    // The last zero of the CUSUM lags a ramp by ≈ k/slope = 1σ/(0.139σ per pulse) ≈ 7 pulses
    // (σ = the 1 % floor, 0.1 MΩ; slope 10 MΩ / 720 pulses): bound 0…+12 pulses.
    assertTrue(pulse >= 241 - 2 && pulse <= 241 + 12, driftText);
    // Noticed well before the limit: by 10 % of the allowed change the detector has spoken.
    assertTrue(drifting < 140, driftText + " at " + drifting + " s");
  }
}
