package tauwatch.fit;

/**
 * The largest excursion of a fit's residual, averaged over a short running window, in standard
 * deviations of such an average under the baseline's noise: the test that finds a synaptic event, a
 * spike, a hum burst or a step artefact riding on a transient.
 *
 * <p>Stateless; each call allocates two small cursors ({@link ExponentialCurve}). Why an average
 * and not single samples: a synaptic current of 10 pA lasting milliseconds hides in 2 pA rms noise
 * sample by sample, but its 0.5 ms average stands many standard deviations out; white noise
 * averages down as 1/√m, correlated (filtered) noise only as √(inflation/m) (see {@link
 * BaselineNoise}). A threshold of 6 leaves a false alarm rate per pulse far below 10⁻⁴ for the few
 * hundred independent windows of a pulse (Gaussian tail P(|z| > 6) ≈ 2·10⁻⁹ per window; from
 * memory).
 */
final class ResidualExcursion {
  private ResidualExcursion() {}

  /** The standard deviation of a {@code window}-row average of the baseline's noise. */
  static double averageSd(BaselineNoise noise, int window) {
    return noise.sd() * Math.sqrt(Math.min(1.0, noise.varianceInflation() / window));
  }

  /**
   * The largest |running average| of the residual, in its unit, over rows {@code from..to} of y −
   * model, where model(t) = offset + Σ amps[k]· e^(−t/taus[k]) and t = (row − ref)·dtMs; {@code
   * amps} may be empty (a flat baseline).
   */
  static double worst(
      double[] y,
      int from,
      int to,
      int ref,
      double dtMs,
      double offset,
      double[] amps,
      double[] taus,
      int window) {
    int n = to - from + 1;
    if (n < 1) {
      return 0;
    }
    int m = Math.max(1, Math.min(window, n));
    double t0 = (from - ref) * dtMs;
    ExponentialCurve lead = new ExponentialCurve(offset, amps, taus, t0, dtMs);
    ExponentialCurve trail = new ExponentialCurve(offset, amps, taus, t0, dtMs);
    double run = 0;
    double worst = 0;
    for (int i = from; i <= to; i++) {
      run += y[i] - lead.value();
      lead.advance();
      if (i - from >= m) {
        run -= y[i - m] - trail.value();
        trail.advance();
      }
      if (i - from >= m - 1) {
        worst = Math.max(worst, Math.abs(run / m));
      }
    }
    return worst;
  }

  /**
   * How far the residual's largest running average exceeds {@code floor} (an allowance in the
   * response unit for model error on noise-free traces), in standard deviations of that average
   * under the baseline's noise; 0 when within the allowance.
   */
  static double sigmas(
      double[] y,
      int from,
      int to,
      int ref,
      double dtMs,
      double offset,
      double[] amps,
      double[] taus,
      BaselineNoise noise,
      int window,
      double floor) {
    double excess = worst(y, from, to, ref, dtMs, offset, amps, taus, window) - floor;
    if (!(excess > 0)) {
      return 0;
    }
    double sd = averageSd(noise, Math.max(1, Math.min(window, to - from + 1)));
    return sd > 0 ? excess / sd : Double.POSITIVE_INFINITY;
  }
}
