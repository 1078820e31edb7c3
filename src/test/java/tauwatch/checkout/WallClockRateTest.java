package tauwatch.checkout;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.junit.jupiter.api.Test;

/** The rate measured from arrivals against the rate the synthetic stream was given. */
class WallClockRateTest {
  private static final double NOMINAL_HZ = 50_000;

  /** Pulses every 500 ms of stream time from a clock running {@code trueHz}, delayed by delayS. */
  private static WallClockRate arrivals(double trueHz, double[] delayS) {
    WallClockRate r = new WallClockRate();
    long start = 1_000_000_000_000L;
    for (int i = 0; i < delayS.length; i++) {
      double streamS = 0.5 * i;
      double wallS = streamS * NOMINAL_HZ / trueHz + delayS[i];
      r.add(streamS, start + Math.round(wallS * 1e9));
    }
    return r;
  }

  @Test
  void punctualArrivalsGiveTheTrueRate() {
    double trueHz = 50_100; // a digitiser 0.2 % fast
    WallClockRate r = arrivals(trueHz, new double[8]);
    assertEquals(trueHz, r.rateHz(NOMINAL_HZ), 1e-6 * trueHz);
  }

  @Test
  void aLateFirstOrLastPulseDoesNotSkewTheRate() {
    // 7 pulses over 3 s, as a short checkout sees them; the last arrives 50 ms late, which alone
    // would make a first-to-last comparison read 1.6 % slow, past a 1 % tolerance.
    double[] delays = {0.002, 0.001, 0.003, 0.001, 0.002, 0.001, 0.050};
    WallClockRate r = arrivals(NOMINAL_HZ, delays);
    assertEquals(NOMINAL_HZ, r.rateHz(NOMINAL_HZ), 0.002 * NOMINAL_HZ);
    double[] lateFirst = {0.080, 0.001, 0.002, 0.001, 0.003, 0.001, 0.002};
    assertEquals(
        NOMINAL_HZ, arrivals(NOMINAL_HZ, lateFirst).rateHz(NOMINAL_HZ), 0.002 * NOMINAL_HZ);
  }

  @Test
  void randomDelaysOverALongerRunAverageOut() {
    Random rnd = new Random(3);
    double[] delays = new double[120];
    for (int i = 0; i < delays.length; i++) {
      // Mostly a millisecond or two, now and then a stall of up to 100 ms.
      delays[i] = rnd.nextInt(10) == 0 ? 0.1 * rnd.nextDouble() : 0.002 * rnd.nextDouble();
    }
    double trueHz = 49_950;
    double measured = arrivals(trueHz, delays).rateHz(NOMINAL_HZ);
    assertEquals(trueHz, measured, 1e-4 * trueHz);
  }

  @Test
  void fewerThanTwoPulsesMeasureNothing() {
    WallClockRate r = new WallClockRate();
    assertTrue(Double.isNaN(r.rateHz(NOMINAL_HZ)));
    r.add(0, 1);
    assertTrue(Double.isNaN(r.rateHz(NOMINAL_HZ)));
    assertEquals(0, r.spanNanos());
  }
}
