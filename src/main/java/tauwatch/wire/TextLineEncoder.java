package tauwatch.wire;

/**
 * Writes samples as lines of the text variant into a reusable buffer: the simulator's side of a
 * small board's serial link.
 *
 * <p>Single-threaded; allocation-free after construction (integers are written digit by digit).
 */
public final class TextLineEncoder {
  private final int channels;
  private final boolean counter;
  private final byte[] buf;
  private final byte[] digits = new byte[20];
  private int length;

  /**
   * @param maxSamples the most samples one batch will hold
   */
  public TextLineEncoder(int channels, boolean counter, int maxSamples) {
    this.channels = channels;
    this.counter = counter;
    this.buf = new byte[maxSamples * (channels + 1) * 12 + 16];
  }

  public byte[] buffer() {
    return buf;
  }

  /** Bytes written since the last {@link #clear()}. */
  public int length() {
    return length;
  }

  public void clear() {
    length = 0;
  }

  /**
   * Appends one line.
   *
   * @param sampleCounter written first when the encoder has a counter (low 32 bits)
   * @param raw the integer values per channel (rounded)
   */
  public void line(long sampleCounter, double[] raw) {
    if (counter) {
      append(sampleCounter & 0xffffffffL);
      buf[length++] = ',';
    }
    for (int ch = 0; ch < channels; ch++) {
      if (ch > 0) {
        buf[length++] = ',';
      }
      append((long) Math.rint(raw[ch]));
    }
    buf[length++] = '\n';
  }

  private void append(long v) {
    if (v < 0) {
      buf[length++] = '-';
      v = -v;
    }
    int n = 0;
    do {
      digits[n++] = (byte) ('0' + v % 10);
      v /= 10;
    } while (v > 0);
    while (n > 0) {
      buf[length++] = digits[--n];
    }
  }
}
