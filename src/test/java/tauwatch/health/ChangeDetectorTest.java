package tauwatch.health;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * The CUSUM change detector (Page 1954, Biometrika 41:100, from memory) on synthetic series with
 * known change points. Pulses at 2 per second, onset 0.1 s + k·0.5 s as in the simulator.
 *
 * <p>Bounds follow from the CUSUM's arithmetic with the default settings (k = 1σ, h = 8σ, clip 3σ):
 * a step far above the noise adds 3 − 1 = 2 per pulse, so it is declared on its 4th pulse (8/2); a
 * ramp of slope s (σ per pulse) leaves zero about k/s pulses after it starts and reaches h about
 * √(2h/s) pulses later. Noise widens these by a few pulses.
 */
class ChangeDetectorTest {
  private static final DriftDetection DEFAULTS = DriftDetection.defaults();
  private static final double BASE = 300; // e.g. Rin in MΩ
  private static final double NOISE = 0.0108 * BASE; // measured Rin scatter of the simulated cell

  /** First pulse (1-based) at which a change is flagged, with the detector's change point. */
  private record Detection(long noticed, long changePulse, double changeS) {}

  private static double time(long n) {
    return 0.1 + (n - 1) * 0.5;
  }

  private static Detection run(double[] x, DriftDetection s) {
    ChangeDetector d = new ChangeDetector(s, true, true);
    for (int i = 0; i < x.length; i++) {
      long n = i + 1;
      d.update(n, time(n), x[i], Double.NaN, i >= 20 ? BASE : Double.NaN);
      if (d.flagged() != ChangeDetector.NONE) {
        return new Detection(n, d.changePulse(), d.changeTimeS());
      }
    }
    return null;
  }

  private static double[] noise(int n, long seed) {
    Random rnd = new Random(seed);
    double[] x = new double[n];
    for (int i = 0; i < n; i++) {
      x[i] = BASE + NOISE * rnd.nextGaussian();
    }
    return x;
  }

  @Test
  void aTenPercentStepIsFlaggedWithinSixPulsesAndDatedToTheStep() {
    for (long seed = 1; seed <= 20; seed++) {
      double[] x = noise(600, seed);
      int start = 300; // 0-based index: pulse 301
      for (int i = start; i < x.length; i++) {
        x[i] += 0.10 * BASE;
      }
      Detection d = run(x, DEFAULTS);
      assertTrue(d != null, "seed " + seed);
      long delay = d.noticed() - (start + 1);
      assertTrue(delay >= 2 && delay <= 5, "seed " + seed + ": delay " + delay);
      // The statistic's last zero is at most a few pulses before the step (noise can lift it
      // early), never after it.
      assertTrue(
          d.changePulse() <= start + 1 && d.changePulse() >= start + 1 - 4,
          "seed " + seed + ": change point #" + d.changePulse());
      assertEquals(time(d.changePulse()), d.changeS(), 1e-9);
    }
  }

  @Test
  void aDownwardStepIsFlaggedLikeAnUpwardOne() {
    double[] x = noise(600, 3);
    for (int i = 300; i < x.length; i++) {
      x[i] -= 0.2 * BASE;
    }
    ChangeDetector d = new ChangeDetector(DEFAULTS, true, true);
    for (int i = 0; i < x.length; i++) {
      d.update(i + 1, time(i + 1), x[i], Double.NaN, BASE);
    }
    assertEquals(ChangeDetector.DOWN, d.flagged());
  }

  @Test
  void aChangeAwayFromEveryLimitIsNotDrift() {
    // Holding current limited only from below: a rise is not toward a limit.
    double[] x = noise(600, 4);
    for (int i = 300; i < x.length; i++) {
      x[i] += 0.2 * BASE;
    }
    ChangeDetector d = new ChangeDetector(DEFAULTS, false, true);
    for (int i = 0; i < x.length; i++) {
      d.update(i + 1, time(i + 1), x[i], Double.NaN, BASE);
    }
    assertEquals(ChangeDetector.NONE, d.flagged());
  }

  @Test
  void aRampOfTenPercentInFiveMinutesIsFlaggedEarlyAndDatedNearItsStart() {
    // Slope 0.1·300/600 = 0.05 MΩ/pulse = 0.0154σ/pulse: zero left ≈ k/s = 65 pulses after the
    // start, h reached √(2·8/0.0154) ≈ 32 later: ≈ 97 pulses, at ≈ +1.6 %. The last zero lags a
    // slow
    // ramp by about k/s (65 pulses here), widened by noise: bounds −20…+130 pulses.
    for (long seed = 1; seed <= 20; seed++) {
      double[] x = noise(1200, seed);
      int start = 300;
      for (int i = start; i < x.length; i++) {
        x[i] += 0.10 * BASE * Math.min(1, (i - start) / 600.0);
      }
      Detection d = run(x, DEFAULTS);
      assertTrue(d != null, "seed " + seed);
      long delay = d.noticed() - (start + 1);
      long cpError = d.changePulse() - (start + 1);
      assertTrue(delay >= 50 && delay <= 150, "seed " + seed + ": delay " + delay);
      assertTrue(cpError >= -20 && cpError <= 130, "seed " + seed + ": change point " + cpError);
    }
  }

  @Test
  void singleAndPairedOutliersAreIgnored() {
    // A +50 % outlier every 50 pulses, and a pair every 200: each clipped to 3σ adds ≤ 2.
    double[] x = noise(20_000, 5);
    for (int i = 100; i < x.length; i += 50) {
      x[i] += 0.5 * BASE;
      if (i % 200 == 100) {
        x[i + 1] -= 0.5 * BASE;
      }
    }
    assertEquals(null, run(x, DEFAULTS));
  }

  @Test
  void aStationaryDayAtTwoPulsesPerSecondRaisesAtMostOneFalseAlarm() {
    // 172 800 pulses = 24 h at 2 pulses/s, Gaussian noise at the simulated cell's measured Rin
    // scatter (just above the 1 % floor, so the measured σ sets the scale). Siegmund's
    // approximation of the one-sided run length, ARL ≈ (e^{2kb} − 1 − 2kb)/(2k²), b = h + 1.166,
    // gives ≈ 4.7·10⁷ pulses per side for k = 1, h = 8 with a perfect reference (from memory);
    // the reference's own error (≈ 0.16σ from 60 pulses) shortens it by orders of magnitude,
    // which the alarm-quality benchmark measures (≈ 0.2 a day per cell). Counted by re-arming after
    // each alarm; the test allows one.
    double[] x = noise(172_800, 24);
    ChangeDetector d = new ChangeDetector(DEFAULTS, true, true);
    int alarms = 0;
    for (int i = 0; i < x.length; i++) {
      d.update(i + 1, time(i + 1), x[i], Double.NaN, BASE);
      if (d.flagged() != ChangeDetector.NONE) {
        alarms++;
        d.restart();
      }
    }
    assertTrue(alarms <= 1, alarms + " false alarms in 24 h");
  }

  @Test
  void aNoiseFreeSeriesUsesTheRelativeFloorAndStillDetects() {
    double[] x = new double[400];
    java.util.Arrays.fill(x, BASE);
    for (int i = 200; i < x.length; i++) {
      x[i] = BASE * 1.05; // 5 % = 5 floors of 1 %: clipped to 3σ, declared on the 4th pulse
    }
    Detection d = run(x, DEFAULTS);
    assertEquals(204, d.noticed());
    assertEquals(201, d.changePulse());
  }

  @Test
  void aFlagClearsOnceTheValueIsBackAndTheDetectorReArms() {
    ChangeDetector d = new ChangeDetector(DEFAULTS, true, true);
    double[] x = noise(1000, 8);
    for (int i = 200; i < 300; i++) {
      x[i] += 0.1 * BASE;
    }
    boolean seen = false;
    for (int i = 0; i < x.length; i++) {
      d.update(i + 1, time(i + 1), x[i], Double.NaN, BASE);
      seen |= d.flagged() == ChangeDetector.UP;
    }
    assertTrue(seen);
    // Capped at h, the statistic falls by about k per pulse once back: clear within ~30 pulses.
    assertEquals(ChangeDetector.NONE, d.flagged());
    assertTrue(d.armed());
  }
}
