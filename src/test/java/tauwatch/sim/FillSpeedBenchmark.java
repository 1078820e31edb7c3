package tauwatch.sim;

import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.Test;

/**
 * Samples per second of {@link SimulatedRecording#fill} on the steady cell. A benchmark: excluded
 * from the test run (tag {@code bench}); run with {@code mvn -o test -Dtest=FillSpeedBenchmark
 * -Dsurefire.excludedGroups=none}. Prints, asserts nothing.
 */
@Tag("bench")
class FillSpeedBenchmark {

  @Test
  void printFillSpeed() {
    for (String name : new String[] {"steady-cell", "dendritic-cell", "ra-creep"}) {
      SimulatedRecording rec = new SimulatedRecording(ScenarioLoader.loadBuiltIn(name), 1);
      double[] cmd = new double[8192];
      double[] im = new double[8192];
      for (int i = 0; i < 2000; i++) {
        rec.fill(cmd, im, 0, cmd.length);
      }
      int rounds = 5000;
      long t0 = System.nanoTime();
      for (int i = 0; i < rounds; i++) {
        rec.fill(cmd, im, 0, cmd.length);
      }
      double s = (System.nanoTime() - t0) * 1e-9;
      System.out.printf("%s: %.1f M samples/s%n", name, rounds * 8192.0 / s / 1e6);
    }
  }
}
