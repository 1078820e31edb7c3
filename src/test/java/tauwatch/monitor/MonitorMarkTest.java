package tauwatch.monitor;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import tauwatch.sim.ScenarioLoader;
import tauwatch.sim.SimulatedRecording;
import tauwatch.source.SimulatedSource;

/** A user's mark is never dropped silently: before the log opens it waits, after it is refused. */
class MonitorMarkTest {
  @Test
  void aMarkTypedBeforeTheLogOpensIsWrittenWhenItOpensAndOneAfterTheEndIsRefused(
      @TempDir Path logDir) throws Exception {
    MonitorConfig config = MonitorConfig.defaults();
    SimulatedSource src =
        new SimulatedSource(new SimulatedRecording(ScenarioLoader.load("steady-cell"), 3), false);
    Monitor m = new Monitor(src, config, PulseEstimators.forFormat(src.format(), config), logDir);

    assertEquals(MarkOutcome.QUEUED, m.mark("pipette in bath"));
    MonitorResult r = m.run(Duration.ofSeconds(2));
    assertEquals(MarkOutcome.SESSION_ENDED, m.mark("too late"));

    List<String> rows = Files.readAllLines(r.sessionDir().resolve("events.csv"));
    int start = indexOf(rows, ",session_start,");
    int mark = indexOf(rows, ",mark,pipette in bath (typed before the log opened)");
    assertTrue(start > 0 && mark > start, rows.toString());
    assertEquals(-1, indexOf(rows, "too late"), rows.toString());
  }

  private static int indexOf(List<String> rows, String part) {
    for (int i = 0; i < rows.size(); i++) {
      if (rows.get(i).contains(part)) {
        return i;
      }
    }
    return -1;
  }
}
