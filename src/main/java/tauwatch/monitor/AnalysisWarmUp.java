package tauwatch.monitor;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.io.Writer;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.concurrent.ConcurrentHashMap;
import tauwatch.event.EventSink;
import tauwatch.event.StreamClock;
import tauwatch.health.HealthMonitor;
import tauwatch.pulse.PulseSegmenter;
import tauwatch.pulse.SegmenterOptions;
import tauwatch.record.ParamsLog;
import tauwatch.sim.Scenario;
import tauwatch.sim.ScenarioLoader;
import tauwatch.sim.SimulatedRecording;
import tauwatch.stream.ClampMode;
import tauwatch.stream.SampleBlock;
import tauwatch.stream.StreamFormat;

/**
 * Runs simulated pulses through a private copy of the per-pulse path before a session's source
 * starts, so that the JIT has compiled it by the first real pulse.
 *
 * <p>Why: HotSpot compiles a method with its optimising compiler only after thousands of calls, and
 * a rig pulses a few times a second, so without this the per-pulse path (estimator, outlier screen,
 * health rules, the params row) runs interpreted or in the profiling tier for the first hour or
 * more. Measured on the 2-core development machine (50 kHz, 5 ms steps): after 300 pulses the
 * estimate, screen + health and params row took 229, 164 and 450 µs; after 60 000, 45, 14 and 26
 * µs.
 *
 * <p>The simulated cell runs at the stream's rate, filter and clamp mode through a fresh segmenter,
 * estimator, screen and health rules, a params log that writes nowhere, and fresh twins of the
 * session's listeners: nothing reaches the session's logs, listeners or state. Once per clamp mode
 * and listener class per JVM (compiled code stays), bounded in pulses and in time. Called on the
 * thread that starts the session; allocates freely.
 */
final class AnalysisWarmUp {
  /** Pulses analysed per clamp mode: enough for the optimising compiler's call thresholds. */
  static final int PULSES = 6000;

  /** Upper bound on the warm-up's wall time, whatever the stream's rate. */
  static final long MAX_NANOS = 4_000_000_000L;

  /** Clamp modes, and mode + listener class, warmed in this JVM. */
  private static final Set<String> WARMED = ConcurrentHashMap.newKeySet();

  private AnalysisWarmUp() {}

  /**
   * Warms the per-pulse path for {@code format}'s clamp mode, with the twins of the session's
   * listeners ({@link EstimateListener#warmUpTwin}), unless this JVM already has; returns the
   * pulses analysed (0 when already warm, or when the simulator cannot produce this format, which
   * only makes the first pulses slower).
   */
  static long run(StreamFormat format, MonitorConfig config, List<EstimateListener> listeners) {
    List<EstimateListener> twins = new ArrayList<>();
    boolean anyNew = WARMED.add(format.mode().code());
    for (EstimateListener l : listeners) {
      EstimateListener twin = l.warmUpTwin();
      if (twin != null) {
        twins.add(twin);
        anyNew |= WARMED.add(format.mode().code() + " " + twin.getClass().getName());
      }
    }
    return anyNew ? analyse(format, config, PULSES, twins).pulses() : 0;
  }

  /** Pulses cut and pulses accepted by the warm-up's private analysis. */
  record Outcome(long pulses, long accepted) {}

  /** Runs up to {@code pulses} simulated pulses through a private analysis (no once-guard). */
  static Outcome analyse(
      StreamFormat format, MonitorConfig config, int pulses, List<EstimateListener> listeners) {
    SegmenterOptions segmenter = config.segmenterFor(format.mode());
    Scenario scenario;
    try {
      scenario = scenarioFor(format, segmenter);
    } catch (RuntimeException e) {
      return new Outcome(0, 0);
    }
    SimulatedRecording recording = new SimulatedRecording(scenario, 1);
    StreamClock clock = new StreamClock(0);
    EventSink discard = event -> {};
    ParamsLog log;
    try {
      log = new ParamsLog(Path.of("(warm-up)"), Writer.nullWriter(), clock, false);
    } catch (IOException e) {
      throw new UncheckedIOException(e); // a null writer does not fail
    }
    PulseAnalysis analysis =
        new PulseAnalysis(
            PulseEstimators.forFormat(recording.format(), config),
            config.outliers().newScreen(),
            new HealthMonitor(config.health(), discard, clock),
            log,
            discard,
            clock,
            listeners);
    PulseSegmenter cutter = new PulseSegmenter(recording.format(), segmenter, analysis, discard);
    SampleBlock block = new SampleBlock();
    long deadline = System.nanoTime() + MAX_NANOS;
    long index = 0;
    long sequence = 0;
    try {
      while (analysis.pulses() < pulses && System.nanoTime() < deadline) {
        block.clear();
        int n = block.capacity();
        recording.fill(block.command, block.response, 0, n);
        block.length = n;
        block.firstSampleIndex = index;
        index += n;
        cutter.onBlock(block, sequence++, true);
      }
    } finally {
      try {
        log.close();
      } catch (IOException e) {
        // A null writer does not fail.
      }
    }
    return new Outcome(analysis.pulses(), analysis.accepted());
  }

  /**
   * The shipped healthy cell of the stream's mode at its rate and filter, pulsing as often as the
   * segmenter's windows allow.
   */
  private static Scenario scenarioFor(StreamFormat format, SegmenterOptions segmenter) {
    boolean cc = format.mode() == ClampMode.CURRENT_CLAMP;
    // Steps long enough for the healthy cell's transient to decay (τ 0.3 ms in VC, 9 ms in CC).
    double stepMs = cc ? 60 : 5;
    double periodMs = segmenter.baselineMs() + stepMs + segmenter.offWindowMs() + 5;
    double cutoff = format.filterCutoffHz();
    return ScenarioLoader.loadBuiltIn(
        cc ? "cc-steady-cell" : "steady-cell",
        Map.of(
            "sample_rate_hz", format.sampleRateHz(),
            "filter_cutoff_hz", cutoff,
            "step_width_ms", stepMs,
            "period_ms", periodMs,
            "first_onset_ms", Math.max(segmenter.baselineMs() + 5, 20.0)));
  }
}
