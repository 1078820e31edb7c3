package tauwatch.monitor.live;

import java.util.ArrayDeque;
import java.util.List;
import tauwatch.event.EventKind;
import tauwatch.event.EventSink;
import tauwatch.event.MonitorEvent;
import tauwatch.fit.PulseEstimate;
import tauwatch.health.HealthCriteria;
import tauwatch.health.HealthSnapshot;
import tauwatch.monitor.EstimateListener;
import tauwatch.pulse.PulseWindow;
import tauwatch.stream.StreamFormat;

/**
 * The live view's data: the latest {@link LiveSnapshot} and the session's {@link TrendHistory}, fed
 * by the pipeline and read by the view without JavaFX.
 *
 * <p>Writers: {@link #onPulseEstimate} on the analysis thread (single writer of the trend), {@link
 * #onEvent} on whichever thread raised the event; writers serialise on this object's monitor for a
 * few microseconds per pulse or event. Reader: the view thread loads {@link #version()} once per
 * frame (a volatile read, no lock) and, only when it changed, {@link #snapshot()}; it never blocks
 * a writer and a writer never waits for it. Per pulse this copies the pulse's samples (a few kB)
 * and makes one snapshot object; events are rare.
 */
public final class LiveModel implements EstimateListener, EventSink {
  /** Events kept for the event list. */
  public static final int RECENT_EVENTS = 200;

  /** Alarms and acknowledgements kept for the alarm history. */
  public static final int ALARM_HISTORY = 500;

  private final String sourceName;
  private final StreamFormat format;
  private final HealthCriteria criteria;
  private final TrendHistory trends;

  // Guarded by this (writers only).
  private final ArrayDeque<MonitorEvent> events = new ArrayDeque<>();
  private final ArrayDeque<MonitorEvent> alarms = new ArrayDeque<>();
  private List<MonitorEvent> eventsView = List.of();
  private List<MonitorEvent> alarmsView = List.of();
  private PulseEstimate latest;
  private PulseEstimate lastAccepted;
  private HealthSnapshot health;
  private PulseTrace trace;
  private PulseTrace baselineTrace;
  private PulseTrace averageTrace;
  private int averagePulses;
  private final PulseAverage average;
  private boolean baselineChanged;
  private long pulses;
  private long accepted;
  private long version;

  private volatile LiveSnapshot snapshot = LiveSnapshot.empty();

  public LiveModel(
      String sourceName, StreamFormat format, HealthCriteria criteria, TrendHistory trends) {
    this(sourceName, format, criteria, trends, PulseAverage.DEFAULT_PULSES);
  }

  /**
   * @param averagePulses accepted pulses in the transient's average overlay
   */
  public LiveModel(
      String sourceName,
      StreamFormat format,
      HealthCriteria criteria,
      TrendHistory trends,
      int averagePulses) {
    this.average = new PulseAverage(averagePulses);
    this.sourceName = sourceName;
    this.format = format;
    this.criteria = criteria;
    this.trends = trends;
  }

  public LiveModel(String sourceName, StreamFormat format, HealthCriteria criteria) {
    this(sourceName, format, criteria, new TrendHistory());
  }

  @Override
  public void onEstimate(PulseEstimate estimate, HealthSnapshot health) {
    onPulse(null, estimate, health);
  }

  /** A model nobody reads, with a small trend ring (the warm-up wraps it, as a day would). */
  @Override
  public EstimateListener warmUpTwin() {
    return new LiveModel(
        sourceName,
        format,
        criteria,
        new TrendHistory(4 * TrendHistory.READ_SLACK_ROWS),
        average.capacity());
  }

  @Override
  public void onPulseEstimate(PulseWindow window, PulseEstimate estimate, HealthSnapshot health) {
    onPulse(window, estimate, health);
  }

  private void onPulse(PulseWindow window, PulseEstimate e, HealthSnapshot h) {
    trends.append(e, h);
    PulseTrace t = window == null ? null : PulseTrace.copyOf(window);
    // Analysis thread only (the single writer): the average is built outside the lock.
    PulseTrace mean = t != null && e.accepted() ? average.add(t) : null;
    int meanCount = average.count();
    synchronized (this) {
      latest = e;
      health = h;
      pulses++;
      if (e.accepted()) {
        accepted++;
        lastAccepted = e;
      }
      if (mean != null) {
        averageTrace = mean;
        averagePulses = meanCount;
      }
      if (t != null) {
        trace = t;
        // The baseline is set inside the health rules before this call (its event arrived first).
        if (e.accepted() && h.baselineSet() && (baselineChanged || baselineTrace == null)) {
          baselineTrace = t;
          baselineChanged = false;
        }
      }
      publish();
    }
  }

  @Override
  public void onEvent(MonitorEvent e) {
    synchronized (this) {
      push(events, e, RECENT_EVENTS);
      eventsView = List.copyOf(events);
      if (e.kind() == EventKind.ALARM || e.kind() == EventKind.ALARM_ACK) {
        push(alarms, e, ALARM_HISTORY);
        alarmsView = List.copyOf(alarms);
      }
      if (e.kind() == EventKind.BASELINE_SET) {
        baselineChanged = true;
      }
      publish();
    }
  }

  private static void push(ArrayDeque<MonitorEvent> q, MonitorEvent e, int max) {
    if (q.size() == max) {
      q.removeFirst();
    }
    q.addLast(e);
  }

  // Called holding this.
  private void publish() {
    version++;
    snapshot =
        new LiveSnapshot(
            version,
            latest,
            lastAccepted,
            health,
            trace,
            baselineTrace,
            averageTrace,
            averagePulses,
            pulses,
            accepted,
            eventsView,
            alarmsView);
  }

  /** The latest publication's version; a volatile read, for the view's dirty check. */
  public long version() {
    return snapshot.version();
  }

  /** The latest snapshot; any thread, never blocks. */
  public LiveSnapshot snapshot() {
    return snapshot;
  }

  public TrendHistory trends() {
    return trends;
  }

  public String sourceName() {
    return sourceName;
  }

  public StreamFormat format() {
    return format;
  }

  public HealthCriteria criteria() {
    return criteria;
  }
}
