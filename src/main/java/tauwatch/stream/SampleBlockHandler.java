package tauwatch.stream;

/**
 * A consumer of the sample ring.
 *
 * <p>Called on the ring's consumer thread only. {@link #onBlock} is the per-sample path: it must
 * not allocate, box, lock or log.
 */
public interface SampleBlockHandler {

  /**
   * Handles one published block.
   *
   * @param block the slot; valid only during this call
   * @param sequence the ring sequence of the slot
   * @param endOfBatch whether more blocks are ready right now
   */
  void onBlock(SampleBlock block, long sequence, boolean endOfBatch);

  /** Called once on the consumer thread before the first block. */
  default void onStart() {}

  /** Called once on the consumer thread after the last block. */
  default void onShutdown() {}
}
