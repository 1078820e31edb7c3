package tauwatch.fit;

/**
 * Fits one transient with the mono-exponential I(t) = I_ss + A·e^(−t/τ) by Levenberg–Marquardt
 * ({@link ExponentialLeastSquares}), started from a closed-form guess.
 *
 * <p>Stateless and thread-safe; each call allocates a small result and the solver's scratch (a
 * per-pulse cost, off the sample path). Times are in ms from a reference row (the step's onset),
 * currents in pA.
 */
final class TransientFit {
  private static final int P = 3;

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
     * Rms residual over the rows within {@link #TRANSIENT_TAUS} time constants of the fit's start,
     * where the transient is: a misfit there is not diluted by a long steady state.
     */
    double transientRmsPa;

    int samples;
    int iterations;

    double rmsPa() {
      return Math.sqrt(rssPa2 / samples);
    }
  }

  /** See {@link Result#transientRmsPa}. */
  static final double TRANSIENT_TAUS = 10;

  /**
   * Fits rows {@code from..to} (inclusive) of {@code y}; row {@code ref} is time 0 and rows are
   * {@code dtMs} apart.
   */
  static Result fit(double[] y, int from, int to, int ref, double dtMs, int maxIterations) {
    Result r = new Result();
    int n = to - from + 1;
    r.samples = n;
    double t0 = (from - ref) * dtMs;
    double tau0 = integralGuessTauMs(y, from, to, dtMs);
    if (!(tau0 > 0) || !Double.isFinite(tau0)) {
      // No decay visible to the closed form: start from a tenth of the span and let LM decide.
      tau0 = 0.1 * (n - 1) * dtMs;
    }
    double[] start = linearAmplitudes(y, from, to, t0, dtMs, tau0);
    double tauFloorMs = 1e-3 * dtMs;
    ExponentialLeastSquares lsq =
        new ExponentialLeastSquares(y, from, to, ref, dtMs, 1, tauFloorMs);
    ExponentialLeastSquares.Status status = lsq.solve(start, maxIterations);
    if (status == ExponentialLeastSquares.Status.NOT_CONVERGED) {
      // Too many iterations, or no progress possible: a bad pulse, not a bug.
      r.failure = "fit did not converge";
      return r;
    }
    double[] p = lsq.x;
    r.steadyPa = p[0];
    r.amplitudePa = p[1];
    r.tauMs = p[2];
    r.iterations = lsq.iterations;
    r.rssPa2 = lsq.rss;
    r.transientRmsPa = transientRms(y, from, to, t0, dtMs, p, tau0);
    if (status == ExponentialLeastSquares.Status.SINGULAR) {
      r.failure = "fit covariance is singular";
      return r;
    }
    // (JᵀJ)⁻¹ scaled by s² = RSS/(n − p).
    double s2 = n > P ? r.rssPa2 / (n - P) : Double.NaN;
    for (int i = 0; i < P; i++) {
      for (int j = 0; j < P; j++) {
        r.covariance[i][j] = lsq.inverseNormal[i][j] * s2;
      }
    }
    if (!(r.tauMs > tauFloorMs) || !Double.isFinite(r.amplitudePa)) {
      r.failure = "fit gave a non-positive time constant";
    }
    return r;
  }

  /**
   * Rms of the fit's residual over the first {@link #TRANSIENT_TAUS}·τ₀ of the rows (at least 2·p).
   */
  private static double transientRms(
      double[] y, int from, int to, double t0, double dtMs, double[] p, double tau0) {
    int n = to - from + 1;
    int head = (int) Math.min(n, Math.max(2 * P, Math.ceil(TRANSIENT_TAUS * tau0 / dtMs)));
    ExponentialCurve model =
        new ExponentialCurve(p[0], new double[] {p[1]}, new double[] {p[2]}, t0, dtMs);
    double sum = 0;
    for (int k = 0; k < head; k++, model.advance()) {
      double d = y[from + k] - model.value();
      sum += d * d;
    }
    return Math.sqrt(sum / head);
  }

  /**
   * Closed-form τ from the integral form of the ODE: y' = −(y − I_ss)/τ integrates to y(t) = y(t₀)
   * − S(t)/τ + (I_ss/τ)(t − t₀) with S the running integral of y, which is linear in the unknowns
   * (a Prony-type successive-integration estimate; robust to noise because it integrates, not
   * differentiates). Rows {@code from..to} of y, {@code dt} apart; returns NaN when the regression
   * is degenerate.
   */
  static double integralGuessTauMs(double[] y, int from, int to, double dt) {
    double offset = y[to];
    // Normal equations of y ~ c0 + c1·S + c2·(t − t0), y centred on its last value for
    // conditioning.
    double s00 = 0, s01 = 0, s02 = 0, s11 = 0, s12 = 0, s22 = 0, b0 = 0, b1 = 0, b2 = 0;
    double running = 0;
    double prev = y[from] - offset;
    for (int i = from; i <= to; i++) {
      double yk = y[i] - offset;
      if (i > from) {
        running += 0.5 * (prev + yk) * dt;
      }
      prev = yk;
      double u = (i - from) * dt;
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

  /**
   * Best I_ss and A for a fixed τ over rows {@code from..to} (the model is linear in them: variable
   * projection): {I_ss, A, τ}.
   */
  static double[] linearAmplitudes(
      double[] y, int from, int to, double t0, double dt, double tauMs) {
    double n = to - from + 1;
    double se = 0, see = 0, sy = 0, sey = 0;
    double q = Math.exp(-dt / tauMs);
    double e = Math.exp(-t0 / tauMs);
    for (int i = from; i <= to; i++, e *= q) {
      se += e;
      see += e * e;
      sy += y[i];
      sey += e * y[i];
    }
    double det = n * see - se * se;
    double amp = det != 0 ? (n * sey - se * sy) / det : 0;
    double iss = (sy - amp * se) / n;
    return new double[] {iss, amp, tauMs};
  }
}
