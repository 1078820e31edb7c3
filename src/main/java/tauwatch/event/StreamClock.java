package tauwatch.event;

import java.time.Instant;

/**
 * Maps stream time to wall-clock time, and knows the latest stream time analysed.
 *
 * <p>The origin is fixed at start-up: for a live source the wall clock when the stream began, for a
 * replayed file the moment the replay started (a file carries no wall clock). The latest stream
 * time is written by the analysis thread once per block and read by any thread (a volatile).
 */
public final class StreamClock {
  private final long originMillis;
  private volatile double latestStreamTimeS;

  public StreamClock(long originMillis) {
    this.originMillis = originMillis;
  }

  public long originMillis() {
    return originMillis;
  }

  /** Wall-clock milliseconds of a stream time. */
  public long wallMillis(double streamTimeS) {
    return originMillis + Math.round(streamTimeS * 1000.0);
  }

  public Instant instant(double streamTimeS) {
    return Instant.ofEpochMilli(wallMillis(streamTimeS));
  }

  /** Called by the analysis thread as the stream advances. */
  public void advanceTo(double streamTimeS) {
    latestStreamTimeS = streamTimeS;
  }

  /** The stream time analysed most recently. */
  public double latestStreamTimeS() {
    return latestStreamTimeS;
  }

  /** An event at a stream time, stamped with its wall-clock time. */
  public MonitorEvent event(double streamTimeS, EventKind kind, String detail) {
    return new MonitorEvent(wallMillis(streamTimeS), streamTimeS, kind, detail);
  }

  /**
   * An event raised now about a point of the stream, e.g. a link that dropped while the stream
   * stood still: the wall clock is the real one, not the one derived from stream time.
   */
  public MonitorEvent eventNow(double streamTimeS, EventKind kind, String detail) {
    return new MonitorEvent(System.currentTimeMillis(), streamTimeS, kind, detail);
  }

  /** An event raised now from outside the stream (a mark, an acknowledgement). */
  public MonitorEvent eventNow(EventKind kind, String detail) {
    return new MonitorEvent(System.currentTimeMillis(), latestStreamTimeS, kind, detail);
  }
}
