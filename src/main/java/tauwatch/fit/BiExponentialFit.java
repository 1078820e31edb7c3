package tauwatch.fit;

/**
 * Fits one transient with the two-exponential I(t) = I_ss + A₁·e^(−t/τ₁) + A₂·e^(−t/τ₂), τ₁ &lt;
 * τ₂, by Levenberg–Marquardt ({@link ExponentialLeastSquares}), started from the best pair on a
 * grid of time constants around the one-exponential τ.
 *
 * <p>Stateless and thread-safe; each call allocates a small result and the solver's scratch (per
 * pulse). The start uses variable projection: for fixed (τ₁, τ₂) the offset and amplitudes are
 * linear, solved by the 3×3 normal equations, and the grid pair with the least residual seeds the
 * full fit (Golub &amp; Pereyra's separable least squares; from memory).
 */
final class BiExponentialFit {
  static final int P = 5;
  static final int ISS = 0;
  static final int A1 = 1;
  static final int T1 = 2;
  static final int A2 = 3;
  static final int T2 = 4;

  static final double[] FAST_GRID = {0.1, 0.2, 0.35, 0.55, 0.8};
  static final double[] SLOW_GRID = {1.3, 2, 3, 4.5, 7, 11, 17, 26};

  /**
   * Rows later than this many slow time constants of the start after the fit's first row are pooled
   * into one observation (see {@link ExponentialLeastSquares}); e^(−10) ≈ 5·10⁻⁵.
   */
  static final double POOL_AFTER_SLOW_TAUS = 10;

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
    double t0 = (from - ref) * dtMs;
    return fitFrom(
        y, from, to, ref, dtMs, maxIterations, gridStart(y, from, to, t0, dtMs, monoTauMs));
  }

  /**
   * Fits starting from the time constants {@code tau1Ms}, {@code tau2Ms} (the other transient of
   * the same pulse: the off-transient decays with the on-transient's time constants), their
   * amplitudes solved in closed form, instead of from the grid.
   */
  static Result fit(
      double[] y,
      int from,
      int to,
      int ref,
      double dtMs,
      int maxIterations,
      double tau1Ms,
      double tau2Ms) {
    double t0 = (from - ref) * dtMs;
    double[] lin = new double[3];
    double[] start = null;
    if (linear(y, from, to, t0, dtMs, tau1Ms, tau2Ms, lin) < Double.POSITIVE_INFINITY) {
      start = new double[] {lin[0], lin[1], tau1Ms, lin[2], tau2Ms};
    }
    return fitFrom(y, from, to, ref, dtMs, maxIterations, start);
  }

  private static Result fitFrom(
      double[] y, int from, int to, int ref, double dtMs, int maxIterations, double[] best) {
    Result r = new Result();
    int n = to - from + 1;
    r.samples = n;
    if (best == null) {
      r.failure = "two-exponential start not found";
      return r;
    }
    double floorMs = 1e-3 * dtMs;
    int head = (int) Math.min(n, Math.ceil(POOL_AFTER_SLOW_TAUS * best[T2] / dtMs));
    ExponentialLeastSquares lsq =
        new ExponentialLeastSquares(y, from, to, ref, dtMs, 2, floorMs, n - head);
    ExponentialLeastSquares.Status status = lsq.solve(best, maxIterations);
    if (status == ExponentialLeastSquares.Status.NOT_CONVERGED) {
      r.failure = "two-exponential fit did not converge";
      return r;
    }
    if (status == ExponentialLeastSquares.Status.SINGULAR) {
      r.failure = "two-exponential covariance is singular";
      return r;
    }
    double[] p = lsq.x;
    // Keep τ₁ the fast one.
    boolean swapped = p[T1] > p[T2];
    int[] map = swapped ? new int[] {ISS, A2, T2, A1, T1} : new int[] {ISS, A1, T1, A2, T2};
    r.rssPa2 = lsq.rss;
    double s2 = n > P ? r.rssPa2 / (n - P) : Double.NaN;
    for (int i = 0; i < P; i++) {
      r.p[i] = p[map[i]];
      for (int j = 0; j < P; j++) {
        r.covariance[i][j] = lsq.inverseNormal[map[i]][map[j]] * s2;
      }
    }
    if (!(r.p[T1] > floorMs) || !Double.isFinite(r.p[A1]) || !Double.isFinite(r.p[A2])) {
      r.failure = "two-exponential fit gave a non-positive time constant";
    }
    return r;
  }

  /**
   * The grid pair (τ₁, τ₂) = (f·τ, s·τ) with the least residual and its linear offset and
   * amplitudes, as (I_ss, A₁, τ₁, A₂, τ₂); null when every pair's normal equations are singular.
   * One pass over the rows serves every pair: each grid τ's sums are shared by the pairs that use
   * it, only Σe₁e₂ is per pair.
   */
  static double[] gridStart(double[] y, int from, int to, double t0, double dt, double monoTauMs) {
    int nf = FAST_GRID.length;
    int ns = SLOW_GRID.length;
    int m = nf + ns;
    double[] q = new double[m];
    double[] e = new double[m];
    double[] se = new double[m];
    double[] see = new double[m];
    double[] sey = new double[m];
    double[] cross = new double[nf * ns];
    for (int k = 0; k < m; k++) {
      double tau = (k < nf ? FAST_GRID[k] : SLOW_GRID[k - nf]) * monoTauMs;
      q[k] = Math.exp(-dt / tau);
      e[k] = Math.exp(-t0 / tau);
    }
    double sy = 0;
    double syy = 0;
    for (int i = from; i <= to; i++) {
      double v = y[i];
      sy += v;
      syy += v * v;
      for (int f = 0; f < nf; f++) {
        double ef = e[f];
        int row = f * ns;
        for (int g = 0; g < ns; g++) {
          cross[row + g] += ef * e[nf + g];
        }
      }
      for (int k = 0; k < m; k++) {
        double ek = e[k];
        se[k] += ek;
        see[k] += ek * ek;
        sey[k] += ek * v;
        e[k] = ek * q[k];
      }
    }
    int n = to - from + 1;
    double[] lin = new double[3];
    double[] best = null;
    double bestRss = Double.POSITIVE_INFINITY;
    for (int f = 0; f < nf; f++) {
      for (int g = 0; g < ns; g++) {
        int b = nf + g;
        double rss =
            solve3(
                n, se[f], se[b], see[f], see[b], cross[f * ns + g], sy, sey[f], sey[b], syy, lin);
        if (rss < bestRss) {
          bestRss = rss;
          best =
              new double[] {
                lin[0], lin[1], FAST_GRID[f] * monoTauMs, lin[2], SLOW_GRID[g] * monoTauMs
              };
        }
      }
    }
    return best;
  }

  /**
   * Least-squares offset and amplitudes for fixed time constants into {@code out} (I_ss, A₁, A₂);
   * returns the residual sum of squares, or +∞ when the normal equations are singular.
   */
  static double linear(
      double[] y, int from, int to, double t0, double dt, double t1, double t2, double[] out) {
    int n = to - from + 1;
    double s1 = 0, s2 = 0, s11 = 0, s22 = 0, s12 = 0, sy = 0, sy1 = 0, sy2 = 0, syy = 0;
    // Rows are evenly spaced: e^(−t/τ) by recurrence, one exp per series.
    double q1 = Math.exp(-dt / t1);
    double q2 = Math.exp(-dt / t2);
    double e1 = Math.exp(-t0 / t1);
    double e2 = Math.exp(-t0 / t2);
    for (int i = from; i <= to; i++, e1 *= q1, e2 *= q2) {
      double v = y[i];
      s1 += e1;
      s2 += e2;
      s11 += e1 * e1;
      s22 += e2 * e2;
      s12 += e1 * e2;
      sy += v;
      sy1 += v * e1;
      sy2 += v * e2;
      syy += v * v;
    }
    return solve3(n, s1, s2, s11, s22, s12, sy, sy1, sy2, syy, out);
  }

  /**
   * Cramer's rule on the symmetric 3×3 normal equations [[n, s1, s2], [s1, s11, s12], [s2, s12,
   * s22]]·β = [sy, sy1, sy2] into {@code out}; returns RSS = yᵀy − βᵀXᵀy, or +∞ when singular.
   */
  private static double solve3(
      double n,
      double s1,
      double s2,
      double s11,
      double s22,
      double s12,
      double sy,
      double sy1,
      double sy2,
      double syy,
      double[] out) {
    double c00 = s11 * s22 - s12 * s12;
    double c01 = s1 * s22 - s12 * s2;
    double c02 = s1 * s12 - s11 * s2;
    double det = n * c00 - s1 * c01 + s2 * c02;
    if (!(Math.abs(det) > 0) || !Double.isFinite(det)) {
      return Double.POSITIVE_INFINITY;
    }
    out[0] = (sy * c00 - s1 * (sy1 * s22 - s12 * sy2) + s2 * (sy1 * s12 - s11 * sy2)) / det;
    out[1] = (n * (sy1 * s22 - s12 * sy2) - sy * c01 + s2 * (s1 * sy2 - sy1 * s2)) / det;
    out[2] = (n * (s11 * sy2 - sy1 * s12) - s1 * (s1 * sy2 - sy1 * s2) + sy * c02) / det;
    return syy - (out[0] * sy + out[1] * sy1 + out[2] * sy2);
  }
}
