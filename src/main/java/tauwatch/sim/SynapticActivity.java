package tauwatch.sim;

/**
 * Spontaneous synaptic currents at the soma: onsets at random (a Poisson process), each a
 * difference of exponentials with a fast rise and a slower decay, scaled to a peak amplitude.
 *
 * <p>Immutable and validated on construction. The current enters the soma node (positive = inward,
 * depolarising), so in voltage clamp it is recorded through the access resistance as an inward
 * (negative) current and in current clamp as a depolarisation. Within a sample the current is held
 * at its value at the sample's start (the same zero-order hold as the command).
 *
 * @param rateHz mean events per second (0 = none)
 * @param amplitudePa mean peak amplitude, pA
 * @param amplitudeSpread each event's peak is drawn uniformly within ±spread·amplitude
 * @param riseMs rise time constant, ms
 * @param decayMs decay time constant, ms (greater than the rise)
 */
public record SynapticActivity(
    double rateHz, double amplitudePa, double amplitudeSpread, double riseMs, double decayMs) {

  /** No synaptic events. */
  public static final SynapticActivity NONE = new SynapticActivity(0, 0, 0, 0.2, 3);

  public SynapticActivity {
    if (!(rateHz >= 0) || Double.isInfinite(rateHz)) {
      throw new IllegalArgumentException("synaptic rate (Hz) must be >= 0, got " + rateHz);
    }
    if (!Double.isFinite(amplitudePa)) {
      throw new IllegalArgumentException("synaptic amplitude (pA) must be finite");
    }
    if (!(amplitudeSpread >= 0 && amplitudeSpread <= 1)) {
      throw new IllegalArgumentException(
          "synaptic amplitude spread must be in [0, 1], got " + amplitudeSpread);
    }
    if (!(riseMs > 0) || !(decayMs > riseMs) || Double.isInfinite(decayMs)) {
      throw new IllegalArgumentException(
          "synaptic time constants need 0 < rise_ms < decay_ms, got " + riseMs + ", " + decayMs);
    }
  }

  public boolean active() {
    return rateHz > 0 && amplitudePa != 0;
  }

  /**
   * 1 / the peak of e^(−t/τd) − e^(−t/τr), reached at t = τd·τr/(τd − τr)·ln(τd/τr) (calculus on
   * the difference of exponentials).
   */
  public double peakNormalisation() {
    double tPeak = decayMs * riseMs / (decayMs - riseMs) * Math.log(decayMs / riseMs);
    return 1 / (Math.exp(-tPeak / decayMs) - Math.exp(-tPeak / riseMs));
  }
}
