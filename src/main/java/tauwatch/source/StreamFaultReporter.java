package tauwatch.source;

import java.util.Locale;
import tauwatch.event.EventKind;
import tauwatch.event.EventSink;
import tauwatch.event.StreamClock;
import tauwatch.stream.SampleWriter;
import tauwatch.stream.StreamCounters;
import tauwatch.stream.StreamFormat;
import tauwatch.wire.SampleFeed;
import tauwatch.wire.StreamDecoder;

/**
 * Turns the decoder's and the feed's counts into events at a bounded rate: corrupt frames, resyncs
 * and skipped bytes as {@code resync}, frames contradicting the profile as {@code stream_mismatch},
 * and link news as {@code link}.
 *
 * <p>Source thread only. {@link #poll} is cheap when nothing changed (a few counter reads); when
 * something did, it writes at most one event per kind per {@value #INTERVAL_MS} ms, with the counts
 * of that interval and the totals, so a corrupt stream is never silent and never floods the log.
 * {@link #finish} reports what is left at the end.
 */
final class StreamFaultReporter {
  static final long INTERVAL_MS = 1000;
  private static final long INTERVAL_NS = INTERVAL_MS * 1_000_000;

  private final EventSink events;
  private final StreamClock clock;
  private final StreamFormat format;
  private final SampleWriter writer;
  private final StreamCounters counters;
  private final StreamDecoder decoder;
  private final SampleFeed feed;

  private long reportedCorrupt;
  private long reportedResyncs;
  private long reportedSkipped;
  private long reportedMismatch;
  private long lastFaultReportNs = Long.MIN_VALUE / 2;
  private long lastMismatchReportNs = Long.MIN_VALUE / 2;

  /** When each kind of link news was last written; link news is rare, so a map is fine. */
  private final java.util.Map<String, Long> linkNewsNs = new java.util.HashMap<>();

  StreamFaultReporter(
      EventSink events,
      StreamClock clock,
      StreamFormat format,
      SampleWriter writer,
      StreamDecoder decoder,
      SampleFeed feed) {
    this.events = events;
    this.clock = clock;
    this.format = format;
    this.writer = writer;
    this.counters = writer.counters();
    this.decoder = decoder;
    this.feed = feed;
  }

  void poll(long nowNs) {
    if (events == null) {
      return;
    }
    long corrupt = counters.corruptFrames();
    long resyncs = counters.resyncs();
    long skipped = decoder.skippedBytes();
    if ((corrupt != reportedCorrupt || resyncs != reportedResyncs || skipped != reportedSkipped)
        && nowNs - lastFaultReportNs >= INTERVAL_NS) {
      emit(
          EventKind.RESYNC,
          String.format(
              Locale.ROOT,
              "%d corrupt frames, %d resyncs, %d bytes skipped (totals %d, %d, %d); corrupt"
                  + " frames are discarded",
              corrupt - reportedCorrupt,
              resyncs - reportedResyncs,
              skipped - reportedSkipped,
              corrupt,
              resyncs,
              skipped));
      reportedCorrupt = corrupt;
      reportedResyncs = resyncs;
      reportedSkipped = skipped;
      lastFaultReportNs = nowNs;
    }
    long mismatch = feed.mismatchFrames();
    if (mismatch != reportedMismatch && nowNs - lastMismatchReportNs >= INTERVAL_NS) {
      emit(
          EventKind.STREAM_MISMATCH,
          String.format(
              Locale.ROOT,
              "%d frames dropped as contradicting profile %s (total %d): %s",
              mismatch - reportedMismatch,
              feed.profile().name(),
              mismatch,
              mismatchDetail()));
      reportedMismatch = mismatch;
      lastMismatchReportNs = nowNs;
    }
  }

  private String mismatchDetail() {
    double v = feed.lastMismatchValue();
    var p = feed.profile();
    switch (feed.lastMismatch()) {
      case CHANNELS:
        return String.format(
            Locale.ROOT, "frames carry %.0f channels, the profile says %d", v, p.channels());
      case SAMPLE_FORMAT:
        return String.format(
            Locale.ROOT,
            "frames carry sample format %.0f, the profile says %d",
            v,
            p.sampleFormat());
      case SAMPLE_RATE:
        return String.format(
            Locale.ROOT, "frames state %.6g Hz, the profile says %.6g Hz", v, p.sampleRateHz());
      default:
        return String.format(
            Locale.ROOT,
            "raw value %.6g lies beyond what the profile's digitiser can produce (±%.6g);"
                + " check scaling.adc_bits and scaling.adc_range_v",
            v,
            p.rawLimit());
    }
  }

  /**
   * Link news (closed, reopened, cannot connect). The same news is written at most every 10 s, so a
   * device that stays away, or a server that accepts and closes again and again, does not fill the
   * log.
   */
  void link(String news, long nowNs) {
    if (events == null) {
      return;
    }
    Long last = linkNewsNs.get(news);
    if (last != null && nowNs - last < 10 * INTERVAL_NS) {
      return;
    }
    emit(EventKind.LINK, news);
    linkNewsNs.put(news, nowNs);
  }

  /** Reports counts not yet reported, regardless of the interval. */
  void finish() {
    lastFaultReportNs = Long.MIN_VALUE / 2;
    lastMismatchReportNs = Long.MIN_VALUE / 2;
    poll(0);
  }

  private void emit(EventKind kind, String detail) {
    // The wall clock is the real one: during an outage stream time stands still.
    events.onEvent(clock.eventNow(format.timeOfSampleS(writer.nextSampleIndex()), kind, detail));
  }
}
