package tauwatch.fit;

import org.apache.commons.math3.exception.MathIllegalArgumentException;
import org.apache.commons.math3.exception.MathIllegalStateException;
import org.apache.commons.math3.fitting.leastsquares.LeastSquaresBuilder;
import org.apache.commons.math3.fitting.leastsquares.LeastSquaresOptimizer;
import org.apache.commons.math3.fitting.leastsquares.LeastSquaresProblem;
import org.apache.commons.math3.fitting.leastsquares.LevenbergMarquardtOptimizer;
import org.apache.commons.math3.fitting.leastsquares.MultivariateJacobianFunction;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.ArrayRealVector;
import org.apache.commons.math3.linear.RealMatrix;
import org.apache.commons.math3.linear.RealVector;
import org.apache.commons.math3.util.Pair;

/**
 * Fits one transient with the two-exponential I(t) = I_ss + A₁·e^(−t/τ₁) + A₂·e^(−t/τ₂), τ₁ &lt;
 * τ₂, by Levenberg–Marquardt, started from the best pair on a grid of time constants around the
 * one-exponential τ.
 *
 * <p>Stateless and thread-safe; each call allocates the problem's arrays (per pulse). The start
 * uses variable projection: for fixed (τ₁, τ₂) the offset and amplitudes are linear, solved by the
 * 3×3 normal equations, and the grid pair with the least residual seeds the full fit (Golub &amp;
 * Pereyra's separable least squares; from memory).
 */
final class BiExponentialFit {
  static final int P = 5;
  static final int ISS = 0;
  static final int A1 = 1;
  static final int T1 = 2;
  static final int A2 = 3;
  static final int T2 = 4;

  private static final double[] FAST_GRID = {0.1, 0.2, 0.35, 0.55, 0.8};
  private static final double[] SLOW_GRID = {1.3, 2, 3, 4.5, 7, 11, 17, 26};

  private BiExponentialFit() {}

  /** The outcome of one fit; {@code failure} is null when it converged. */
  static final class Result {
    String failure;
    final double[] p = new double[P];

    /** Covariance of (I_ss, A₁, τ₁, A₂, τ₂), scaled by RSS/(n − p). */
    final double[][] covariance = new double[P][P];

    double rssPa2;
    int samples;
  }

  static Result fit(
      double[] y, int from, int to, int ref, double dtMs, int maxIterations, double monoTauMs) {
    Result r = new Result();
    int n = to - from + 1;
    r.samples = n;
    double[] t = new double[n];
    double[] v = new double[n];
    for (int k = 0; k < n; k++) {
      t[k] = (from + k - ref) * dtMs;
      v[k] = y[from + k];
    }
    double[] best = null;
    double bestRss = Double.POSITIVE_INFINITY;
    double[] lin = new double[3];
    for (double f : FAST_GRID) {
      for (double s : SLOW_GRID) {
        double t1 = f * monoTauMs;
        double t2 = s * monoTauMs;
        double rss = linear(t, v, t1, t2, lin);
        if (rss < bestRss) {
          bestRss = rss;
          best = new double[] {lin[0], lin[1], t1, lin[2], t2};
        }
      }
    }
    if (best == null) {
      r.failure = "two-exponential start not found";
      return r;
    }
    double floorMs = 1e-3 * dtMs;
    LeastSquaresProblem problem =
        new LeastSquaresBuilder()
            .start(best)
            .model(new Model(t))
            .target(v)
            .parameterValidator(
                p -> {
                  for (int i : new int[] {T1, T2}) {
                    if (!(p.getEntry(i) > floorMs)) {
                      p.setEntry(i, Math.max(floorMs, Math.abs(p.getEntry(i))));
                    }
                  }
                  return p;
                })
            .maxEvaluations(4 * maxIterations)
            .maxIterations(maxIterations)
            .lazyEvaluation(false)
            .build();
    LeastSquaresOptimizer.Optimum opt;
    try {
      opt =
          new LevenbergMarquardtOptimizer()
              .withCostRelativeTolerance(1e-9)
              .withParameterRelativeTolerance(1e-9)
              .optimize(problem);
    } catch (MathIllegalStateException e) {
      r.failure = "two-exponential fit did not converge (" + e.getClass().getSimpleName() + ")";
      return r;
    }
    double[] p = opt.getPoint().toArray();
    if (p[T1] > p[T2]) {
      // Keep τ₁ the fast one.
      double ta = p[T1];
      double aa = p[A1];
      p[T1] = p[T2];
      p[A1] = p[A2];
      p[T2] = ta;
      p[A2] = aa;
    }
    System.arraycopy(p, 0, r.p, 0, P);
    double cost = opt.getCost();
    r.rssPa2 = cost * cost;
    RealMatrix cov;
    try {
      cov = opt.getCovariances(1e-14);
    } catch (MathIllegalArgumentException e) {
      r.failure = "two-exponential covariance is singular";
      return r;
    }
    boolean swapped = opt.getPoint().getEntry(T1) > opt.getPoint().getEntry(T2);
    int[] map = swapped ? new int[] {ISS, A2, T2, A1, T1} : new int[] {ISS, A1, T1, A2, T2};
    double s2 = n > P ? r.rssPa2 / (n - P) : Double.NaN;
    for (int i = 0; i < P; i++) {
      for (int j = 0; j < P; j++) {
        r.covariance[i][j] = cov.getEntry(map[i], map[j]) * s2;
      }
    }
    if (!(p[T1] > floorMs) || !Double.isFinite(p[A1]) || !Double.isFinite(p[A2])) {
      r.failure = "two-exponential fit gave a non-positive time constant";
    }
    return r;
  }

  /**
   * Least-squares offset and amplitudes for fixed time constants into {@code out} (I_ss, A₁, A₂);
   * returns the residual sum of squares, or +∞ when the normal equations are singular.
   */
  static double linear(double[] t, double[] v, double t1, double t2, double[] out) {
    int n = t.length;
    double s1 = 0, s2 = 0, s11 = 0, s22 = 0, s12 = 0, sy = 0, sy1 = 0, sy2 = 0, syy = 0;
    // Rows are evenly spaced: e^(−t/τ) by recurrence, one exp per series.
    double dt = n > 1 ? t[1] - t[0] : 0;
    double q1 = Math.exp(-dt / t1);
    double q2 = Math.exp(-dt / t2);
    double e1 = Math.exp(-t[0] / t1);
    double e2 = Math.exp(-t[0] / t2);
    for (int k = 0; k < n; k++, e1 *= q1, e2 *= q2) {
      s1 += e1;
      s2 += e2;
      s11 += e1 * e1;
      s22 += e2 * e2;
      s12 += e1 * e2;
      sy += v[k];
      sy1 += v[k] * e1;
      sy2 += v[k] * e2;
      syy += v[k] * v[k];
    }
    double[][] m = {{n, s1, s2}, {s1, s11, s12}, {s2, s12, s22}};
    double[] rhs = {sy, sy1, sy2};
    double det = det3(m);
    if (!(Math.abs(det) > 0) || !Double.isFinite(det)) {
      return Double.POSITIVE_INFINITY;
    }
    for (int c = 0; c < 3; c++) {
      double[][] mc = {m[0].clone(), m[1].clone(), m[2].clone()};
      for (int r = 0; r < 3; r++) {
        mc[r][c] = rhs[r];
      }
      out[c] = det3(mc) / det;
    }
    // RSS = yᵀy − βᵀXᵀy for the least-squares β.
    return syy - (out[0] * sy + out[1] * sy1 + out[2] * sy2);
  }

  private static double det3(double[][] m) {
    return m[0][0] * (m[1][1] * m[2][2] - m[1][2] * m[2][1])
        - m[0][1] * (m[1][0] * m[2][2] - m[1][2] * m[2][0])
        + m[0][2] * (m[1][0] * m[2][1] - m[1][1] * m[2][0]);
  }

  /** The model and its analytic Jacobian at every row. */
  private static final class Model implements MultivariateJacobianFunction {
    private final double[] t;

    Model(double[] t) {
      this.t = t;
    }

    @Override
    public Pair<RealVector, RealMatrix> value(RealVector point) {
      double iss = point.getEntry(ISS);
      double a1 = point.getEntry(A1);
      double t1 = point.getEntry(T1);
      double a2 = point.getEntry(A2);
      double t2 = point.getEntry(T2);
      int n = t.length;
      double[] f = new double[n];
      double[][] jac = new double[n][P];
      for (int k = 0; k < n; k++) {
        double e1 = Math.exp(-t[k] / t1);
        double e2 = Math.exp(-t[k] / t2);
        f[k] = iss + a1 * e1 + a2 * e2;
        double[] row = jac[k];
        row[ISS] = 1;
        row[A1] = e1;
        row[T1] = a1 * e1 * t[k] / (t1 * t1);
        row[A2] = e2;
        row[T2] = a2 * e2 * t[k] / (t2 * t2);
      }
      return new Pair<>(new ArrayRealVector(f, false), new Array2DRowRealMatrix(jac, false));
    }
  }
}
