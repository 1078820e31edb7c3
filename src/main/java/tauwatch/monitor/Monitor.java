package tauwatch.monitor;

import java.io.IOException;
import java.nio.file.Path;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import tauwatch.event.EventKind;
import tauwatch.event.EventSink;
import tauwatch.event.StreamClock;
import tauwatch.fit.PulseEstimator;
import tauwatch.health.HealthMonitor;
import tauwatch.pulse.PulseSegmenter;
import tauwatch.record.EventLog;
import tauwatch.record.ParamsLog;
import tauwatch.record.SessionFolder;
import tauwatch.record.SessionInfo;
import tauwatch.source.SampleSource;
import tauwatch.source.SourceException;
import tauwatch.stream.SampleRing;
import tauwatch.stream.SampleWriter;
import tauwatch.stream.StreamCounters;
import tauwatch.stream.StreamFormat;

/**
 * One monitoring session: source → ring → pulse segmenter → estimator → health rules → logs.
 *
 * <p>Threads: the source runs on its own thread and only feeds the ring; the stream watch, the
 * segmenter and the per-pulse analysis run in order on the ring's consumer thread; {@link #run}
 * blocks the calling thread until the stream ends, the duration is reached or {@link #stop()} is
 * called. {@link #stop()}, {@link #mark(String)}, {@link #health()} and {@link #counters()} may be
 * used from any thread while it runs.
 */
public final class Monitor {
  /** Extra wall-clock time a live source gets past its duration before it is stopped. */
  private static final Duration LIVE_GRACE = Duration.ofSeconds(5);

  private static final long DRAIN_TIMEOUT_S = 60;

  private final SampleSource source;
  private final MonitorConfig config;
  private final PulseEstimator estimator;
  private final Path logDir;
  private final List<EstimateListener> listeners = new ArrayList<>();
  private final List<EventSink> eventListeners = new ArrayList<>();
  private final Map<String, Object> sessionExtras = new LinkedHashMap<>();

  private volatile HealthMonitor health;
  private volatile SampleRing ring;
  private volatile EventLog eventLog;
  private volatile boolean ended;
  private final java.util.concurrent.ConcurrentLinkedQueue<String> earlyMarks =
      new java.util.concurrent.ConcurrentLinkedQueue<>();
  private volatile StreamClock clock;
  private volatile Path sessionDir;

  public Monitor(SampleSource source, MonitorConfig config, PulseEstimator estimator, Path logDir) {
    this.source = source;
    this.config = config;
    this.estimator = estimator;
    this.logDir = logDir;
  }

  /** Adds a listener for every estimate; call before {@link #run}. */
  public Monitor addListener(EstimateListener l) {
    listeners.add(l);
    return this;
  }

  /** Adds a listener for every logged event; call before {@link #run}. */
  public Monitor addEventListener(EventSink l) {
    eventListeners.add(l);
    return this;
  }

  /** Adds a field to {@code session.json} (e.g. the device profile); call before {@link #run}. */
  public Monitor sessionField(String key, Object value) {
    sessionExtras.put(key, value);
    return this;
  }

  /**
   * Runs the session to its end.
   *
   * @param duration stream time to monitor, or null to run until the stream ends or {@link #stop()}
   *     is called
   * @throws SourceException when the source's input is malformed (after the logs are closed and the
   *     session is marked failed)
   */
  public MonitorResult run(Duration duration) throws IOException, InterruptedException {
    try {
      return runLogged(duration);
    } finally {
      ended = true;
      earlyMarks.clear();
    }
  }

  /**
   * Samples in {@code duration} at {@code rateHz}, rounded up, in exact decimal arithmetic: in
   * doubles 240 s × 1e-9 × 50 kHz comes to 12 000 000.000000002, one sample too many.
   */
  static long samplesIn(Duration duration, double rateHz) {
    return java.math.BigDecimal.valueOf(duration.toNanos())
        .multiply(java.math.BigDecimal.valueOf(rateHz))
        .divide(java.math.BigDecimal.valueOf(1_000_000_000L), 0, java.math.RoundingMode.CEILING)
        .longValueExact();
  }

  private MonitorResult runLogged(Duration duration) throws IOException, InterruptedException {
    StreamFormat format = source.format();
    // Before the source opens and before the session's start time is taken: nothing waits on it.
    long warmUpStart = System.nanoTime();
    long warmUpPulses = AnalysisWarmUp.run(format, config, listeners);
    double warmUpS = (System.nanoTime() - warmUpStart) * 1e-9;
    Instant start = Instant.now();
    Path dir = SessionFolder.create(logDir, start, source.name());
    sessionDir = dir;
    StreamClock streamClock =
        new StreamClock(start.toEpochMilli() - Math.round(format.startTimeS() * 1000));
    clock = streamClock;
    SessionInfo info = new SessionInfo(dir.resolve("session.json"));
    Map<String, Object> stream = new LinkedHashMap<>();
    stream.put("description", format.description());
    stream.put("sample_rate_hz", format.sampleRateHz());
    stream.put("mode", format.mode().code());
    stream.put("filter_cutoff_hz", format.filterCutoffHz());
    stream.put("start_time_s", format.startTimeS());
    info.put("source", source.name()).put("stream", stream).put("configuration", config.asLoaded());
    if (warmUpPulses > 0) {
      // Simulated pulses run through a private copy of the analysis before the source opened.
      info.put(
          "analysis_warm_up",
          Map.of("pulses", warmUpPulses, "seconds", Math.round(warmUpS * 1000) / 1000.0));
    }
    sessionExtras.forEach(info::put);
    info.writeStarted(start);

    try (EventLog events = new EventLog(dir.resolve("events.csv"));
        ParamsLog params =
            new ParamsLog(dir.resolve("params.csv"), streamClock, source.hasSweepTrigger())) {
      eventLog = events;
      eventListeners.forEach(events::addListener);
      HealthMonitor h = new HealthMonitor(config.health(), events, streamClock);
      health = h;
      PulseAnalysis analysis =
          new PulseAnalysis(
              estimator, config.outliers().newScreen(), h, params, events, streamClock, listeners);
      PulseSegmenter segmenter =
          new PulseSegmenter(format, config.segmenterFor(format.mode()), analysis, events);
      StreamWatch watch = new StreamWatch(format, streamClock, h, events);
      SampleRing r = new SampleRing(source.live(), watch, segmenter);
      ring = r;
      r.start();
      events.onEvent(
          streamClock.event(
              format.startTimeS(),
              EventKind.SESSION_START,
              String.format(
                  "source %s, %.0f Hz, %s, filter %s",
                  source.name(),
                  format.sampleRateHz(),
                  format.mode().code(),
                  format.filterCutoffHz() > 0
                      ? String.format("%.0f Hz", format.filterCutoffHz())
                      : "none")));
      writeEarlyMarks();

      long maxSamples =
          duration == null ? Long.MAX_VALUE : samplesIn(duration, format.sampleRateHz());
      source.attach(events, streamClock);
      SourceRunner runner = new SourceRunner(source, r.writer(), maxSamples, events, streamClock);
      Thread t = new Thread(runner, "tauwatch-source");
      t.setDaemon(true);
      t.start();
      if (duration != null && source.live()) {
        t.join(duration.plus(LIVE_GRACE).toMillis());
        source.stop();
      }
      t.join();
      boolean drained = r.awaitDrainedAndStop(DRAIN_TIMEOUT_S, TimeUnit.SECONDS);

      StreamCounters c = r.counters();
      String status;
      if (runner.failure != null) {
        status = "failed: " + runner.failure.getMessage();
      } else if (analysis.logFailure() != null) {
        status = "failed: cannot write params.csv: " + analysis.logFailure().getMessage();
      } else if (!drained) {
        status = "failed: analysis did not finish within " + DRAIN_TIMEOUT_S + " s";
      } else {
        status = "complete";
      }
      ended = true;
      events.onEvent(
          streamClock.event(
              streamClock.latestStreamTimeS(),
              EventKind.SESSION_END,
              String.format(
                  "%s: %d samples, %d pulses (%d accepted), %d gaps, %d samples overrun%s",
                  status,
                  c.samplesReceived(),
                  analysis.pulses(),
                  analysis.accepted(),
                  c.gaps(),
                  c.overrunSamples(),
                  c.framesReceived() == 0
                      ? ""
                      : String.format(
                          ", %d frames, %d corrupt, %d dropped, %d signal losses",
                          c.framesReceived(),
                          c.corruptFrames(),
                          c.droppedFrames(),
                          c.signalLosses()))));
      info.put("samples", c.samplesReceived())
          .put("pulses", analysis.pulses())
          .put("accepted_pulses", analysis.accepted())
          .put("gaps", c.gaps())
          .put("gap_samples", c.gapSamples())
          .put("overrun_samples", c.overrunSamples())
          .put("corrupt_frames", c.corruptFrames())
          .put("resyncs", c.resyncs())
          .put("dropped_frames", c.droppedFrames())
          .put("signal_losses", c.signalLosses())
          .put("event_rows", events.rows());
      info.writeEnded(Instant.now(), status);
      if (runner.failure instanceof SourceException) {
        throw (SourceException) runner.failure;
      }
      if (runner.failure != null) {
        throw runner.failure;
      }
      return new MonitorResult(
          dir,
          c.samplesReceived(),
          analysis.pulses(),
          analysis.accepted(),
          c.gaps(),
          c.overrunSamples(),
          events.rows(),
          analysis.analysisErrors(),
          drained,
          status);
    }
  }

  /** Asks the session to end; {@link #run} then drains and returns. Any thread. */
  public void stop() {
    source.stop();
  }

  /**
   * Writes a user's mark to the event log. Any thread. Before the log opens the mark is queued and
   * written (with a note saying so) as the log opens; after the session ended it is refused.
   */
  public MarkOutcome mark(String note) {
    if (ended) {
      return MarkOutcome.SESSION_ENDED;
    }
    EventLog log = eventLog;
    StreamClock c = clock;
    if (log != null && c != null) {
      log.onEvent(c.eventNow(EventKind.MARK, note));
      return MarkOutcome.LOGGED;
    }
    earlyMarks.add(note);
    // The log may have opened between the check and the add: drain here too (each mark is polled
    // once, so none is written twice).
    if (eventLog != null) {
      writeEarlyMarks();
      return MarkOutcome.LOGGED;
    }
    return MarkOutcome.QUEUED;
  }

  private void writeEarlyMarks() {
    EventLog log = eventLog;
    StreamClock c = clock;
    for (String note = earlyMarks.poll(); note != null; note = earlyMarks.poll()) {
      log.onEvent(c.eventNow(EventKind.MARK, note + " (typed before the log opened)"));
    }
  }

  /** The health rules of the running session, or null before it starts. */
  public HealthMonitor health() {
    return health;
  }

  /** The stream counters of the running session, or null before it starts. */
  public StreamCounters counters() {
    SampleRing r = ring;
    return r == null ? null : r.counters();
  }

  /** The session folder, or null before it is created. */
  public Path sessionDir() {
    return sessionDir;
  }

  public SampleSource source() {
    return source;
  }

  /** Runs the source on its thread; catches its failure at the edge and ends the stream. */
  private static final class SourceRunner implements Runnable {
    private final SampleSource source;
    private final SampleWriter writer;
    private final long maxSamples;
    private final EventSink events;
    private final StreamClock clock;
    volatile IOException failure;

    SourceRunner(
        SampleSource source,
        SampleWriter writer,
        long maxSamples,
        EventSink events,
        StreamClock clock) {
      this.source = source;
      this.writer = writer;
      this.maxSamples = maxSamples;
      this.events = events;
      this.clock = clock;
    }

    @Override
    public void run() {
      try {
        source.run(writer, maxSamples);
      } catch (IOException e) {
        failure = e;
        events.onEvent(clock.eventNow(EventKind.SOURCE_ERROR, e.getMessage()));
      } catch (RuntimeException e) {
        failure = new IOException("source failed: " + e, e);
        events.onEvent(clock.eventNow(EventKind.SOURCE_ERROR, failure.getMessage()));
      } finally {
        writer.endOfStream();
      }
    }
  }
}
