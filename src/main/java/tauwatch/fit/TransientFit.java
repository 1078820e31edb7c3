package tauwatch.fit;

import org.apache.commons.math3.exception.MathIllegalArgumentException;
import org.apache.commons.math3.exception.MathIllegalStateException;
import org.apache.commons.math3.fitting.leastsquares.LeastSquaresBuilder;
import org.apache.commons.math3.fitting.leastsquares.LeastSquaresOptimizer;
import org.apache.commons.math3.fitting.leastsquares.LeastSquaresProblem;
import org.apache.commons.math3.fitting.leastsquares.LevenbergMarquardtOptimizer;
import org.apache.commons.math3.fitting.leastsquares.MultivariateJacobianFunction;
import org.apache.commons.math3.fitting.leastsquares.ParameterValidator;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.ArrayRealVector;
import org.apache.commons.math3.linear.RealMatrix;
import org.apache.commons.math3.linear.RealVector;
import org.apache.commons.math3.util.Pair;

/**
 * Fits one transient with the mono-exponential I(t) = I_ss + A·e^(−t/τ) by Levenberg–Marquardt,
 * started from a closed-form guess.
 *
 * <p>Stateless and thread-safe; each call allocates the problem's arrays (a per-pulse cost, off the
 * sample path). Times are in ms from a reference row (the step's onset), currents in pA.
 */
final class TransientFit {
  private static final int P = 3;
  private static final int ISS = 0;
  private static final int AMP = 1;
  private static final int TAU = 2;

  private TransientFit() {}

  /** The outcome of one fit; {@code failure} is null when it converged. */
  static final class Result {
    String failure;
    double steadyPa;
    double amplitudePa;
    double tauMs;

    /** Covariance of (I_ss, A, τ), scaled by RSS/(n − p). */
    final double[][] covariance = new double[P][P];

    double rssPa2;

    /**
     * Rms residual over the unpooled rows, where the transient is: a misfit there is not diluted by
     * a long steady state.
     */
    double transientRmsPa;

    int samples;
    int iterations;

    double rmsPa() {
      return Math.sqrt(rssPa2 / samples);
    }
  }

  /**
   * Rows later than this many closed-form time constants after the fit's start are pooled into one
   * observation, their mean, weighted by their count. The model's mean over those rows is kept
   * exact, so this only drops the tail's within-group scatter, which carries no information about
   * I_ss, A or τ once e^(−t/τ) is below ~5·10⁻⁵ there; it cuts the Levenberg–Marquardt rows (and
   * Commons Math's per-row overhead) several-fold.
   */
  static final double POOL_AFTER_TAUS = 10;

  /**
   * Fits rows {@code from..to} (inclusive) of {@code y}; row {@code ref} is time 0 and rows are
   * {@code dtMs} apart.
   */
  static Result fit(double[] y, int from, int to, int ref, double dtMs, int maxIterations) {
    Result r = new Result();
    int n = to - from + 1;
    r.samples = n;
    double[] tAll = new double[n];
    double[] yAll = new double[n];
    for (int k = 0; k < n; k++) {
      tAll[k] = (from + k - ref) * dtMs;
      yAll[k] = y[from + k];
    }
    double tau0 = integralGuessTauMs(tAll, yAll);
    if (!(tau0 > 0) || !Double.isFinite(tau0)) {
      // No decay visible to the closed form: start from a tenth of the span and let LM decide.
      tau0 = 0.1 * (tAll[n - 1] - tAll[0]);
    }
    double[] start = linearAmplitudes(tAll, yAll, tau0);
    double tauFloorMs = 1e-3 * dtMs;

    int head = (int) Math.min(n, Math.ceil(POOL_AFTER_TAUS * tau0 / dtMs));
    int pooled = n - head;
    if (pooled < 2 || head < 2 * P) {
      head = n;
      pooled = 0;
    }
    double pooledMean = 0;
    double pooledScatter = 0;
    if (pooled > 0) {
      for (int k = head; k < n; k++) {
        pooledMean += yAll[k];
      }
      pooledMean /= pooled;
      for (int k = head; k < n; k++) {
        double d = yAll[k] - pooledMean;
        pooledScatter += d * d;
      }
    }
    int rows = head + (pooled > 0 ? 1 : 0);
    double[] target = new double[rows];
    System.arraycopy(yAll, 0, target, 0, head);
    double poolWeight = Math.sqrt(pooled);
    if (pooled > 0) {
      target[head] = poolWeight * pooledMean;
    }
    MonoExponential model =
        new MonoExponential(tAll, head, pooled > 0 ? tAll[head] : 0, pooled, dtMs, poolWeight);

    LeastSquaresProblem problem =
        new LeastSquaresBuilder()
            .start(start)
            .model(model)
            .target(target)
            .parameterValidator(new PositiveTau(tauFloorMs))
            .maxEvaluations(4 * maxIterations)
            .maxIterations(maxIterations)
            .lazyEvaluation(false)
            .build();
    LevenbergMarquardtOptimizer lm =
        new LevenbergMarquardtOptimizer()
            .withCostRelativeTolerance(1e-9)
            .withParameterRelativeTolerance(1e-9);
    LeastSquaresOptimizer.Optimum opt;
    try {
      opt = lm.optimize(problem);
    } catch (MathIllegalStateException e) {
      // Too many iterations or evaluations, or LM could not make progress: a bad pulse, not a bug.
      r.failure = "fit did not converge (" + e.getClass().getSimpleName() + ")";
      return r;
    }
    double[] p = opt.getPoint().toArray();
    r.steadyPa = p[ISS];
    r.amplitudePa = p[AMP];
    r.tauMs = p[TAU];
    r.iterations = opt.getIterations();
    double cost = opt.getCost();
    r.rssPa2 = cost * cost + pooledScatter;
    r.transientRmsPa = Math.sqrt(cost * cost / rows);
    RealMatrix cov;
    try {
      cov = opt.getCovariances(1e-14);
    } catch (MathIllegalArgumentException e) {
      r.failure = "fit covariance is singular";
      return r;
    }
    // Commons Math's covariance is (JᵀJ)⁻¹, unscaled: multiply by s² = RSS/(n − p).
    double s2 = n > P ? r.rssPa2 / (n - P) : Double.NaN;
    for (int i = 0; i < P; i++) {
      for (int j = 0; j < P; j++) {
        r.covariance[i][j] = cov.getEntry(i, j) * s2;
      }
    }
    if (!(r.tauMs > tauFloorMs) || !Double.isFinite(r.amplitudePa)) {
      r.failure = "fit gave a non-positive time constant";
    }
    return r;
  }

  /**
   * Closed-form τ from the integral form of the ODE: y' = −(y − I_ss)/τ integrates to y(t) = y(t₀)
   * − S(t)/τ + (I_ss/τ)(t − t₀) with S the running integral of y, which is linear in the unknowns
   * (a Prony-type successive-integration estimate; robust to noise because it integrates, not
   * differentiates). Returns NaN when the regression is degenerate.
   */
  static double integralGuessTauMs(double[] t, double[] y) {
    int n = t.length;
    double offset = y[n - 1];
    // Normal equations of y ~ c0 + c1·S + c2·(t − t0), y centred on its last value for
    // conditioning.
    double s00 = 0, s01 = 0, s02 = 0, s11 = 0, s12 = 0, s22 = 0, b0 = 0, b1 = 0, b2 = 0;
    double running = 0;
    double prev = y[0] - offset;
    for (int k = 0; k < n; k++) {
      double yk = y[k] - offset;
      if (k > 0) {
        running += 0.5 * (prev + yk) * (t[k] - t[k - 1]);
      }
      prev = yk;
      double u = t[k] - t[0];
      s00 += 1;
      s01 += running;
      s02 += u;
      s11 += running * running;
      s12 += running * u;
      s22 += u * u;
      b0 += yk;
      b1 += running * yk;
      b2 += u * yk;
    }
    double det =
        s00 * (s11 * s22 - s12 * s12)
            - s01 * (s01 * s22 - s12 * s02)
            + s02 * (s01 * s12 - s11 * s02);
    if (det == 0 || !Double.isFinite(det)) {
      return Double.NaN;
    }
    // Cramer's rule for c1 only.
    double det1 =
        s00 * (b1 * s22 - s12 * b2) - b0 * (s01 * s22 - s12 * s02) + s02 * (s01 * b2 - b1 * s02);
    double c1 = det1 / det;
    return -1 / c1;
  }

  /** Best I_ss and A for a fixed τ (the model is linear in them: variable projection). */
  static double[] linearAmplitudes(double[] t, double[] y, double tauMs) {
    double n = t.length;
    double se = 0, see = 0, sy = 0, sey = 0;
    for (int k = 0; k < t.length; k++) {
      double e = Math.exp(-t[k] / tauMs);
      se += e;
      see += e * e;
      sy += y[k];
      sey += e * y[k];
    }
    double det = n * see - se * se;
    double amp = det != 0 ? (n * sey - se * sy) / det : 0;
    double iss = (sy - amp * se) / n;
    return new double[] {iss, amp, tauMs};
  }

  /**
   * I_ss + A·e^(−t/τ) and its analytic Jacobian on the head rows, plus one weighted row for the
   * mean over the pooled tail (summed by the recurrence e_(k+1) = e_k·e^(−dt/τ), no exp per row).
   */
  private static final class MonoExponential implements MultivariateJacobianFunction {
    private final double[] t;
    private final int head;
    private final double poolStartMs;
    private final int pooled;
    private final double dtMs;
    private final double poolWeight;

    MonoExponential(
        double[] t, int head, double poolStartMs, int pooled, double dtMs, double poolWeight) {
      this.t = t;
      this.head = head;
      this.poolStartMs = poolStartMs;
      this.pooled = pooled;
      this.dtMs = dtMs;
      this.poolWeight = poolWeight;
    }

    @Override
    public Pair<RealVector, RealMatrix> value(RealVector point) {
      double iss = point.getEntry(ISS);
      double amp = point.getEntry(AMP);
      double tau = point.getEntry(TAU);
      int rows = head + (pooled > 0 ? 1 : 0);
      double[] f = new double[rows];
      double[][] jac = new double[rows][P];
      double invTau = 1 / tau;
      double invTau2 = invTau * invTau;
      for (int k = 0; k < head; k++) {
        double e = Math.exp(-t[k] * invTau);
        f[k] = iss + amp * e;
        double[] row = jac[k];
        row[ISS] = 1;
        row[AMP] = e;
        row[TAU] = amp * e * t[k] * invTau2;
      }
      if (pooled > 0) {
        double q = Math.exp(-dtMs * invTau);
        double e = Math.exp(-poolStartMs * invTau);
        double tk = poolStartMs;
        double sumE = 0;
        double sumTe = 0;
        for (int k = 0; k < pooled; k++) {
          sumE += e;
          sumTe += tk * e;
          e *= q;
          tk += dtMs;
        }
        double meanE = sumE / pooled;
        double meanTe = sumTe / pooled;
        f[head] = poolWeight * (iss + amp * meanE);
        double[] row = jac[head];
        row[ISS] = poolWeight;
        row[AMP] = poolWeight * meanE;
        row[TAU] = poolWeight * amp * meanTe * invTau2;
      }
      return new Pair<>(new ArrayRealVector(f, false), new Array2DRowRealMatrix(jac, false));
    }
  }

  /** Keeps τ positive while LM iterates (a step may overshoot through zero). */
  private static final class PositiveTau implements ParameterValidator {
    private final double floorMs;

    PositiveTau(double floorMs) {
      this.floorMs = floorMs;
    }

    @Override
    public RealVector validate(RealVector params) {
      if (!(params.getEntry(TAU) > floorMs)) {
        params.setEntry(TAU, Math.max(floorMs, Math.abs(params.getEntry(TAU))));
      }
      return params;
    }
  }
}
