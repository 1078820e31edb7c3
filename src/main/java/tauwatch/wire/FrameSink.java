package tauwatch.wire;

/**
 * Receives every frame a decoder accepted; never a sample from a frame that failed its checks.
 *
 * <p>Called on the decoder's thread, once per good frame (binary) or per run of good lines (text);
 * the per-sample path, so implementations must not allocate.
 */
public interface FrameSink {
  void onFrame(DecodedFrame frame);
}
