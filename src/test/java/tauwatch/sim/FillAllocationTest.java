package tauwatch.sim;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.lang.management.ManagementFactory;
import org.junit.jupiter.api.Test;

/**
 * The per-sample path allocates nothing: the JVM's per-thread allocation counter
 * (com.sun.management.ThreadMXBean#getThreadAllocatedBytes) does not move over millions of samples
 * after warm-up. An allocation counter, not a timing.
 */
class FillAllocationTest {

  @Test
  void fillAllocatesNothingInSteadyStateIncludingWhileTheScheduleChanges() {
    for (String name : new String[] {"steady-cell", "ra-creep", "dendritic-cell"}) {
      Scenario s = ScenarioLoader.loadBuiltIn(name);
      if (name.equals("ra-creep")) {
        // Start inside the creep so that every 10 ms step re-discretises.
        s =
            new Scenario(
                s.name(),
                s.description(),
                s.durationS(),
                s.seed(),
                s.protocol(),
                new AmplifierSettings(50_000, 10_000, 2.0, 5.0, 50, 16, 2000),
                ParameterSchedule.builder(s.schedule().at(0))
                    .knots(CellQuantity.ACCESS_MOHM, new double[] {0, 100}, new double[] {10, 20})
                    .build());
      }
      SimulatedRecording rec = new SimulatedRecording(s, 1);
      double[] cmd = new double[4096];
      double[] im = new double[4096];
      for (int i = 0; i < 500; i++) {
        rec.fill(cmd, im, 0, cmd.length); // warm-up: let the JIT compile fill
      }
      com.sun.management.ThreadMXBean mx =
          (com.sun.management.ThreadMXBean) ManagementFactory.getThreadMXBean();
      long id = Thread.currentThread().getId();
      long before = mx.getThreadAllocatedBytes(id);
      for (int i = 0; i < 1000; i++) {
        rec.fill(cmd, im, 0, cmd.length); // 4.1 M samples
      }
      long after = mx.getThreadAllocatedBytes(id);
      assertEquals(0, after - before, name + ": bytes allocated over 4.1 M samples");
    }
  }
}
