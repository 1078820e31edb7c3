package tauwatch.fit;

/**
 * Pools the noise of a pulse's baseline and of its fits' residuals into one estimate of the noise's
 * standard deviation and variance inflation, far steadier than the short baseline's own.
 *
 * <p>Single-threaded accumulator, one per pulse; keeps the residuals (a few thousand doubles) and
 * sums their autocorrelations only when asked, lag by lag, up to the first non-positive one: on
 * filtered noise that is a handful of lags instead of all {@link BaselineNoise#MAX_LAG}. Why pool:
 * the holding current is the mean of a few milliseconds of filtered noise, and a standard error
 * computed from those same rows (about 120 at 50 kHz, some 40 independent ones behind a 10 kHz
 * filter) scatters by ±15 %, which puts heavy tails on the z-scores and lets a 95 % interval cover
 * only ~91 %. The residuals of the on- and off-transient fits carry the same noise over ten times
 * as many rows. Autocorrelations are summed within each segment (never across a seam) and truncated
 * at the first non-positive lag, as in {@link BaselineNoise}.
 */
final class ResidualNoise {
  private double[] residuals = new double[4096];
  private int length;
  private int[] segmentStarts = new int[4];
  private int segments;
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
    if (length + n > residuals.length) {
      residuals = java.util.Arrays.copyOf(residuals, Math.max(2 * residuals.length, length + n));
    }
    if (segments == segmentStarts.length) {
      segmentStarts = java.util.Arrays.copyOf(segmentStarts, 2 * segments);
    }
    segmentStarts[segments++] = length;
    ExponentialCurve model = new ExponentialCurve(offset, amps, taus, (from - ref) * dtMs, dtMs);
    for (int i = from; i <= to; i++) {
      residuals[length++] = y[i] - model.value();
      model.advance();
    }
    freeParameters += parameters;
  }

  /** Standard deviation of the pooled residual, with one degree of freedom per fitted parameter. */
  double sd() {
    double dof = length - freeParameters;
    return dof > 0 ? Math.sqrt(lagSum(0) / dof) : Double.NaN;
  }

  /** 1 + 2·Σρ_k of the pooled residual, truncated at the first non-positive lag; at least 1. */
  double varianceInflation() {
    double c0sum = lagSum(0);
    if (!(c0sum > 0)) {
      return 1;
    }
    double c0 = c0sum / length;
    double inflation = 1;
    for (int k = 1; k <= BaselineNoise.MAX_LAG; k++) {
      long count = lagCount(k);
      if (count == 0) {
        break;
      }
      double rho = lagSum(k) / count / c0;
      if (rho <= 0) {
        break;
      }
      inflation += 2 * rho;
    }
    return inflation;
  }

  /** Σ r_i·r_(i−k) within each segment. */
  private double lagSum(int k) {
    double sum = 0;
    for (int s = 0; s < segments; s++) {
      int end = segmentEnd(s);
      for (int i = segmentStarts[s] + k; i < end; i++) {
        sum += residuals[i] * residuals[i - k];
      }
    }
    return sum;
  }

  /** Pairs at lag k within the segments. */
  private long lagCount(int k) {
    long count = 0;
    for (int s = 0; s < segments; s++) {
      count += Math.max(0, segmentEnd(s) - segmentStarts[s] - k);
    }
    return count;
  }

  /** One past the last residual of segment {@code s}. */
  private int segmentEnd(int s) {
    return s + 1 < segments ? segmentStarts[s + 1] : length;
  }
}
