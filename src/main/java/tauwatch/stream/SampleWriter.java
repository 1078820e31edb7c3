package tauwatch.stream;

import com.lmax.disruptor.RingBuffer;

/**
 * The producer side of the {@link SampleRing}: fills ring slots in place, sample by sample.
 *
 * <p>Single writer: only the source thread may call it. Allocation-free. A slot is claimed when its
 * first sample arrives and published when full or on {@link #flush()}; live sources flush after
 * every read so that the last sample of a pulse is not held back waiting for a full block.
 *
 * <p>When the ring is full and the writer was made to drop, the samples are counted as an overrun
 * and the next published block says how many were lost, so the loss is seen downstream in stream
 * order and never silently.
 */
public final class SampleWriter {
  private final RingBuffer<SampleBlock> ring;
  private final StreamCounters counters;
  private final boolean dropWhenFull;

  private long claimed = -1;
  private SampleBlock block;
  private long nextSampleIndex;
  private long pendingLostSamples;
  private int pendingFlags;
  private boolean inOverrun;

  SampleWriter(RingBuffer<SampleBlock> ring, StreamCounters counters, boolean dropWhenFull) {
    this.ring = ring;
    this.counters = counters;
    this.dropWhenFull = dropWhenFull;
  }

  /** Appends one sample of both channels. */
  public void put(double command, double response) {
    put(command, response, false);
  }

  /** Appends one sample; {@code sweepStart} marks the first sample of an acquisition sweep. */
  public void put(double command, double response, boolean sweepStart) {
    if (block == null && !claim()) {
      countOverrun(1);
      nextSampleIndex++;
      return;
    }
    int i = block.length;
    block.command[i] = command;
    block.response[i] = response;
    block.sweepStart[i] = sweepStart ? (byte) 1 : (byte) 0;
    block.length = i + 1;
    nextSampleIndex++;
    if (block.length == block.capacity()) {
      publish();
    }
  }

  /**
   * Appends {@code count} samples from {@code command[from..]} and {@code response[from..]} (and
   * {@code sweepStart[from..]}, or no sweep starts when null), block by block: the same stream as
   * as many {@link #put} calls, without a call per sample. When the ring is full and this writer
   * drops, the rest of the call is counted as one overrun.
   */
  public void putAll(double[] command, double[] response, byte[] sweepStart, int from, int count) {
    int i = from;
    int end = from + count;
    while (i < end) {
      if (block == null && !claim()) {
        int lost = end - i;
        countOverrun(lost);
        nextSampleIndex += lost;
        return;
      }
      int at = block.length;
      int k = Math.min(block.capacity() - at, end - i);
      System.arraycopy(command, i, block.command, at, k);
      System.arraycopy(response, i, block.response, at, k);
      if (sweepStart != null) {
        System.arraycopy(sweepStart, i, block.sweepStart, at, k);
      } else {
        java.util.Arrays.fill(block.sweepStart, at, at + k, (byte) 0);
      }
      block.length = at + k;
      nextSampleIndex += k;
      i += k;
      if (block.length == block.capacity()) {
        publish();
      }
    }
  }

  /** Publishes a partly filled block, if any. */
  public void flush() {
    if (block != null) {
      publish();
    }
  }

  /**
   * Records a sequence gap reported by the decoder: {@code samples} samples that never arrived.
   * Stream indices skip over them so that stream time stays true.
   */
  public void gap(long samples) {
    if (samples <= 0) {
      return;
    }
    flush();
    counters.addGap(samples);
    pendingLostSamples += samples;
    nextSampleIndex += samples;
  }

  /** The source lost its signal; sent downstream at once as a news-only block. */
  public void signalLost() {
    flush();
    counters.addSignalLoss();
    pendingFlags |= SampleBlock.FLAG_SIGNAL_LOST;
    publishNewsBlocking();
  }

  /** The signal is back; the next samples belong to the restored stream. */
  public void signalRestored() {
    flush();
    pendingFlags |= SampleBlock.FLAG_SIGNAL_RESTORED;
    publishNewsBlocking();
  }

  /** Ends the stream: publishes what is pending and a final end-of-stream block. */
  public void endOfStream() {
    flush();
    pendingFlags |= SampleBlock.FLAG_END_OF_STREAM;
    publishNewsBlocking();
  }

  /** Stream index of the next sample to be put. */
  public long nextSampleIndex() {
    return nextSampleIndex;
  }

  public StreamCounters counters() {
    return counters;
  }

  private boolean claim() {
    if (dropWhenFull && !ring.hasAvailableCapacity(1)) {
      return false;
    }
    // Single producer: after the capacity check next() cannot block.
    startBlock(ring.next());
    return true;
  }

  private void countOverrun(long samples) {
    counters.addOverrun(samples, !inOverrun);
    inOverrun = true;
    pendingLostSamples += samples;
  }

  private void publish() {
    block.receivedNanos = System.nanoTime();
    counters.addSamples(block.length);
    counters.addBlock();
    long seq = claimed;
    block = null;
    claimed = -1;
    ring.publish(seq);
  }

  /** News must get through even when the ring is full, so it waits for a slot. */
  private void publishNewsBlocking() {
    startBlock(ring.next());
    publish();
  }

  private void startBlock(long sequence) {
    claimed = sequence;
    block = ring.get(sequence);
    block.clear();
    block.firstSampleIndex = nextSampleIndex;
    block.lostBeforeSamples = pendingLostSamples;
    block.flags = pendingFlags | (inOverrun ? SampleBlock.FLAG_OVERRUN : 0);
    pendingLostSamples = 0;
    pendingFlags = 0;
    inOverrun = false;
  }
}
