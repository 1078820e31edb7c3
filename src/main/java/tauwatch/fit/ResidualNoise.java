package tauwatch.fit;

/**
 * Pools the noise of a pulse's baseline and of its fits' residuals into one estimate of the noise's
 * standard deviation and variance inflation, far steadier than the short baseline's own.
 *
 * <p>Single-threaded accumulator, one per pulse; allocates its lag sums once. Why: the holding
 * current is the mean of a few milliseconds of filtered noise, and a standard error computed from
 * those same rows (about 120 at 50 kHz, some 40 independent ones behind a 10 kHz filter) scatters
 * by ±15 %, which puts heavy tails on the z-scores and lets a 95 % interval cover only ~91 %. The
 * residuals of the on- and off-transient fits carry the same noise over ten times as many rows.
 * Autocorrelations are summed within each segment (never across a seam) and truncated at the first
 * non-positive lag, as in {@link BaselineNoise}.
 */
final class ResidualNoise {
  private final double[] lagSums = new double[BaselineNoise.MAX_LAG + 1];
  private final long[] lagCounts = new long[BaselineNoise.MAX_LAG + 1];
  private int freeParameters;

  /**
   * Adds the residual y − model over rows {@code from..to}, model(t) = offset + Σ amps[k]·
   * e^(−t/taus[k]) with t = (row − ref)·dtMs, fitted with {@code parameters} free parameters.
   */
  void add(
      double[] y,
      int from,
      int to,
      int ref,
      double dtMs,
      double offset,
      double[] amps,
      double[] taus,
      int parameters) {
    int n = to - from + 1;
    if (n < 2) {
      return;
    }
    double[] r = new double[n];
    for (int i = 0; i < n; i++) {
      double t = (from + i - ref) * dtMs;
      double model = offset;
      for (int k = 0; k < amps.length; k++) {
        model += amps[k] * Math.exp(-t / taus[k]);
      }
      r[i] = y[from + i] - model;
    }
    int maxLag = Math.min(BaselineNoise.MAX_LAG, n - 1);
    for (int k = 0; k <= maxLag; k++) {
      double c = 0;
      for (int i = k; i < n; i++) {
        c += r[i] * r[i - k];
      }
      lagSums[k] += c;
      lagCounts[k] += n - k;
    }
    freeParameters += parameters;
  }

  /** Standard deviation of the pooled residual, with one degree of freedom per fitted parameter. */
  double sd() {
    double dof = lagCounts[0] - freeParameters;
    return dof > 0 ? Math.sqrt(lagSums[0] / dof) : Double.NaN;
  }

  /** 1 + 2·Σρ_k of the pooled residual, truncated at the first non-positive lag; at least 1. */
  double varianceInflation() {
    if (!(lagSums[0] > 0)) {
      return 1;
    }
    double c0 = lagSums[0] / lagCounts[0];
    double inflation = 1;
    for (int k = 1; k < lagSums.length && lagCounts[k] > 0; k++) {
      double rho = lagSums[k] / lagCounts[k] / c0;
      if (rho <= 0) {
        break;
      }
      inflation += 2 * rho;
    }
    return inflation;
  }
}
