package tauwatch.wire;

/**
 * One decoded frame or run of text lines: raw values (ADC counts or float32 values) interleaved by
 * channel, with the frame's stream bookkeeping.
 *
 * <p>A reusable buffer owned by one decoder and valid only during {@link FrameSink#onFrame}; the
 * decoder refills it in place, so nothing is allocated per frame.
 */
public final class DecodedFrame {
  /** Raw values, {@code values[sample * channels + channel]}. */
  public final double[] values;

  public int channels;
  public int samples;

  /** {@link WireFormat#FORMAT_INT16}, {@link WireFormat#FORMAT_FLOAT32}, or 0 for text lines. */
  public int sampleFormat;

  /** Frame sequence number (u32), or −1 when the framing carries none. */
  public long sequence;

  /** Low 32 bits of the stream index of the first sample, or −1 when the framing carries none. */
  public long firstSample;

  /** The sample rate the frame states, or 0 when it states none. */
  public double sampleRateHz;

  public DecodedFrame(int capacityValues) {
    values = new double[capacityValues];
  }

  public double value(int sample, int channel) {
    return values[sample * channels + channel];
  }
}
