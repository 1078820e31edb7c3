package tauwatch.fit;

/**
 * Levenberg–Marquardt least squares of I(t) = I_ss + Σ_j A_j·e^(−t/τ_j) (one or two exponentials)
 * over evenly spaced rows, on the normal equations: the fits of a pulse's transients, at a few
 * microseconds per iteration.
 *
 * <p>Why not a general-purpose optimizer: with p ≤ 5 parameters and evenly spaced rows one pass
 * over the rows gives the cost, JᵀJ and Jᵀr at once, with e^(−t/τ) by the recurrence e_(k+1) =
 * e_k·e^(−Δt/τ) (one exp per component per pass, not per row), and the p×p system is solved in
 * place. A general optimizer builds an n×p Jacobian and QR-decomposes it every iteration, which
 * cost most of a pulse's analysis time. The algorithm is Marquardt's (1963) with his diagonal
 * scaling and Nielsen's damping update (Madsen, Nielsen &amp; Tingleff, Methods for Non-Linear
 * Least Squares Problems, 2004; from memory); {@code ExponentialLeastSquaresTest} checks its optima
 * and covariances against Commons Math's Levenberg–Marquardt optimizer.
 *
 * <p>Parameters are laid out (I_ss, A₁, τ₁[, A₂, τ₂]); times are (row − ref)·Δt. Not thread-safe:
 * the instance holds its scratch; one per fit is cheap (a few small arrays).
 */
final class ExponentialLeastSquares {
  /** Relative change in cost or in every parameter below which a step counts as converged. */
  static final double TOLERANCE = 1e-9;

  /** A Cholesky pivot of the Jacobi-scaled JᵀJ below this counts as singular. */
  static final double SINGULAR_PIVOT = 1e-14;

  enum Status {
    CONVERGED,
    NOT_CONVERGED,
    SINGULAR
  }

  private final int exponentials;
  private final int p;
  private final double[] y;
  private final int from;
  private final int to;
  private final double t0;
  private final double dt;
  private final double tauFloor;

  /** The solution, its unscaled covariance (JᵀJ)⁻¹, the residual sum of squares. */
  final double[] x;

  final double[][] inverseNormal;
  double rss;
  int iterations;

  private final double[] normal;
  private final double[] gradient;
  private final double[] trialNormal;
  private final double[] trialGradient;
  private final double[] trial;
  private final double[] step;
  private final double[] system;
  private final double[] amps;
  private final double[] taus;
  private final double[] decay;
  private final double[] ratio;

  /** The last row fitted one by one; rows after it, up to {@code to}, are pooled. */
  private final int last;

  private final int pooled;
  private final double pooledMean;
  private final double pooledScatter;
  private final double poolWeight;
  private final double[] row;

  /**
   * Fits rows {@code from..to} (inclusive) of {@code y}, row {@code ref} at time 0, rows {@code dt}
   * apart, with {@code exponentials} (1 or 2) components; τ is kept above {@code tauFloor}.
   */
  ExponentialLeastSquares(
      double[] y, int from, int to, int ref, double dt, int exponentials, double tauFloor) {
    this(y, from, to, ref, dt, exponentials, tauFloor, 0);
  }

  /**
   * As above, with the last {@code pooledRows} rows pooled into one observation: their mean,
   * weighted by their count, against the model's exact mean over them. Where the transient has
   * decayed (e^(−t/τ) below ~10⁻⁴) the rows' scatter about their mean carries no information about
   * the parameters, so pooling changes the fit only in the noise's last digits while it saves the
   * Jacobian products of those rows (most of a long steady state). The reported {@link #rss}
   * includes the pooled rows' scatter.
   */
  ExponentialLeastSquares(
      double[] y,
      int from,
      int to,
      int ref,
      double dt,
      int exponentials,
      double tauFloor,
      int pooledRows) {
    if (exponentials < 1 || exponentials > 2) {
      throw new IllegalArgumentException("one or two exponentials, not " + exponentials);
    }
    this.exponentials = exponentials;
    this.p = 1 + 2 * exponentials;
    this.y = y;
    this.from = from;
    this.to = to;
    this.t0 = (from - ref) * dt;
    this.dt = dt;
    this.tauFloor = tauFloor;
    x = new double[p];
    inverseNormal = new double[p][p];
    normal = new double[p * p];
    gradient = new double[p];
    trialNormal = new double[p * p];
    trialGradient = new double[p];
    trial = new double[p];
    step = new double[p];
    system = new double[p * p];
    amps = new double[exponentials];
    taus = new double[exponentials];
    decay = new double[exponentials];
    ratio = new double[exponentials];
    row = new double[p];
    pooled = pooledRows >= 2 && to - from + 1 - pooledRows >= 2 * p ? pooledRows : 0;
    last = to - pooled;
    double mean = 0;
    double scatter = 0;
    if (pooled > 0) {
      for (int i = last + 1; i <= to; i++) {
        mean += y[i];
      }
      mean /= pooled;
      for (int i = last + 1; i <= to; i++) {
        double d = y[i] - mean;
        scatter += d * d;
      }
    }
    pooledMean = mean;
    pooledScatter = scatter;
    poolWeight = Math.sqrt(pooled);
  }

  /** Minimises the cost from {@code start}; the solution is in {@link #x}. */
  Status solve(double[] start, int maxIterations) {
    System.arraycopy(start, 0, x, 0, p);
    keepTausAboveFloor(x);
    rss = pass(x, normal, gradient);
    if (!Double.isFinite(rss)) {
      return Status.NOT_CONVERGED;
    }
    double lambda = 1e-3;
    double nu = 2;
    iterations = 0;
    boolean converged = false;
    while (iterations < maxIterations && !converged) {
      iterations++;
      if (!dampedStep(lambda)) {
        lambda *= nu;
        nu *= 2;
        continue;
      }
      for (int u = 0; u < p; u++) {
        trial[u] = x[u] + step[u];
      }
      keepTausAboveFloor(trial);
      double trialRss = pass(trial, trialNormal, trialGradient);
      double largestChange = 0;
      for (int u = 0; u < p; u++) {
        double scale = Math.abs(x[u]) + Math.abs(trial[u]);
        double change = Math.abs(trial[u] - x[u]);
        largestChange = Math.max(largestChange, scale > 0 ? 2 * change / scale : change);
      }
      if (trialRss < rss) {
        // Gain ratio: actual over predicted reduction of the linearised model, L(0) − L(h) =
        // hᵀ(λ·D·h + g) (Marquardt's damped step).
        double predicted = 0;
        for (int u = 0; u < p; u++) {
          predicted += step[u] * (lambda * normal[u * p + u] * step[u] + gradient[u]);
        }
        double reduction = rss - trialRss;
        double rho = predicted > 0 ? reduction / predicted : 1;
        converged = reduction <= TOLERANCE * rss || largestChange <= TOLERANCE;
        System.arraycopy(trial, 0, x, 0, p);
        System.arraycopy(trialNormal, 0, normal, 0, p * p);
        System.arraycopy(trialGradient, 0, gradient, 0, p);
        rss = trialRss;
        double f = 2 * rho - 1;
        lambda *= Math.max(1.0 / 3, 1 - f * f * f);
        nu = 2;
      } else {
        // A step that cannot lower the cost although it moves no parameter: at the minimum to
        // working precision.
        converged = largestChange <= TOLERANCE;
        lambda *= nu;
        nu *= 2;
      }
      if (!(lambda < 1e30)) {
        break;
      }
    }
    if (!converged) {
      return Status.NOT_CONVERGED;
    }
    return invertNormal() ? Status.CONVERGED : Status.SINGULAR;
  }

  /**
   * One pass over the rows at parameters {@code at}: JᵀJ (full p×p, row-major) into {@code jtj},
   * Jᵀr into {@code jtr}; returns Σr².
   */
  private double pass(double[] at, double[] jtj, double[] jtr) {
    java.util.Arrays.fill(jtj, 0);
    java.util.Arrays.fill(jtr, 0);
    double offset = at[0];
    for (int j = 0; j < exponentials; j++) {
      amps[j] = at[1 + 2 * j];
      taus[j] = at[2 + 2 * j];
      ratio[j] = Math.exp(-dt / taus[j]);
      decay[j] = Math.exp(-t0 / taus[j]);
    }
    double sum = 0;
    if (exponentials == 1) {
      // The common case unrolled: 3 parameters, 6 distinct products.
      double a = amps[0];
      double invTau2 = 1 / (taus[0] * taus[0]);
      double q = ratio[0];
      double e = decay[0];
      double s11 = 0, s12 = 0, s13 = 0, s22 = 0, s23 = 0, s33 = 0, g1 = 0, g2 = 0, g3 = 0;
      for (int i = from; i <= last; i++) {
        double t = t0 + (i - from) * dt;
        double dTau = a * e * t * invTau2;
        double r = y[i] - (offset + a * e);
        sum += r * r;
        s11 += 1;
        s12 += e;
        s13 += dTau;
        s22 += e * e;
        s23 += e * dTau;
        s33 += dTau * dTau;
        g1 += r;
        g2 += e * r;
        g3 += dTau * r;
        e *= q;
      }
      jtj[0] = s11;
      jtj[1] = jtj[3] = s12;
      jtj[2] = jtj[6] = s13;
      jtj[4] = s22;
      jtj[5] = jtj[7] = s23;
      jtj[8] = s33;
      jtr[0] = g1;
      jtr[1] = g2;
      jtr[2] = g3;
      decay[0] = e;
      return sum + pooledRow(offset, jtj, jtr);
    }
    // Two exponentials, unrolled: 5 parameters (I_ss, A₁, τ₁, A₂, τ₂), 15 distinct products.
    double a1 = amps[0];
    double a2 = amps[1];
    double k1 = a1 / (taus[0] * taus[0]);
    double k2 = a2 / (taus[1] * taus[1]);
    double q1 = ratio[0];
    double q2 = ratio[1];
    double e1 = decay[0];
    double e2 = decay[1];
    double s00 = 0, s01 = 0, s02 = 0, s03 = 0, s04 = 0;
    double s11 = 0, s12 = 0, s13 = 0, s14 = 0;
    double s22 = 0, s23 = 0, s24 = 0;
    double s33 = 0, s34 = 0;
    double s44 = 0;
    double g0 = 0, g1 = 0, g2 = 0, g3 = 0, g4 = 0;
    for (int i = from; i <= last; i++) {
      double t = t0 + (i - from) * dt;
      double d1 = k1 * e1 * t;
      double d2 = k2 * e2 * t;
      double r = y[i] - (offset + a1 * e1 + a2 * e2);
      sum += r * r;
      s00 += 1;
      s01 += e1;
      s02 += d1;
      s03 += e2;
      s04 += d2;
      s11 += e1 * e1;
      s12 += e1 * d1;
      s13 += e1 * e2;
      s14 += e1 * d2;
      s22 += d1 * d1;
      s23 += d1 * e2;
      s24 += d1 * d2;
      s33 += e2 * e2;
      s34 += e2 * d2;
      s44 += d2 * d2;
      g0 += r;
      g1 += e1 * r;
      g2 += d1 * r;
      g3 += e2 * r;
      g4 += d2 * r;
      e1 *= q1;
      e2 *= q2;
    }
    double[] upper = {s00, s01, s02, s03, s04, s11, s12, s13, s14, s22, s23, s24, s33, s34, s44};
    int k = 0;
    for (int u = 0; u < 5; u++) {
      for (int v = u; v < 5; v++, k++) {
        jtj[u * 5 + v] = upper[k];
        jtj[v * 5 + u] = upper[k];
      }
    }
    jtr[0] = g0;
    jtr[1] = g1;
    jtr[2] = g2;
    jtr[3] = g3;
    jtr[4] = g4;
    decay[0] = e1;
    decay[1] = e2;
    return sum + pooledRow(offset, jtj, jtr);
  }

  /**
   * Adds the pooled rows' one weighted observation to JᵀJ and Jᵀr; returns its squared residual
   * plus the pooled rows' scatter. {@link #decay} holds each e^(−t/τ) at the first pooled row; the
   * means over the pooled rows are summed by the same recurrence (a few operations per row instead
   * of the Jacobian's products).
   */
  private double pooledRow(double offset, double[] jtj, double[] jtr) {
    if (pooled == 0) {
      return 0;
    }
    double tStart = t0 + (last + 1 - from) * dt;
    double f = offset;
    row[0] = poolWeight;
    for (int j = 0; j < exponentials; j++) {
      double e = decay[j];
      double q = ratio[j];
      double t = tStart;
      double sumE = 0;
      double sumTe = 0;
      for (int k = 0; k < pooled; k++) {
        sumE += e;
        sumTe += t * e;
        e *= q;
        t += dt;
      }
      double meanE = sumE / pooled;
      double meanTe = sumTe / pooled;
      f += amps[j] * meanE;
      row[1 + 2 * j] = poolWeight * meanE;
      row[2 + 2 * j] = poolWeight * amps[j] * meanTe / (taus[j] * taus[j]);
    }
    double r = poolWeight * (pooledMean - f);
    for (int u = 0; u < p; u++) {
      jtr[u] += row[u] * r;
      for (int v = 0; v < p; v++) {
        jtj[u * p + v] += row[u] * row[v];
      }
    }
    return r * r + pooledScatter;
  }

  /** Solves (JᵀJ + λ·diag(JᵀJ))·step = Jᵀr by Cholesky; false when not positive definite. */
  private boolean dampedStep(double lambda) {
    System.arraycopy(normal, 0, system, 0, p * p);
    for (int u = 0; u < p; u++) {
      double d = normal[u * p + u];
      system[u * p + u] = d + lambda * (d > 0 ? d : 1e-300);
    }
    if (!cholesky(system, p, 0)) {
      return false;
    }
    System.arraycopy(gradient, 0, step, 0, p);
    choleskySolve(system, p, step);
    for (int u = 0; u < p; u++) {
      if (!Double.isFinite(step[u])) {
        return false;
      }
    }
    return true;
  }

  /**
   * (JᵀJ)⁻¹ at the solution into {@link #inverseNormal}, through the Jacobi-scaled matrix (unit
   * diagonal) so the singularity test does not depend on the parameters' units.
   */
  private boolean invertNormal() {
    double[] scale = new double[p];
    for (int u = 0; u < p; u++) {
      double d = normal[u * p + u];
      if (!(d > 0)) {
        return false;
      }
      scale[u] = 1 / Math.sqrt(d);
    }
    for (int u = 0; u < p; u++) {
      for (int v = 0; v < p; v++) {
        system[u * p + v] = normal[u * p + v] * scale[u] * scale[v];
      }
    }
    if (!cholesky(system, p, SINGULAR_PIVOT)) {
      return false;
    }
    double[] column = new double[p];
    for (int c = 0; c < p; c++) {
      java.util.Arrays.fill(column, 0);
      column[c] = 1;
      choleskySolve(system, p, column);
      for (int u = 0; u < p; u++) {
        inverseNormal[u][c] = column[u] * scale[u] * scale[c];
      }
    }
    return true;
  }

  /** In-place lower Cholesky factor of the row-major n×n {@code m}; false at a pivot ≤ floor. */
  private static boolean cholesky(double[] m, int n, double pivotFloor) {
    for (int j = 0; j < n; j++) {
      double d = m[j * n + j];
      for (int k = 0; k < j; k++) {
        d -= m[j * n + k] * m[j * n + k];
      }
      if (!(d > pivotFloor)) {
        return false;
      }
      double l = Math.sqrt(d);
      m[j * n + j] = l;
      for (int i = j + 1; i < n; i++) {
        double s = m[i * n + j];
        for (int k = 0; k < j; k++) {
          s -= m[i * n + k] * m[j * n + k];
        }
        m[i * n + j] = s / l;
      }
    }
    return true;
  }

  /** Solves L·Lᵀ·x = b in place, L the lower factor left by {@link #cholesky}. */
  private static void choleskySolve(double[] l, int n, double[] b) {
    for (int i = 0; i < n; i++) {
      double s = b[i];
      for (int k = 0; k < i; k++) {
        s -= l[i * n + k] * b[k];
      }
      b[i] = s / l[i * n + i];
    }
    for (int i = n - 1; i >= 0; i--) {
      double s = b[i];
      for (int k = i + 1; k < n; k++) {
        s -= l[k * n + i] * b[k];
      }
      b[i] = s / l[i * n + i];
    }
  }

  /** Keeps τ positive while the solver iterates (a step may overshoot through zero). */
  private void keepTausAboveFloor(double[] v) {
    for (int j = 0; j < exponentials; j++) {
      int k = 2 + 2 * j;
      if (!(v[k] > tauFloor)) {
        v[k] = Math.max(tauFloor, Math.abs(v[k]));
      }
    }
  }
}
