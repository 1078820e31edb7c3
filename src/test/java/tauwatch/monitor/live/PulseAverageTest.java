package tauwatch.monitor.live;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.Random;
import org.apache.commons.math3.stat.StatUtils;
import org.junit.jupiter.api.Test;
import tauwatch.pulse.PulseWindow;
import tauwatch.stream.ClampMode;

/** The average overlay's mean, checked sample by sample against Commons Math's StatUtils.mean. */
class PulseAverageTest {
  private static final int N = 300;

  private static PulseTrace noisyPulse(Random rnd, long number, int onset) {
    PulseWindow w = new PulseWindow(N);
    w.length = N;
    w.onsetIndex = onset;
    w.offsetIndex = onset + 100;
    w.sampleIntervalS = 20e-6;
    w.mode = ClampMode.VOLTAGE_CLAMP;
    w.pulseNumber = number;
    for (int i = 0; i < N; i++) {
      w.command[i] = i >= onset && i < onset + 100 ? -75 : -70;
      w.response[i] = -20 + 5 * rnd.nextGaussian();
    }
    return PulseTrace.copyOf(w);
  }

  @Test
  void theAverageIsTheMeanOfTheLatestTracesSampleBySample() {
    Random rnd = new Random(42);
    PulseAverage avg = new PulseAverage(10);
    PulseTrace[] all = new PulseTrace[25];
    PulseTrace mean = null;
    for (int k = 0; k < all.length; k++) {
      all[k] = noisyPulse(rnd, k + 1, 50);
      mean = avg.add(all[k]);
    }
    assertEquals(10, avg.count());
    assertEquals(25, mean.pulseNumber());
    for (int i = 0; i < N; i++) {
      double[] column = new double[10];
      for (int k = 0; k < 10; k++) {
        column[k] = all[15 + k].response(i);
      }
      // Float storage of the mean: 1e-4 pA is far below its 7 significant digits here.
      assertEquals(StatUtils.mean(column), mean.response(i), 1e-4, "sample " + i);
    }
    assertEquals(-70, mean.command(0), 1e-6);
    assertEquals(-75, mean.command(60), 1e-6);
  }

  @Test
  void aPulseWithOtherStepTimingStartsTheAverageAfresh() {
    Random rnd = new Random(7);
    PulseAverage avg = new PulseAverage(10);
    for (int k = 0; k < 5; k++) {
      avg.add(noisyPulse(rnd, k + 1, 50));
    }
    PulseTrace other = noisyPulse(rnd, 6, 80);
    PulseTrace mean = avg.add(other);
    assertEquals(1, avg.count());
    for (int i = 0; i < N; i++) {
      assertEquals(other.response(i), mean.response(i), 1e-6);
    }
  }
}
