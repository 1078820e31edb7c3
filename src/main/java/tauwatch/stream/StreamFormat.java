package tauwatch.stream;

/**
 * What every sample of a stream means: its rate, clamp mode and the amplifier filter in front of
 * it.
 *
 * <p>Immutable; fixed for the life of a stream.
 *
 * @param sampleRateHz samples per second per channel
 * @param mode the clamp mode, which fixes the channel units
 * @param filterCutoffHz the −3 dB cutoff of the amplifier's 4-pole Bessel output filter, or 0 when
 *     the response is unfiltered or the filter is unknown
 * @param startTimeS stream time of sample 0 in seconds (0 for live sources; a file's first {@code
 *     t_s})
 * @param description a short human-readable name of the source, for logs
 */
public record StreamFormat(
    double sampleRateHz,
    ClampMode mode,
    double filterCutoffHz,
    double startTimeS,
    String description) {

  public StreamFormat {
    if (!(sampleRateHz > 0) || Double.isInfinite(sampleRateHz)) {
      throw new IllegalArgumentException("sample rate must be positive, got " + sampleRateHz);
    }
    if (!(filterCutoffHz >= 0)) {
      throw new IllegalArgumentException("filter cutoff must be >= 0, got " + filterCutoffHz);
    }
  }

  public double sampleIntervalS() {
    return 1.0 / sampleRateHz;
  }

  /** Stream time in seconds of the sample with the given stream index. */
  public double timeOfSampleS(long sampleIndex) {
    return startTimeS + sampleIndex / sampleRateHz;
  }
}
