package tauwatch.checkout;

import java.util.Arrays;

/**
 * Measures a live stream's true sample rate from when its pulses arrived: the wall-clock seconds
 * per stream second, taken from the least-delayed pulses near each end of the run.
 *
 * <p>Single-threaded (the analysis thread); keeps two growing arrays, one entry per pulse. A pulse
 * can arrive late (the link, the reader or the machine was busy) but never early, so each arrival
 * is the stream's own clock plus a delay ≥ 0. Comparing only the first and the last arrival, one
 * late pulse at either end skews the rate by its delay over the run (50 ms over 3 s is 1.7 %);
 * comparing the smallest delay among the first third of the pulses with the smallest among the last
 * third discards such pulses.
 */
final class WallClockRate {
  private double[] streamS = new double[64];
  private long[] arrivalNanos = new long[64];
  private int count;

  /** One pulse: its stream time and the wall-clock time its last sample arrived. */
  void add(double streamTimeS, long arrivedNanos) {
    if (count == streamS.length) {
      streamS = Arrays.copyOf(streamS, 2 * count);
      arrivalNanos = Arrays.copyOf(arrivalNanos, 2 * count);
    }
    streamS[count] = streamTimeS;
    arrivalNanos[count] = arrivedNanos;
    count++;
  }

  /** Wall-clock nanoseconds from the first to the last pulse's arrival, 0 with fewer than two. */
  long spanNanos() {
    return count < 2 ? 0 : arrivalNanos[count - 1] - arrivalNanos[0];
  }

  /**
   * The measured sample rate for a stream labelled {@code nominalRateHz}, NaN with fewer than two
   * pulses or no stream time between the two ends.
   */
  double rateHz(double nominalRateHz) {
    if (count < 2) {
      return Double.NaN;
    }
    int third = Math.max(1, count / 3);
    int early = leastDelayed(0, third);
    int late = leastDelayed(count - third, count);
    double streamSpan = streamS[late] - streamS[early];
    if (!(streamSpan > 0)) {
      return Double.NaN;
    }
    double wallSpan = (arrivalNanos[late] - arrivalNanos[early]) * 1e-9;
    return nominalRateHz * streamSpan / wallSpan;
  }

  /** The pulse in {@code [from, to)} whose arrival lags its stream time the least. */
  private int leastDelayed(int from, int to) {
    int best = from;
    double bestLag = Double.POSITIVE_INFINITY;
    for (int i = from; i < to; i++) {
      // Relative to the first arrival, so the doubles stay small and exact enough.
      double lag = (arrivalNanos[i] - arrivalNanos[0]) * 1e-9 - (streamS[i] - streamS[0]);
      if (lag < bestLag) {
        bestLag = lag;
        best = i;
      }
    }
    return best;
  }
}
