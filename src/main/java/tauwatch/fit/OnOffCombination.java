package tauwatch.fit;

/**
 * Combines the on- and off-transient estimates of the same quantities by minimum-variance weights,
 * with the covariance of the combination.
 *
 * <p>Stateless; {@link #combine} writes into the caller's arrays. The two sides are not
 * independent: the off-transient is measured from the on-transient's steady current, so an error of
 * that current moves both. With X = Cov(x_on, x_off), a fixed-weight combination x = W·x_on + (I −
 * W)·x_off has covariance W·C_on·W + (I − W)·C_off·(I − W) + W·X·(I − W) + (I − W)·Xᵀ·W, and the
 * weight that minimises a component's variance is w = (v_off − x)/(v_on + v_off − 2x) (propagation
 * of a linear map; the best linear unbiased combination of two correlated estimates; any statistics
 * text).
 */
final class OnOffCombination {
  private OnOffCombination() {}

  /**
   * Fills {@code x} and {@code c}; returns the index of the first quantity on which the two sides
   * disagree by more than {@code tolerance} (relative) and more than {@code sigmas} combined
   * standard errors (of their difference), or −1. {@code cross} is Cov(x_on, x_off), [i][j] =
   * Cov(x_on,i, x_off,j); null when the sides are independent.
   */
  static int combine(
      double[] xOn,
      double[][] cOn,
      double[] xOff,
      double[][] cOff,
      double[][] cross,
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
      double xc = cross == null ? 0 : cross[i][i];
      // Var(x_on − x_off), kept positive against rounding of a near-perfect correlation.
      double vDiff = Math.max(vOn + vOff - 2 * xc, floor);
      wt[i] = Math.min(1, Math.max(0, (vOff - xc) / vDiff));
      x[i] = wt[i] * xOn[i] + (1 - wt[i]) * xOff[i];
      double diff = Math.abs(xOn[i] - xOff[i]);
      if (disagree < 0 && diff > tolerance * Math.abs(x[i]) && diff > sigmas * Math.sqrt(vDiff)) {
        disagree = i;
      }
    }
    for (int i = 0; i < k; i++) {
      for (int j = 0; j < k; j++) {
        double v = wt[i] * wt[j] * cOn[i][j] + (1 - wt[i]) * (1 - wt[j]) * cOff[i][j];
        if (cross != null) {
          v += wt[i] * (1 - wt[j]) * cross[i][j] + (1 - wt[i]) * wt[j] * cross[j][i];
        }
        c[i][j] = v;
      }
    }
    return disagree;
  }

  /**
   * Cov(x_on, x_off) when the only quantity the two sides share is the on-side's steady level: x_on
   * = f(u_on) with covariance {@code cuOn} of u_on, x_off depends on that level through column
   * {@code refIndex} of its Jacobian, so Cov(x_on,i, x_off,j) =
   * (J_on·C_on)[i][steady]·J_off[j][ref] (the delta method).
   */
  static double[][] cross(
      double[][] jacOn, double[][] cuOn, int steadyIndex, double[][] jacOff, int refIndex) {
    int m = jacOn.length;
    double[][] out = new double[m][m];
    for (int i = 0; i < m; i++) {
      double withSteady = 0;
      for (int b = 0; b < cuOn.length; b++) {
        withSteady += jacOn[i][b] * cuOn[b][steadyIndex];
      }
      for (int j = 0; j < m; j++) {
        out[i][j] = withSteady * jacOff[j][refIndex];
      }
    }
    return out;
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
