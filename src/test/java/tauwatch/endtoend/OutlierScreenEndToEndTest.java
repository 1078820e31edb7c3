package tauwatch.endtoend;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The outlier screen in the whole chain: a sudden real change is held back only until the next
 * pulses confirm it, then reaches the health rules and breaches; the pulses held back show as
 * rejected in {@code params.csv} with the reason.
 */
class OutlierScreenEndToEndTest {
  @TempDir Path logs;

  @Test
  void aSuddenResealStillBreachesRaWithinAFewPulsesOfTheJump() throws Exception {
    // sim:sudden-reseal: Ra 12 MΩ, rising to 40 MΩ between 150.0 and 150.8 s; pulses every 0.5 s
    // from 0.1 s. The default rule allows a 20 % change of Ra (common practice).
    SessionFiles s =
        SessionFiles.run(
            logs,
            "watch",
            "--headless",
            "--no-pacing",
            "--quiet",
            "--source",
            "sim:sudden-reseal",
            "--duration",
            "156s");
    assertEquals(0, s.exitCode, s.err);
    List<Map<String, String>> rows = s.csv("params.csv");
    double jumpS = 150.0;
    for (Map<String, String> r : rows) {
      double t = Double.parseDouble(r.get("t_s"));
      if (t < jumpS) {
        // Before the jump no pulse of the steady stretch is taken for an outlier.
        assertEquals("true", r.get("accepted"), "pulse at " + t + ": " + r.get("reject_reason"));
      }
    }
    List<Map<String, String>> held =
        rows.stream().filter(r -> r.get("reject_reason").startsWith("outlier against")).toList();
    assertTrue(held.size() <= 2, "at most the jump and one confirmation held back: " + held);
    for (Map<String, String> r : held) {
      assertTrue(Double.parseDouble(r.get("t_s")) > jumpS, "held back after the jump: " + r);
    }
    List<Map<String, String>> alarms = s.events("alarm");
    assertEquals(1, alarms.size(), "one alarm: " + alarms);
    assertTrue(alarms.get(0).get("detail").startsWith("access resistance breach"));
    double alarmS = Double.parseDouble(alarms.get(0).get("t_s"));
    // Two pulses held back, then the 3-pulse debounce: the 5th pulse after the jump at the latest.
    assertTrue(
        alarmS > jumpS && alarmS <= jumpS + 0.1 + 4 * 0.5 + 1e-6, "alarm at " + alarmS + " s");
    System.out.println(
        "sudden reseal: " + held.size() + " pulses held back, Ra breach at " + alarmS + " s");
  }
}
