package tauwatch.monitor.live;

import tauwatch.stream.StreamCounters;

/**
 * What the source has delivered and lost, at one moment, for the status line.
 *
 * <p>Immutable; made by the view thread from the session's counters (atomics), a few times a
 * second.
 *
 * @param sourceName the source URI as given
 * @param receiving samples arrived since the previous reading (or, for the first, any at all)
 * @param sampleRateHz the stream's nominal sample rate
 * @param samples samples received
 * @param frames well-formed frames received (0 for sources without frames)
 * @param gaps gaps in the stream's sequence
 * @param corruptFrames frames rejected by the decoder
 * @param overrunSamples samples dropped because the analysis fell behind
 */
public record SourceStatus(
    String sourceName,
    boolean receiving,
    double sampleRateHz,
    long samples,
    long frames,
    long gaps,
    long corruptFrames,
    long overrunSamples) {

  /** A reading of the counters; {@code previous} (or null) tells whether samples still arrive. */
  public static SourceStatus read(
      String sourceName, double sampleRateHz, StreamCounters c, SourceStatus previous) {
    if (c == null) {
      return new SourceStatus(sourceName, false, sampleRateHz, 0, 0, 0, 0, 0);
    }
    long samples = c.samplesReceived();
    boolean receiving = previous == null ? samples > 0 : samples > previous.samples();
    return new SourceStatus(
        sourceName,
        receiving,
        sampleRateHz,
        samples,
        c.framesReceived(),
        c.gaps(),
        c.corruptFrames(),
        c.overrunSamples());
  }
}
