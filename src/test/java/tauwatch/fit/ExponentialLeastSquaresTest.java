package tauwatch.fit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;

import java.util.Random;
import java.util.stream.Stream;
import org.apache.commons.math3.fitting.leastsquares.LeastSquaresBuilder;
import org.apache.commons.math3.fitting.leastsquares.LeastSquaresOptimizer;
import org.apache.commons.math3.fitting.leastsquares.LevenbergMarquardtOptimizer;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.ArrayRealVector;
import org.apache.commons.math3.linear.RealMatrix;
import org.apache.commons.math3.util.Pair;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * The in-house normal-equations Levenberg–Marquardt solver against Commons Math's
 * LevenbergMarquardtOptimizer (the reference library, STACK.md) on the same rows from the same
 * start: one and two exponentials, clean and noisy, fast and slow time constants. Both minimise the
 * same cost, so optima must agree to a small fraction of a standard error and covariances to a
 * fraction of a percent.
 */
class ExponentialLeastSquaresTest {
  static Stream<Arguments> monoCases() {
    // (τ ms, amplitude pA, noise pA, seed): a 5 MΩ/5 pF soma to a large slow cell at 50 kHz rows.
    return Stream.of(
        Arguments.of(0.05, -900.0, 0.0, 1L),
        Arguments.of(0.3, -480.0, 2.5, 2L),
        Arguments.of(0.3, -480.0, 20.0, 3L),
        Arguments.of(1.2, 250.0, 5.0, 4L),
        Arguments.of(4.0, -60.0, 2.0, 5L),
        Arguments.of(0.8, 40.0, 10.0, 6L));
  }

  @ParameterizedTest
  @MethodSource("monoCases")
  void oneExponentialMatchesCommonsMath(double tau, double amp, double noise, long seed) {
    double dt = 0.02;
    int n = (int) Math.ceil(Math.max(10 * tau, 4) / dt);
    double[] y = curve(n, dt, 3, new double[] {amp}, new double[] {tau}, -35, noise, seed);
    double[] start = {-30, 0.8 * amp, 1.3 * tau};
    check(y, 3, dt, 1, start);
  }

  static Stream<Arguments> biCases() {
    // (τ₁, A₁, τ₂, A₂, noise, seed): a soma with a dendrite, as in the dendritic scenario.
    return Stream.of(
        Arguments.of(0.15, -600.0, 1.5, -120.0, 0.0, 7L),
        Arguments.of(0.15, -600.0, 1.5, -120.0, 3.0, 8L),
        Arguments.of(0.3, -300.0, 3.0, -90.0, 2.0, 9L),
        Arguments.of(0.1, 400.0, 0.6, 150.0, 1.0, 10L));
  }

  @ParameterizedTest
  @MethodSource("biCases")
  void twoExponentialsMatchCommonsMath(
      double t1, double a1, double t2, double a2, double noise, long seed) {
    double dt = 0.02;
    int n = (int) Math.ceil(12 * t2 / dt);
    double[] y = curve(n, dt, 2, new double[] {a1, a2}, new double[] {t1, t2}, -20, noise, seed);
    double[] start = {-25, 0.7 * a1, 0.8 * t1, 1.2 * a2, 1.3 * t2};
    check(y, 2, dt, 2, start);
  }

  @Test
  void flatDataCannotIdentifyATimeConstant() {
    // No transient: τ has no influence on the cost once A is 0, so JᵀJ is singular.
    double[] y = new double[400];
    java.util.Arrays.fill(y, 12.5);
    ExponentialLeastSquares lsq = new ExponentialLeastSquares(y, 0, 399, 0, 0.02, 1, 2e-5);
    assertNotEquals(
        ExponentialLeastSquares.Status.CONVERGED, lsq.solve(new double[] {12.5, 0, 0.3}, 100));
  }

  @Test
  void poolingTheDecayedTailChangesTheFitOnlyWithinTheNoise() {
    // τ = 0.3 ms over 20 ms: rows past 10τ (85 % of them) pooled into one weighted mean.
    double dt = 0.02;
    double[] y = curve(1000, dt, 0, new double[] {-480}, new double[] {0.3}, -30, 2.5, 13L);
    int head = (int) Math.ceil(10 * 0.3 / dt);
    ExponentialLeastSquares all = new ExponentialLeastSquares(y, 5, 1000, 0, dt, 1, 0);
    ExponentialLeastSquares pooled =
        new ExponentialLeastSquares(y, 5, 1000, 0, dt, 1, 0, 996 - head);
    double[] start = {-25, -400, 0.25};
    assertEquals(ExponentialLeastSquares.Status.CONVERGED, all.solve(start, 100));
    assertEquals(ExponentialLeastSquares.Status.CONVERGED, pooled.solve(start, 100));
    double s2 = all.rss / (996 - 3);
    for (int u = 0; u < 3; u++) {
      double se = Math.sqrt(all.inverseNormal[u][u] * s2);
      assertEquals(all.x[u], pooled.x[u], 0.05 * se, "parameter " + u);
      assertEquals(
          all.inverseNormal[u][u], pooled.inverseNormal[u][u], 0.02 * all.inverseNormal[u][u]);
    }
    assertEquals(all.rss, pooled.rss, 1e-3 * all.rss);
  }

  @Test
  void gridStartIsThePairWithTheLeastResidualOfAllPairs() {
    // The one-pass grid (sums shared between pairs) against solving every pair on its own.
    double dt = 0.02;
    double[] y = curve(600, dt, 0, new double[] {-500, -150}, new double[] {0.2, 2.0}, -10, 2, 12L);
    double monoTau = 0.6;
    double[] best = BiExponentialFit.gridStart(y, 4, 600, 4 * dt, dt, monoTau);
    double bestRss = Double.POSITIVE_INFINITY;
    double[] bestPair = null;
    double[] lin = new double[3];
    for (double f : BiExponentialFit.FAST_GRID) {
      for (double g : BiExponentialFit.SLOW_GRID) {
        double rss = BiExponentialFit.linear(y, 4, 600, 4 * dt, dt, f * monoTau, g * monoTau, lin);
        if (rss < bestRss) {
          bestRss = rss;
          bestPair = new double[] {lin[0], lin[1], f * monoTau, lin[2], g * monoTau};
        }
      }
    }
    for (int k = 0; k < 5; k++) {
      assertEquals(bestPair[k], best[k], 1e-9 * Math.max(1, Math.abs(bestPair[k])), "entry " + k);
    }
  }

  /** Rows 0..n of offset + Σ a·e^(−t/τ) + noise, t = row·dt; fitting starts at row {@code from}. */
  private static double[] curve(
      int n,
      double dt,
      int from,
      double[] amps,
      double[] taus,
      double offset,
      double noise,
      long seed) {
    Random rng = new Random(seed);
    double[] y = new double[n + 1];
    for (int i = 0; i <= n; i++) {
      double t = i * dt;
      double v = offset;
      for (int k = 0; k < amps.length; k++) {
        v += amps[k] * Math.exp(-t / taus[k]);
      }
      y[i] = v + noise * rng.nextGaussian();
    }
    return y;
  }

  private static void check(double[] y, int from, double dt, int exponentials, double[] start) {
    int to = y.length - 1;
    int n = to - from + 1;
    int p = 1 + 2 * exponentials;
    ExponentialLeastSquares lsq = new ExponentialLeastSquares(y, from, to, 0, dt, exponentials, 0);
    assertEquals(ExponentialLeastSquares.Status.CONVERGED, lsq.solve(start, 200));

    LeastSquaresOptimizer.Optimum ref =
        new LevenbergMarquardtOptimizer()
            .withCostRelativeTolerance(1e-12)
            .withParameterRelativeTolerance(1e-12)
            .optimize(
                new LeastSquaresBuilder()
                    .start(start)
                    .target(java.util.Arrays.copyOfRange(y, from, to + 1))
                    .maxEvaluations(10_000)
                    .maxIterations(10_000)
                    .model(
                        v -> {
                          double[] f = new double[n];
                          double[][] j = new double[n][p];
                          for (int k = 0; k < n; k++) {
                            double t = (from + k) * dt;
                            f[k] = v.getEntry(0);
                            j[k][0] = 1;
                            for (int c = 0; c < exponentials; c++) {
                              double a = v.getEntry(1 + 2 * c);
                              double tau = v.getEntry(2 + 2 * c);
                              double e = Math.exp(-t / tau);
                              f[k] += a * e;
                              j[k][1 + 2 * c] = e;
                              j[k][2 + 2 * c] = a * e * t / (tau * tau);
                            }
                          }
                          return new Pair<>(new ArrayRealVector(f), new Array2DRowRealMatrix(j));
                        })
                    .build());
    double refRss = ref.getCost() * ref.getCost();
    RealMatrix cov = ref.getCovariances(1e-14);
    double s2 = Math.max(refRss, 1e-20) / (n - p);
    for (int u = 0; u < p; u++) {
      double se = Math.sqrt(cov.getEntry(u, u) * s2);
      double refValue = ref.getPoint().getEntry(u);
      // Clean data: agreement to 1e-7 of the value; noisy: to 1e-3 of a standard error.
      double tol = Math.max(1e-3 * se, 1e-7 * Math.abs(refValue));
      assertEquals(refValue, lsq.x[u], tol, "parameter " + u);
      assertEquals(
          cov.getEntry(u, u), lsq.inverseNormal[u][u], 1e-4 * cov.getEntry(u, u), "cov " + u);
    }
    assertEquals(refRss, lsq.rss, Math.max(1e-8 * refRss, 1e-18));
  }
}
