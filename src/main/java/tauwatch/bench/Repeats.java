package tauwatch.bench;

import tauwatch.health.Medians;

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

  /**
   * A warm-up round counts as quiet when the JIT compilers spent less than this fraction of the
   * round's wall time compiling.
   */
  static final double SETTLED_COMPILE_FRACTION = 0.05;

  /** Quiet warm-up rounds in a row that count as a settled JIT. */
  static final int SETTLED_ROUNDS = 3;

  /** Warm-up rounds run, and whether the JIT had settled by the last of them. */
  record WarmUp(int rounds, boolean settled) {
    String describe() {
      return rounds
          + " warm-up round"
          + (rounds == 1 ? "" : "s")
          + (settled ? "" : ", JIT not settled");
    }
  }

  private Repeats() {}

  /**
   * Runs untimed rounds until {@link #SETTLED_ROUNDS} in a row pass in which the JIT compiled for
   * less than {@link #SETTLED_COMPILE_FRACTION} of the round, at most {@code maxRounds}. A round of
   * a whole chain holds only a few hundred pulses, so the per-pulse code reaches the optimising
   * compiler only after several rounds, and it compiles in bursts; timing rounds while it still
   * compiles measures the compiler, which takes one of this machine's two cores.
   */
  static WarmUp untilCompiled(int maxRounds, Round r) throws Exception {
    java.lang.management.CompilationMXBean jit =
        java.lang.management.ManagementFactory.getCompilationMXBean();
    if (jit == null || !jit.isCompilationTimeMonitoringSupported()) {
      for (int i = 0; i < maxRounds; i++) {
        sink += r.run();
      }
      return new WarmUp(maxRounds, false);
    }
    int quiet = 0;
    for (int i = 1; ; i++) {
      long c0 = jit.getTotalCompilationTime();
      long t0 = System.nanoTime();
      sink += r.run();
      double wallMs = (System.nanoTime() - t0) * 1e-6;
      double compileMs = jit.getTotalCompilationTime() - c0;
      quiet = compileMs < SETTLED_COMPILE_FRACTION * wallMs ? quiet + 1 : 0;
      if (quiet == SETTLED_ROUNDS || i == maxRounds) {
        return new WarmUp(i, quiet == SETTLED_ROUNDS);
      }
    }
  }

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
    return Medians.inPlace(v.clone(), v.length);
  }
}
