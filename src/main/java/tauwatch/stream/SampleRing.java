package tauwatch.stream;

import com.lmax.disruptor.EventHandler;
import com.lmax.disruptor.RingBuffer;
import com.lmax.disruptor.Sequence;
import com.lmax.disruptor.SleepingWaitStrategy;
import com.lmax.disruptor.dsl.Disruptor;
import com.lmax.disruptor.dsl.ProducerType;
import com.lmax.disruptor.util.DaemonThreadFactory;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.TimeUnit;

/**
 * The single-producer ring of preallocated {@link SampleBlock}s between a source and the analysis.
 *
 * <p>Every slot is allocated at construction and reused. One source thread writes through the
 * {@link SampleWriter} returned by {@link #writer()}; the handlers run in order on one consumer
 * thread. The wait strategy sleeps rather than spins, because on a 2-core rig PC a spinning
 * consumer would take a core from the view and the reader.
 */
public final class SampleRing {
  /**
   * Slots in a live source's ring: 4096 × 256 samples ≈ 1 s of 1 MHz, ample slack for a per-pulse
   * fit or a pause of the analysis thread.
   */
  public static final int DEFAULT_SLOTS = 4096;

  /**
   * Slots when the source waits for space (files, the unpaced simulator): it never drops, so it
   * needs only enough slack to keep both threads busy across a pulse's fit; a quarter of the live
   * ring (4.4 MB) saves allocating and touching 18 MB at every replay's start (measured: a 1 s
   * capture's replay took 25–40 ms with the live ring, 17–25 ms with this one). 256 slots made long
   * replays slower (the threads wait on each other more often).
   */
  public static final int WAITING_SLOTS = 1024;

  private static final long SLEEP_NS = 100_000;

  private final Disruptor<SampleBlock> disruptor;
  private final RingBuffer<SampleBlock> ring;
  private final StreamCounters counters = new StreamCounters();
  private final SampleWriter writer;
  private final CountDownLatch started = new CountDownLatch(1);
  private final CountDownLatch drained = new CountDownLatch(1);
  private volatile boolean running;

  /**
   * @param slots ring size, a power of two
   * @param blockCapacity samples per block
   * @param dropWhenFull true for live sources, which cannot wait: a full ring drops samples and
   *     counts an overrun; false for files and the unpaced simulator, which wait for space
   * @param handlers consumers, run in this order on one thread
   */
  public SampleRing(
      int slots, int blockCapacity, boolean dropWhenFull, SampleBlockHandler... handlers) {
    disruptor =
        new Disruptor<>(
            () -> new SampleBlock(blockCapacity),
            slots,
            DaemonThreadFactory.INSTANCE,
            ProducerType.SINGLE,
            new SleepingWaitStrategy(200, SLEEP_NS));
    disruptor.handleEventsWith(new Chain(handlers));
    ring = disruptor.getRingBuffer();
    writer = new SampleWriter(ring, counters, dropWhenFull);
  }

  public SampleRing(boolean dropWhenFull, SampleBlockHandler... handlers) {
    this(
        dropWhenFull ? DEFAULT_SLOTS : WAITING_SLOTS,
        SampleBlock.DEFAULT_CAPACITY,
        dropWhenFull,
        handlers);
  }

  /** Starts the consumer thread and waits until it runs, so no published block is missed. */
  public void start() {
    running = true;
    disruptor.start();
    try {
      if (!started.await(10, TimeUnit.SECONDS)) {
        throw new IllegalStateException("ring consumer did not start within 10 s");
      }
    } catch (InterruptedException e) {
      Thread.currentThread().interrupt();
      throw new IllegalStateException("interrupted while starting the ring consumer", e);
    }
  }

  /** The producer side; to be used by exactly one source thread. */
  public SampleWriter writer() {
    return writer;
  }

  public StreamCounters counters() {
    return counters;
  }

  /**
   * Waits until the consumer has handled the end-of-stream block, then stops the consumer thread.
   *
   * @return true if the stream drained within the timeout; false if it was halted with blocks left
   */
  public boolean awaitDrainedAndStop(long timeout, TimeUnit unit) throws InterruptedException {
    boolean ok = drained.await(timeout, unit);
    if (running) {
      running = false;
      disruptor.halt();
    }
    return ok;
  }

  /** Free slots right now; for status displays. */
  public long remainingCapacity() {
    return ring.remainingCapacity();
  }

  public int slots() {
    return ring.getBufferSize();
  }

  /**
   * The consumer hands its handled slots back to the producer every this many blocks, not only at
   * the end of a batch: a batch can be the whole ring, and a waiting producer would otherwise sit
   * idle until all of it is analysed (measured: ≈ 20 ms of a 250 ms replay).
   */
  static final int RELEASE_EVERY_BLOCKS = 16;

  private final class Chain implements EventHandler<SampleBlock> {
    private final SampleBlockHandler[] handlers;
    private Sequence handled;

    Chain(SampleBlockHandler[] handlers) {
      this.handlers = handlers.clone();
    }

    @Override
    public void onStart() {
      for (SampleBlockHandler h : handlers) {
        h.onStart();
      }
      started.countDown();
    }

    @Override
    public void setSequenceCallback(Sequence sequenceCallback) {
      handled = sequenceCallback;
    }

    @Override
    public void onEvent(SampleBlock block, long sequence, boolean endOfBatch) {
      for (SampleBlockHandler h : handlers) {
        h.onBlock(block, sequence, endOfBatch);
      }
      if ((sequence & (RELEASE_EVERY_BLOCKS - 1)) == 0 && !endOfBatch && handled != null) {
        handled.set(sequence);
      }
      if (block.hasFlag(SampleBlock.FLAG_END_OF_STREAM)) {
        drained.countDown();
      }
    }

    @Override
    public void onShutdown() {
      for (SampleBlockHandler h : handlers) {
        h.onShutdown();
      }
    }
  }
}
