package tauwatch.endtoend;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import tauwatch.health.HealthCriteria;
import tauwatch.sim.Scenario;
import tauwatch.sim.ScenarioLoader;

/**
 * The whole chain on the simulated cell: {@code watch} with the simulator unpaced, read back from
 * the logs it wrote.
 */
class WatchSimulatedCellTest {
  @TempDir Path logs;

  /** Stream time of pulse k's onset in the shipped scenarios: 100 ms, then every 500 ms. */
  private static double onsetS(int k) {
    return 0.1 + 0.5 * k;
  }

  @Test
  void raCreepRaisesAnAccessResistanceBreachWhereTheScheduleCrossesTheAllowedChange()
      throws Exception {
    SessionFiles s =
        SessionFiles.run(
            logs,
            "watch",
            "--headless",
            "--no-pacing",
            "--quiet",
            "--source",
            "sim:ra-creep",
            "--duration",
            "300s");
    assertEquals(0, s.exitCode, s.err);

    // Where the schedule crosses the default rule (Ra may change by 20 % from its baseline, common
    // practice): the first pulse whose true Ra is at least 1.2 × the true baseline, then the
    // debounce of 3 pulses.
    Scenario sc = ScenarioLoader.load("ra-creep");
    double baseline = sc.truthAt(onsetS(10)).accessMOhm();
    int k = 0;
    while (sc.truthAt(onsetS(k)).accessMOhm() < 1.2 * baseline) {
      k++;
    }
    double expectedS = onsetS(k + HealthCriteria.DEFAULT_DEBOUNCE_PULSES - 1);

    List<Map<String, String>> alarms = s.events("alarm");
    assertEquals(1, alarms.size(), "one alarm: " + alarms);
    assertTrue(alarms.get(0).get("detail").startsWith("access resistance breach"));
    double alarmS = Double.parseDouble(alarms.get(0).get("t_s"));
    // ±5 pulses: the per-pulse Ra scatter (≈ 0.03 MΩ at 2 pA rms noise) against a slope of
    // 0.014 MΩ per pulse moves the first crossing by about two pulses either way.
    assertEquals(expectedS, alarmS, 2.5, "alarm at " + alarmS + " s, expected " + expectedS + " s");

    // Every pulse has its row; the rows after the alarm carry the breach.
    List<Map<String, String>> rows = s.csv("params.csv");
    assertEquals(600, rows.size());
    assertTrue(s.sessionJson().contains("\"pulses\" : 600"));
    assertTrue(s.sessionJson().contains("\"status\" : \"complete\""));
    Map<String, String> last = rows.get(rows.size() - 1);
    assertEquals("breach", last.get("state"));
    assertEquals("ra", last.get("alarms"));
  }

  @Test
  void aSteadyCellRaisesNoAlarmAndNoStateChange() throws Exception {
    SessionFiles s =
        SessionFiles.run(
            logs,
            "watch",
            "--headless",
            "--no-pacing",
            "--quiet",
            "--source",
            "sim:steady-cell",
            "--duration",
            "300s");
    assertEquals(0, s.exitCode, s.err);
    assertTrue(s.events("alarm").isEmpty(), s.out);
    assertTrue(s.events("state_change").isEmpty(), s.out);
    assertEquals(1, s.events("baseline_set").size());
    List<Map<String, String>> rows = s.csv("params.csv");
    assertEquals(600, rows.size());
    assertTrue(rows.stream().allMatch(r -> r.get("accepted").equals("true")));
    assertTrue(rows.stream().allMatch(r -> r.get("state").equals("steady")));
  }
}
