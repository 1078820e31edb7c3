package tauwatch.fit;

/**
 * Combines the on- and off-transient estimates of the same quantities by inverse-variance weights,
 * with the covariance of the combination.
 *
 * <p>Stateless; {@link #combine} writes into the caller's arrays. A fixed-weight combination x =
 * W·x_on + (I − W)·x_off of two independent estimates has covariance W·C_on·W + (I − W)·C_off·(I −
 * W) (propagation of a linear map; any statistics text).
 */
final class OnOffCombination {
  private OnOffCombination() {}

  /**
   * Fills {@code x} and {@code c}; returns the index of the first quantity on which the two sides
   * disagree by more than {@code tolerance} (relative) and more than {@code sigmas} combined
   * standard errors, or −1.
   */
  static int combine(
      double[] xOn,
      double[][] cOn,
      double[] xOff,
      double[][] cOff,
      double tolerance,
      double sigmas,
      double[] x,
      double[][] c) {
    int k = x.length;
    double[] wt = new double[k];
    int disagree = -1;
    for (int i = 0; i < k; i++) {
      double floor = 1e-18 * xOn[i] * xOn[i];
      double vOn = Math.max(cOn[i][i], floor);
      double vOff = Math.max(cOff[i][i], floor);
      wt[i] = vOff / (vOn + vOff);
      x[i] = wt[i] * xOn[i] + (1 - wt[i]) * xOff[i];
      double diff = Math.abs(xOn[i] - xOff[i]);
      if (disagree < 0
          && diff > tolerance * Math.abs(x[i])
          && diff > sigmas * Math.sqrt(vOn + vOff)) {
        disagree = i;
      }
    }
    for (int i = 0; i < k; i++) {
      for (int j = 0; j < k; j++) {
        c[i][j] = wt[i] * wt[j] * cOn[i][j] + (1 - wt[i]) * (1 - wt[j]) * cOff[i][j];
      }
    }
    return disagree;
  }

  /** gᵀ·C·g: the variance of a linear function with gradient g (the delta method). */
  static double quad(double[] g, double[][] c) {
    double v = 0;
    for (int i = 0; i < g.length; i++) {
      for (int j = 0; j < g.length; j++) {
        v += g[i] * c[i][j] * g[j];
      }
    }
    return v;
  }

  /** J·C·Jᵀ. */
  static double[][] propagate(double[][] jac, double[][] c) {
    int m = jac.length;
    int n = c.length;
    double[][] out = new double[m][m];
    for (int i = 0; i < m; i++) {
      for (int j = 0; j < m; j++) {
        double v = 0;
        for (int a = 0; a < n; a++) {
          double ja = jac[i][a];
          if (ja == 0) {
            continue;
          }
          for (int b = 0; b < n; b++) {
            v += ja * c[a][b] * jac[j][b];
          }
        }
        out[i][j] = v;
      }
    }
    return out;
  }
}
