package tauwatch.fit;

/**
 * The level and noise of a pulse's baseline: mean, standard deviation, and how much the noise's
 * correlation (the amplifier filter makes neighbouring samples alike) inflates the variance of a
 * fitted quantity beyond the white-noise formula.
 *
 * <p>Immutable result of {@link #of}; computing it allocates only the result.
 *
 * <p>For a least-squares estimate whose Jacobian varies slowly over the noise's correlation time,
 * Var = (JᵀJ)⁻¹·σ²·(1 + 2·Σ_k ρ_k), the long-run variance of a stationary series over its variance
 * (Newey–West / the "effective sample size" of time-series analysis; from memory). The sum of the
 * sample autocorrelations ρ_k is truncated at the first non-positive lag, which keeps the estimate
 * from the noise of the far lags.
 *
 * @param mean mean of the baseline rows
 * @param sd sample standard deviation of the baseline rows
 * @param samples rows used
 * @param varianceInflation 1 + 2·Σρ_k, at least 1
 */
record BaselineNoise(double mean, double sd, int samples, double varianceInflation) {
  /** Largest lag summed; at 50 kHz behind a 2 kHz filter the correlation dies out within ~20. */
  static final int MAX_LAG = 40;

  /** Statistics of {@code y[from..to]} (inclusive). */
  static BaselineNoise of(double[] y, int from, int to) {
    int n = to - from + 1;
    double sum = 0;
    for (int i = from; i <= to; i++) {
      sum += y[i];
    }
    double mean = sum / n;
    double ss = 0;
    for (int i = from; i <= to; i++) {
      double d = y[i] - mean;
      ss += d * d;
    }
    double var = n > 1 ? ss / (n - 1) : Double.NaN;
    double inflation = 1;
    if (ss > 0) {
      int maxLag = Math.min(MAX_LAG, n / 4);
      for (int k = 1; k <= maxLag; k++) {
        double c = 0;
        for (int i = from + k; i <= to; i++) {
          c += (y[i] - mean) * (y[i - k] - mean);
        }
        double rho = c / ss;
        if (rho <= 0) {
          break;
        }
        inflation += 2 * rho;
      }
    }
    return new BaselineNoise(mean, Math.sqrt(var), n, inflation);
  }

  /**
   * The same statistics with the inflation raised to at least {@code modelInflation} (the known
   * output filter's, {@link BesselFilterModel#noiseVarianceInflation}): a short baseline's sample
   * autocorrelations are biased low (with the mean removed they sum to −½ over all lags).
   */
  BaselineNoise atLeast(double modelInflation) {
    return modelInflation > varianceInflation
        ? new BaselineNoise(mean, sd, samples, modelInflation)
        : this;
  }

  /** Standard error of the mean, allowing for the correlation. */
  double meanStandardError() {
    return sd * Math.sqrt(varianceInflation / samples);
  }
}
