package tauwatch.sim;

/**
 * Computes the exponential of a small dense square matrix by scaling and squaring with a [6/6] Padé
 * approximant.
 *
 * <p>Single-threaded: an instance owns its workspace and must not be shared. Allocates only in the
 * constructor; {@link #compute} allocates nothing. Matrices are row-major {@code double[n * n]}.
 *
 * <p>The matrix is scaled by 2^-s so that its 1-norm is at most 1/2, where the [6/6] Padé
 * approximant's relative truncation error is below 4e-16 (Higham, "The scaling and squaring method
 * for the matrix exponential revisited", SIAM J. Matrix Anal. Appl. 26:1179, 2005, eq. 2.3 bound —
 * from memory), then squared s times.
 */
public final class MatrixExponential {
  private static final int PADE_DEGREE = 6;
  private static final double[] PADE = padeCoefficients(PADE_DEGREE);
  private static final double MAX_SCALED_NORM = 0.5;

  private final int n;
  private final double[] scaled;
  private final double[] a2;
  private final double[] a4;
  private final double[] a6;
  private final double[] u;
  private final double[] v;
  private final double[] tmp;
  private final double[] lu;
  private final int[] pivot;

  public MatrixExponential(int n) {
    if (n < 1) {
      throw new IllegalArgumentException("matrix size must be >= 1, got " + n);
    }
    this.n = n;
    int nn = n * n;
    scaled = new double[nn];
    a2 = new double[nn];
    a4 = new double[nn];
    a6 = new double[nn];
    u = new double[nn];
    v = new double[nn];
    tmp = new double[nn];
    lu = new double[nn];
    pivot = new int[n];
  }

  public int size() {
    return n;
  }

  /** Writes exp(a) into {@code out}; {@code a} is left unchanged and may not alias {@code out}. */
  public void compute(double[] a, double[] out) {
    int nn = n * n;
    double norm = oneNorm(a);
    int squarings = 0;
    if (norm > MAX_SCALED_NORM) {
      squarings = Math.max(0, (int) Math.ceil(Math.log(norm / MAX_SCALED_NORM) / Math.log(2.0)));
    }
    double scale = Math.scalb(1.0, -squarings);
    for (int i = 0; i < nn; i++) {
      scaled[i] = a[i] * scale;
    }
    multiply(scaled, scaled, a2);
    multiply(a2, a2, a4);
    multiply(a4, a2, a6);
    // Odd part U = A (c1 I + c3 A^2 + c5 A^4), even part V = c0 I + c2 A^2 + c4 A^4 + c6 A^6.
    for (int i = 0; i < nn; i++) {
      tmp[i] = PADE[3] * a2[i] + PADE[5] * a4[i];
      v[i] = PADE[2] * a2[i] + PADE[4] * a4[i] + PADE[6] * a6[i];
    }
    for (int i = 0; i < n; i++) {
      tmp[i * n + i] += PADE[1];
      v[i * n + i] += PADE[0];
    }
    multiply(scaled, tmp, u);
    // exp(A) ≈ (V - U)^-1 (V + U).
    for (int i = 0; i < nn; i++) {
      lu[i] = v[i] - u[i];
      out[i] = v[i] + u[i];
    }
    factor();
    solveInPlace(out);
    for (int k = 0; k < squarings; k++) {
      multiply(out, out, tmp);
      System.arraycopy(tmp, 0, out, 0, nn);
    }
  }

  private double oneNorm(double[] a) {
    double max = 0;
    for (int c = 0; c < n; c++) {
      double sum = 0;
      for (int r = 0; r < n; r++) {
        sum += Math.abs(a[r * n + c]);
      }
      max = Math.max(max, sum);
    }
    return max;
  }

  private void multiply(double[] x, double[] y, double[] out) {
    for (int r = 0; r < n; r++) {
      for (int c = 0; c < n; c++) {
        double s = 0;
        for (int k = 0; k < n; k++) {
          s += x[r * n + k] * y[k * n + c];
        }
        out[r * n + c] = s;
      }
    }
  }

  /** LU decomposition with partial pivoting of {@code lu}, in place. */
  private void factor() {
    for (int i = 0; i < n; i++) {
      pivot[i] = i;
    }
    for (int k = 0; k < n; k++) {
      int p = k;
      double best = Math.abs(lu[k * n + k]);
      for (int r = k + 1; r < n; r++) {
        double m = Math.abs(lu[r * n + k]);
        if (m > best) {
          best = m;
          p = r;
        }
      }
      if (p != k) {
        swapRows(lu, p, k);
        int t = pivot[p];
        pivot[p] = pivot[k];
        pivot[k] = t;
      }
      double d = lu[k * n + k];
      for (int r = k + 1; r < n; r++) {
        double f = lu[r * n + k] / d;
        lu[r * n + k] = f;
        for (int c = k + 1; c < n; c++) {
          lu[r * n + c] -= f * lu[k * n + c];
        }
      }
    }
  }

  /** Solves (LU) X = P B for all columns of {@code b}, overwriting {@code b} with X. */
  private void solveInPlace(double[] b) {
    // Apply the row permutation through tmp.
    for (int r = 0; r < n; r++) {
      System.arraycopy(b, pivot[r] * n, tmp, r * n, n);
    }
    for (int c = 0; c < n; c++) {
      for (int r = 0; r < n; r++) {
        double s = tmp[r * n + c];
        for (int k = 0; k < r; k++) {
          s -= lu[r * n + k] * tmp[k * n + c];
        }
        tmp[r * n + c] = s;
      }
      for (int r = n - 1; r >= 0; r--) {
        double s = tmp[r * n + c];
        for (int k = r + 1; k < n; k++) {
          s -= lu[r * n + k] * tmp[k * n + c];
        }
        tmp[r * n + c] = s / lu[r * n + r];
      }
    }
    System.arraycopy(tmp, 0, b, 0, n * n);
  }

  private void swapRows(double[] m, int r1, int r2) {
    for (int c = 0; c < n; c++) {
      double t = m[r1 * n + c];
      m[r1 * n + c] = m[r2 * n + c];
      m[r2 * n + c] = t;
    }
  }

  /** c_k of the [q/q] Padé approximant of e^x: c_k = (2q-k)! q! / ((2q)! k! (q-k)!). */
  private static double[] padeCoefficients(int q) {
    double[] c = new double[q + 1];
    c[0] = 1;
    for (int k = 1; k <= q; k++) {
      c[k] = c[k - 1] * (q - k + 1) / (k * (2.0 * q - k + 1));
    }
    return c;
  }
}
