package tauwatch.bench;

import java.util.Arrays;

/**
 * A hand-rolled timing harness: warm-up rounds, then the median of repeated timed rounds.
 *
 * <p>Single-threaded. The work is given as a {@link Round} that returns a value the harness keeps,
 * so that the JIT cannot drop it.
 */
final class Repeats {
  /** One timed round; returns something derived from the work. */
  @FunctionalInterface
  interface Round {
    double run() throws Exception;
  }

  static volatile double sink;

  private Repeats() {}

  /** Median seconds per round over {@code rounds} rounds after {@code warmUps} untimed ones. */
  static double medianSeconds(int warmUps, int rounds, Round r) throws Exception {
    for (int i = 0; i < warmUps; i++) {
      sink += r.run();
    }
    double[] s = new double[rounds];
    for (int i = 0; i < rounds; i++) {
      long t0 = System.nanoTime();
      sink += r.run();
      s[i] = (System.nanoTime() - t0) * 1e-9;
    }
    return median(s);
  }

  static double median(double[] v) {
    double[] s = v.clone();
    Arrays.sort(s);
    int n = s.length;
    return n % 2 == 1 ? s[n / 2] : 0.5 * (s[n / 2 - 1] + s[n / 2]);
  }
}
