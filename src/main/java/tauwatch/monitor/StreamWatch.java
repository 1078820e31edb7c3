package tauwatch.monitor;

import tauwatch.event.EventKind;
import tauwatch.event.EventSink;
import tauwatch.event.StreamClock;
import tauwatch.health.HealthMonitor;
import tauwatch.stream.SampleBlock;
import tauwatch.stream.SampleBlockHandler;
import tauwatch.stream.StreamFormat;

/**
 * Turns the ring's in-band news into events and health changes: samples lost to a gap or an
 * overrun, the signal lost and restored, and the advance of stream time.
 *
 * <p>Runs first on the analysis thread, before the segmenter. Per block it allocates nothing unless
 * there is news to log.
 */
final class StreamWatch implements SampleBlockHandler {
  private final StreamFormat format;
  private final StreamClock clock;
  private final HealthMonitor health;
  private final EventSink events;

  StreamWatch(StreamFormat format, StreamClock clock, HealthMonitor health, EventSink events) {
    this.format = format;
    this.clock = clock;
    this.health = health;
    this.events = events;
  }

  @Override
  public void onBlock(SampleBlock block, long sequence, boolean endOfBatch) {
    double t = format.timeOfSampleS(block.firstSampleIndex);
    if (block.lostBeforeSamples > 0) {
      boolean overrun = block.hasFlag(SampleBlock.FLAG_OVERRUN);
      events.onEvent(
          clock.event(
              t,
              overrun ? EventKind.OVERRUN : EventKind.GAP,
              block.lostBeforeSamples
                  + " samples lost ("
                  + String.format("%.4f s", block.lostBeforeSamples * format.sampleIntervalS())
                  + (overrun
                      ? "): the analysis fell behind and the ring was full"
                      : ") before this point: missing from the stream")));
    }
    if (block.hasFlag(SampleBlock.FLAG_SIGNAL_LOST)) {
      events.onEvent(clock.event(t, EventKind.SIGNAL_LOST, "source stopped delivering samples"));
      health.onSignalLost(t);
    }
    if (block.hasFlag(SampleBlock.FLAG_SIGNAL_RESTORED)) {
      events.onEvent(clock.event(t, EventKind.SIGNAL_RESTORED, "samples arrive again"));
      health.onSignalRestored(t);
    }
    double end = format.timeOfSampleS(block.firstSampleIndex + block.length);
    clock.advanceTo(end);
    health.onStreamTime(end);
  }
}
