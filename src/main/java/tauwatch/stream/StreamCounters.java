package tauwatch.stream;

import java.util.concurrent.atomic.AtomicLong;

/**
 * Running counts of what a stream delivered and lost.
 *
 * <p>Each counter has a single writer (the source thread, or the decoder on it); any thread may
 * read them. Updates use release stores on the single writer's own value, so they never lock.
 */
public final class StreamCounters {
  private final AtomicLong samplesReceived = new AtomicLong();
  private final AtomicLong blocksPublished = new AtomicLong();
  private final AtomicLong overrunSamples = new AtomicLong();
  private final AtomicLong overrunEpisodes = new AtomicLong();
  private final AtomicLong gapSamples = new AtomicLong();
  private final AtomicLong gaps = new AtomicLong();
  private final AtomicLong framesReceived = new AtomicLong();
  private final AtomicLong corruptFrames = new AtomicLong();
  private final AtomicLong resyncs = new AtomicLong();
  private final AtomicLong signalLosses = new AtomicLong();
  private final AtomicLong droppedFrames = new AtomicLong();

  private static void add(AtomicLong counter, long delta) {
    counter.setRelease(counter.getPlain() + delta);
  }

  void addSamples(long n) {
    add(samplesReceived, n);
  }

  void addBlock() {
    add(blocksPublished, 1);
  }

  void addOverrun(long samples, boolean newEpisode) {
    add(overrunSamples, samples);
    if (newEpisode) {
      add(overrunEpisodes, 1);
    }
  }

  void addGap(long samples) {
    add(gapSamples, samples);
    add(gaps, 1);
  }

  void addSignalLoss() {
    add(signalLosses, 1);
  }

  /** Counts a well-formed frame; called by the decoder on the source thread. */
  public void addFrame() {
    add(framesReceived, 1);
  }

  /** Counts a frame rejected for a bad checksum or header; called by the decoder. */
  public void addCorruptFrame() {
    add(corruptFrames, 1);
  }

  /** Counts a loss and regain of frame synchronisation; called by the decoder. */
  public void addResync() {
    add(resyncs, 1);
  }

  public long samplesReceived() {
    return samplesReceived.get();
  }

  public long blocksPublished() {
    return blocksPublished.get();
  }

  public long overrunSamples() {
    return overrunSamples.get();
  }

  public long overrunEpisodes() {
    return overrunEpisodes.get();
  }

  public long gapSamples() {
    return gapSamples.get();
  }

  public long gaps() {
    return gaps.get();
  }

  /** Counts frames missing from the sequence numbers; called by the decoder's sample feed. */
  public void addDroppedFrames(long frames) {
    add(droppedFrames, frames);
  }

  /** Frames the sequence numbers say never arrived (their samples are counted as a gap). */
  public long droppedFrames() {
    return droppedFrames.get();
  }

  public long framesReceived() {
    return framesReceived.get();
  }

  public long corruptFrames() {
    return corruptFrames.get();
  }

  public long resyncs() {
    return resyncs.get();
  }

  public long signalLosses() {
    return signalLosses.get();
  }
}
