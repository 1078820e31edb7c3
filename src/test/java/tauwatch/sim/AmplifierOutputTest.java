package tauwatch.sim;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import org.junit.jupiter.api.Test;

/** Noise, hum, digitiser and determinism of the simulated amplifier output. */
class AmplifierOutputTest {
  // First pulse at 20 s: the first second is holding only.
  private static final TestPulseProtocol LATE_PULSES =
      new TestPulseProtocol(-70, -5, 10, 500, 20_000);
  private static final CellParameters CELL = CellParameters.soma(10, 300, 30, -65);

  private static double[] response(AmplifierSettings amp, long seed, int n) {
    Scenario s = new Scenario("amp", "", 1, 1, LATE_PULSES, amp, ParameterSchedule.constant(CELL));
    double[] cmd = new double[n];
    double[] im = new double[n];
    new SimulatedRecording(s, seed).fill(cmd, im, 0, n);
    return im;
  }

  private static double rms(double[] y) {
    double mean = Arrays.stream(y).average().orElseThrow();
    double ss = 0;
    for (double v : y) {
      ss += (v - mean) * (v - mean);
    }
    return Math.sqrt(ss / y.length);
  }

  @Test
  void filteredNoiseHasTheConfiguredRmsAtTheOutput() {
    // 500k samples, correlation of a few samples: the rms estimate scatters by well under 1 %.
    double[] y = response(new AmplifierSettings(50_000, 10_000, 2.0, 0, 50, 0, 0), 11, 500_000);
    assertEquals(2.0, rms(y), 0.02 * 2.0);
  }

  @Test
  void unfilteredNoiseHasTheConfiguredRms() {
    double[] y = response(new AmplifierSettings(50_000, 0, 3.0, 0, 50, 0, 0), 12, 500_000);
    assertEquals(3.0, rms(y), 0.02 * 3.0);
  }

  @Test
  void humAddsASinusoidOfTheConfiguredAmplitude() {
    // rms of a sine over whole periods is A/√2 (common practice).
    double[] y = response(new AmplifierSettings(50_000, 10_000, 0, 10, 50, 0, 0), 1, 50_000);
    assertEquals(10 / Math.sqrt(2), rms(y), 1e-6);
    double max = Arrays.stream(y).max().orElseThrow() - Arrays.stream(y).average().orElseThrow();
    assertEquals(10, max, 1e-3);
  }

  @Test
  void sameSeedGivesIdenticalSamplesAndAnotherSeedDoesNot() {
    AmplifierSettings amp = new AmplifierSettings(50_000, 10_000, 2.0, 1, 50, 16, 2000);
    double[] a = response(amp, 42, 100_000);
    double[] b = response(amp, 42, 100_000);
    double[] c = response(amp, 43, 100_000);
    assertArrayEquals(a, b);
    assertFalse(Arrays.equals(a, c));
  }

  @Test
  void theDigitiserRoundsToTheLsbAndClipsAtFullScale() {
    // 16 bits over ±2000 pA: LSB = 4000/65536 pA. Same noise stream with and without the ADC.
    AmplifierSettings raw = new AmplifierSettings(50_000, 10_000, 2.0, 0, 50, 0, 0);
    AmplifierSettings adc = new AmplifierSettings(50_000, 10_000, 2.0, 0, 50, 16, 2000);
    double lsb = 4000.0 / 65536;
    assertEquals(lsb, adc.adcLsbPa(), 0);
    double[] y = response(raw, 5, 50_000);
    double[] q = response(adc, 5, 50_000);
    for (int k = 0; k < y.length; k++) {
      double code = q[k] / lsb;
      assertEquals(Math.rint(code), code, 1e-9);
      assertTrue(Math.abs(q[k] - y[k]) <= lsb / 2 + 1e-12);
    }
    AdcQuantiser small = new AdcQuantiser(8, 100);
    assertEquals(-100, small.quantise(-500), 0);
    assertEquals(100 - 200.0 / 256, small.quantise(500), 0);
  }

  @Test
  void fillInPiecesGivesTheSameSamplesAsOneCall() {
    Scenario s = ScenarioLoader.loadBuiltIn("ra-creep");
    int n = 60_000;
    double[] c1 = new double[n];
    double[] r1 = new double[n];
    new SimulatedRecording(s, 3).fill(c1, r1, 0, n);
    double[] c2 = new double[n];
    double[] r2 = new double[n];
    SimulatedRecording pieces = new SimulatedRecording(s, 3);
    int at = 0;
    int[] sizes = {1, 7, 333, 4096, 12345};
    for (int i = 0; at < n; i++) {
      int len = Math.min(sizes[i % sizes.length], n - at);
      pieces.fill(c2, r2, at, len);
      at += len;
    }
    assertArrayEquals(c1, c2);
    assertArrayEquals(r1, r2);
    assertEquals(n, pieces.samplesGenerated());
    assertEquals(n / 50_000.0, pieces.timeS(), 1e-12);
  }
}
