package tauwatch.wire;

/**
 * Turns received bytes into frames for a {@link FrameSink}, skipping and counting what is corrupt.
 *
 * <p>Single-threaded (the source thread). {@link #accept} never throws on bad input and allocates
 * nothing; it holds back an incomplete frame until the rest arrives.
 */
public interface StreamDecoder {
  /** Decodes {@code len} bytes from {@code src[off]}. */
  void accept(byte[] src, int off, int len);

  /**
   * Forgets buffered bytes (the link was closed); an incomplete frame that had begun counts as
   * corrupt.
   */
  void reset();

  /** Bytes skipped while searching for a frame start (garbage), since construction. */
  long skippedBytes();
}
