package tauwatch.wire;

import java.util.zip.CRC32;

/**
 * Writes binary sample frames ({@link WireFormat}) into a reusable buffer: the simulator's side of
 * the wire, and a reference for firmware authors.
 *
 * <p>Single-threaded; allocation-free after construction. The caller fills the raw values with
 * {@link #set}, then {@link #finish} writes header and CRC and returns the frame's length in {@link
 * #buffer()}.
 */
public final class FrameEncoder {
  private final int format;
  private final int channels;
  private final int samples;
  private final byte[] buf;
  private final CRC32 crc = new CRC32();

  public FrameEncoder(int format, int channels, int samples) {
    if (WireFormat.bytesPerValue(format) == 0) {
      throw new IllegalArgumentException("unknown sample format " + format);
    }
    if (channels < 1 || channels > WireFormat.MAX_CHANNELS) {
      throw new IllegalArgumentException("channels must be 1–" + WireFormat.MAX_CHANNELS);
    }
    if (samples < 1 || samples > WireFormat.MAX_SAMPLES_PER_FRAME) {
      throw new IllegalArgumentException(
          "samples per frame must be 1–" + WireFormat.MAX_SAMPLES_PER_FRAME);
    }
    this.format = format;
    this.channels = channels;
    this.samples = samples;
    this.buf = new byte[WireFormat.frameBytes(format, channels, samples)];
  }

  public byte[] buffer() {
    return buf;
  }

  public int frameBytes() {
    return buf.length;
  }

  public int samplesPerFrame() {
    return samples;
  }

  /** Sets one raw value: a count (rounded and clipped to int16) or a float32 value. */
  public void set(int sample, int channel, double raw) {
    int p =
        WireFormat.HEADER_BYTES + (sample * channels + channel) * WireFormat.bytesPerValue(format);
    if (format == WireFormat.FORMAT_INT16) {
      double c = Math.rint(raw);
      int count =
          c > Short.MAX_VALUE ? Short.MAX_VALUE : c < Short.MIN_VALUE ? Short.MIN_VALUE : (int) c;
      WireFormat.putU16(buf, p, count);
    } else {
      WireFormat.putI32(buf, p, Float.floatToRawIntBits((float) raw));
    }
  }

  /**
   * Writes the header and CRC.
   *
   * @param sequence frame number (low 32 bits are sent)
   * @param firstSample stream index of the frame's first sample (low 32 bits are sent)
   * @param sampleRateHz the rate to state, or 0 to state none
   * @return the frame's length in bytes
   */
  public int finish(long sequence, long firstSample, double sampleRateHz) {
    buf[0] = WireFormat.SYNC0;
    buf[1] = WireFormat.SYNC1;
    buf[2] = WireFormat.SYNC2;
    buf[3] = WireFormat.SYNC3;
    buf[WireFormat.OFF_VERSION] = (byte) WireFormat.VERSION;
    buf[WireFormat.OFF_FORMAT] = (byte) format;
    buf[WireFormat.OFF_CHANNELS] = (byte) channels;
    buf[WireFormat.OFF_FLAGS] = 0;
    WireFormat.putI32(buf, WireFormat.OFF_SEQUENCE, (int) sequence);
    WireFormat.putI32(buf, WireFormat.OFF_FIRST_SAMPLE, (int) firstSample);
    WireFormat.putI32(buf, WireFormat.OFF_RATE, Float.floatToRawIntBits((float) sampleRateHz));
    WireFormat.putU16(buf, WireFormat.OFF_SAMPLES, samples);
    WireFormat.putU16(buf, WireFormat.OFF_RESERVED, 0);
    int payloadEnd = buf.length - WireFormat.CRC_BYTES;
    crc.reset();
    crc.update(buf, 0, payloadEnd);
    WireFormat.putI32(buf, payloadEnd, (int) crc.getValue());
    return buf.length;
  }
}
