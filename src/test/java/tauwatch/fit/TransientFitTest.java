package tauwatch.fit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;

import java.util.Random;
import org.apache.commons.math3.fitting.leastsquares.LeastSquaresBuilder;
import org.apache.commons.math3.fitting.leastsquares.LeastSquaresOptimizer;
import org.apache.commons.math3.fitting.leastsquares.LevenbergMarquardtOptimizer;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.ArrayRealVector;
import org.apache.commons.math3.util.Pair;
import org.junit.jupiter.api.Test;

/**
 * The transient fit, closed-form start and all, against a plain Commons Math Levenberg–Marquardt
 * fit of every row from a generic start (the reference library, STACK.md), on a noisy exponential.
 */
class TransientFitTest {
  @Test
  void fitAgreesWithAPlainCommonsMathFitOfEveryRow() {
    int n = 500;
    double dt = 0.02;
    double[] y = new double[n + 1];
    Random rng = new Random(11);
    for (int i = 1; i <= n; i++) {
      y[i] = -30 + -480 * Math.exp(-i * dt / 0.3) + 2.5 * rng.nextGaussian();
    }
    TransientFit.Result r = TransientFit.fit(y, 1, n, 0, dt, 50);
    assertNull(r.failure);

    double[] t = new double[n];
    double[] target = new double[n];
    for (int k = 0; k < n; k++) {
      t[k] = (k + 1) * dt;
      target[k] = y[k + 1];
    }
    LeastSquaresOptimizer.Optimum ref =
        new LevenbergMarquardtOptimizer()
            .optimize(
                new LeastSquaresBuilder()
                    .start(new double[] {-20, -400, 0.2})
                    .target(target)
                    .maxEvaluations(1000)
                    .maxIterations(1000)
                    .model(
                        p -> {
                          double[] f = new double[n];
                          double[][] j = new double[n][3];
                          for (int k = 0; k < n; k++) {
                            double e = Math.exp(-t[k] / p.getEntry(2));
                            f[k] = p.getEntry(0) + p.getEntry(1) * e;
                            j[k][0] = 1;
                            j[k][1] = e;
                            j[k][2] = p.getEntry(1) * e * t[k] / (p.getEntry(2) * p.getEntry(2));
                          }
                          return new Pair<>(new ArrayRealVector(f), new Array2DRowRealMatrix(j));
                        })
                    .build());
    double[] p = ref.getPoint().toArray();
    double s2 = ref.getCost() * ref.getCost() / (n - 3);
    double[] se = ref.getSigma(1e-14).mapMultiply(Math.sqrt(s2)).toArray();
    // The same cost minimised from different starts: agreement within 0.1 % of a standard error on
    // the estimates and 0.01 % on the standard errors themselves.
    assertEquals(p[0], r.steadyPa, 1e-3 * se[0]);
    assertEquals(p[1], r.amplitudePa, 1e-3 * se[1]);
    assertEquals(p[2], r.tauMs, 1e-3 * se[2]);
    assertEquals(se[2], Math.sqrt(r.covariance[2][2]), 1e-4 * se[2]);
    assertEquals(se[0], Math.sqrt(r.covariance[0][0]), 1e-4 * se[0]);
    assertEquals(ref.getCost() * ref.getCost(), r.rssPa2, 1e-8 * r.rssPa2);
  }

  @Test
  void integralClosedFormRecoversTauOfACleanExponential() {
    // y = c + A·e^(−t/τ) satisfies y' = −(y − c)/τ exactly; trapezoidal integration at τ/dt = 15
    // leaves an error of order (dt/τ)²/12 ≈ 4e-4 (standard quadrature error).
    int n = 400;
    double[] y = new double[n];
    for (int k = 0; k < n; k++) {
      y[k] = 12 + 300 * Math.exp(-0.02 * (k + 1) / 0.3);
    }
    assertEquals(0.3, TransientFit.integralGuessTauMs(y, 0, n - 1, 0.02), 1e-3 * 0.3);
  }
}
