package tauwatch.bench;

import com.sun.management.ThreadMXBean;
import java.io.PrintWriter;
import java.lang.management.ManagementFactory;
import java.nio.file.Path;
import java.util.Locale;
import java.util.concurrent.atomic.AtomicLong;
import org.HdrHistogram.Histogram;
import tauwatch.event.EventKind;
import tauwatch.event.MonitorEvent;
import tauwatch.monitor.Monitor;
import tauwatch.monitor.MonitorConfig;
import tauwatch.monitor.MonitorResult;
import tauwatch.monitor.PulseEstimators;
import tauwatch.monitor.live.LiveModel;
import tauwatch.pulse.PulseSegmenter;
import tauwatch.pulse.SegmenterOptions;
import tauwatch.sim.Scenario;
import tauwatch.sim.SimulatedRecording;
import tauwatch.source.SimulatedSource;
import tauwatch.stream.SampleRing;
import tauwatch.stream.SampleWriter;

/**
 * The live half of {@code tauwatch bench}: latency under real-time pacing, allocation of the sample
 * path and of the whole process, and headroom (the highest paced rate with zero overruns, then a
 * deliberately slow consumer whose overruns must be counted and evented).
 *
 * <p>Single-threaded driver; each run is a real {@link Monitor} session on its own threads.
 */
public final class LiveRuns {
  private static final ThreadMXBean THREADS = (ThreadMXBean) ManagementFactory.getThreadMXBean();

  private final PrintWriter out;
  private final Path workDir;
  private final double latencySeconds;
  private final double headroomSeconds;

  public LiveRuns(PrintWriter out, Path workDir, double latencySeconds, double headroomSeconds) {
    this.out = out;
    this.workDir = workDir;
    this.latencySeconds = latencySeconds;
    this.headroomSeconds = headroomSeconds;
  }

  /** Runs latency, allocation and headroom; returns false when a target check fails. */
  public boolean run() throws Exception {
    return run(java.util.Set.of("latency", "headroom"));
  }

  /** Runs the named sections ({@code latency} with allocation, {@code headroom}). */
  public boolean run(java.util.Set<String> sections) throws Exception {
    boolean ok = true;
    if (sections.contains("latency")) {
      ok &= latencyAndAllocation();
      ok &= samplePathAllocation();
    }
    if (sections.contains("headroom")) {
      ok &= headroom();
    }
    return ok;
  }

  /** One paced session; the figures a run leaves. */
  record Session(
      MonitorResult result,
      SnapshotPublisher publisher,
      double wallS,
      long overrunEvents,
      long overrunEventSamples,
      long sourceBytes,
      long analysisBytes,
      long processBytes,
      long windowSamples,
      long windowPulses,
      double windowS) {}

  /**
   * Runs a paced simulated session of {@code seconds}; allocation is measured between 30 % and 90 %
   * of the run (after warm-up, before the end).
   */
  Session paced(Scenario sc, double seconds, long slowListenerMs, String tag) throws Exception {
    // The sections before leave their captures and estimates as garbage: a watch session starts
    // on a clean heap, and so does each measured one.
    System.gc();
    SimulatedSource src = new SimulatedSource(new SimulatedRecording(sc, 17), true);
    MonitorConfig config = MonitorConfig.defaults();
    Monitor m =
        new Monitor(
            src, config, PulseEstimators.forFormat(src.format(), config), workDir.resolve(tag));
    // The live view's model publishes its snapshot first; the latency is taken after it.
    LiveModel view = new LiveModel(src.name(), src.format(), config.health());
    m.addListener(view).addEventListener(view);
    SnapshotPublisher pub = new SnapshotPublisher(5);
    m.addListener(pub);
    if (slowListenerMs > 0) {
      m.addListener(
          (e, h) -> {
            try {
              Thread.sleep(slowListenerMs);
            } catch (InterruptedException ex) {
              Thread.currentThread().interrupt();
            }
          });
    }
    AtomicLong overrunEvents = new AtomicLong();
    AtomicLong overrunEventSamples = new AtomicLong();
    m.addEventListener(
        (MonitorEvent e) -> {
          if (e.kind() == EventKind.OVERRUN) {
            overrunEvents.incrementAndGet();
            overrunEventSamples.addAndGet(Long.parseLong(e.detail().split(" ", 2)[0]));
          }
        });
    long t0 = System.nanoTime();
    BackgroundSession t = new BackgroundSession(m, seconds, "bench-monitor");
    Thread.sleep((long) (seconds * 300));
    long[] a0 = allocation(pub);
    long s0 = samples(m);
    long p0 = pulses(pub);
    long w0 = System.nanoTime();
    Thread.sleep((long) (seconds * 600));
    long[] a1 = allocation(pub);
    long s1 = samples(m);
    long p1 = pulses(pub);
    long w1 = System.nanoTime();
    MonitorResult result = t.await("bench session");
    double wall = (System.nanoTime() - t0) * 1e-9;
    return new Session(
        result,
        pub,
        wall,
        overrunEvents.get(),
        overrunEventSamples.get(),
        a1[0] - a0[0],
        a1[1] - a0[1],
        a1[2] - a0[2],
        s1 - s0,
        p1 - p0,
        (w1 - w0) * 1e-9);
  }

  private static long samples(Monitor m) {
    return m.counters() == null ? 0 : m.counters().samplesReceived();
  }

  private static long pulses(SnapshotPublisher p) {
    SnapshotPublisher.Snapshot s = p.latest.get();
    return s == null ? 0 : s.pulse();
  }

  /** {source thread, analysis thread, all live threads} allocated bytes so far. */
  private static long[] allocation(SnapshotPublisher pub) {
    long[] ids = THREADS.getAllThreadIds();
    long[] bytes = THREADS.getThreadAllocatedBytes(ids);
    long source = 0;
    long analysis = 0;
    long all = 0;
    for (int i = 0; i < ids.length; i++) {
      if (bytes[i] < 0) {
        continue;
      }
      all += bytes[i];
      if (ids[i] == pub.analysisThreadId) {
        analysis = bytes[i];
      }
      java.lang.management.ThreadInfo info = THREADS.getThreadInfo(ids[i]);
      if (info != null && "tauwatch-source".equals(info.getThreadName())) {
        source = bytes[i];
      }
    }
    return new long[] {source, analysis, all};
  }

  boolean latencyAndAllocation() throws Exception {
    // 25 pulses/s (5 ms steps every 40 ms) so that a minute gives p99.9 over > 1000 pulses.
    Scenario sc = BenchScenarios.load("steady-cell", 50_000, 40, 5);
    Session s = paced(sc, latencySeconds, 0, "latency");
    Histogram h = s.publisher().latencyNs;
    double p99 = h.getValueAtPercentile(99) / 1e3;
    new Table(
            String.format(
                Locale.ROOT,
                "Latency: last sample of a pulse at the source → its estimate published (the view's"
                    + " LiveModel snapshot and a stand-in snapshot), paced simulator 2 ch at 50 kHz, %.0f s, %d pulses"
                    + " timed",
                latencySeconds,
                h.getTotalCount()),
            "p50 µs",
            "p99 µs",
            "p99.9 µs",
            "max µs",
            "overruns",
            "target p99 < 1000 µs")
        .row(
            f0(h.getValueAtPercentile(50) / 1e3),
            f0(p99),
            f0(h.getValueAtPercentile(99.9) / 1e3),
            f0(h.getMaxValue() / 1e3),
            Long.toString(s.result().overrunSamples()),
            p99 < 1000 ? "met" : "MISSED")
        .print(out);
    new Table(
            String.format(
                Locale.ROOT,
                "Allocation under live pacing (same run, per-thread allocation counters over %.0f s"
                    + " of steady state)",
                s.windowS()),
            "thread",
            "bytes/s",
            "per unit")
        .row(
            "source (simulator → ring)",
            f0(s.sourceBytes() / s.windowS()),
            String.format(
                Locale.ROOT, "%.4f bytes/sample", s.sourceBytes() / (double) s.windowSamples()))
        .row(
            "analysis (ring → segmenter → fit → health → LiveModel; rows to the log thread)",
            f0(s.analysisBytes() / s.windowS()),
            String.format(
                Locale.ROOT,
                "%.0f bytes/pulse (%d pulses)",
                s.analysisBytes() / (double) Math.max(1, s.windowPulses()),
                s.windowPulses()))
        .row("whole process (all live threads)", f0(s.processBytes() / s.windowS()), "")
        .print(out);
    return p99 < 1000 && s.result().overrunSamples() == 0;
  }

  /**
   * The per-sample path alone (ring writer, ring, segmenter; pulses cut but not fitted) over 10 M
   * samples after 5 M of warm-up, on both threads: expected 0 bytes per sample.
   */
  boolean samplePathAllocation() throws Exception {
    Scenario sc = BenchScenarios.load("steady-cell", 50_000, 0, 0);
    SimulatedRecording rec = new SimulatedRecording(sc, 2);
    int n = 1 << 20;
    double[] cmd = new double[n];
    double[] resp = new double[n];
    rec.fill(cmd, resp, 0, n);
    long[] pulses = {0};
    long[] consumer = {-1, -1};
    long warm = 5_000_000;
    long measured = 10_000_000;
    PulseSegmenter seg =
        new PulseSegmenter(rec.format(), SegmenterOptions.defaults(), w -> pulses[0]++, e -> {});
    SampleRing ring =
        new SampleRing(
            1024,
            256,
            false,
            seg,
            (b, q, end) -> {
              if (consumer[0] < 0 && b.firstSampleIndex >= warm) {
                consumer[0] = THREADS.getCurrentThreadAllocatedBytes();
              }
              if (b.hasFlag(tauwatch.stream.SampleBlock.FLAG_END_OF_STREAM)) {
                consumer[1] = THREADS.getCurrentThreadAllocatedBytes();
              }
            });
    ring.start();
    SampleWriter w = ring.writer();
    long producer0 = 0;
    for (long i = 0; i < warm + measured; i++) {
      if (i == warm) {
        producer0 = THREADS.getCurrentThreadAllocatedBytes();
      }
      int k = (int) (i & (n - 1));
      w.put(cmd[k], resp[k]);
      if ((i & 63) == 63) {
        w.flush();
      }
    }
    long producer = THREADS.getCurrentThreadAllocatedBytes() - producer0;
    w.endOfStream();
    ring.awaitDrainedAndStop(30, java.util.concurrent.TimeUnit.SECONDS);
    long cons = consumer[1] - consumer[0];
    new Table(
            String.format(
                Locale.ROOT,
                "Sample path allocation: %d M samples after %d M warm-up (%d pulses cut)",
                measured / 1_000_000,
                warm / 1_000_000,
                pulses[0]),
            "thread",
            "bytes allocated",
            "bytes/sample")
        .row("source (SampleWriter)", Long.toString(producer), f4(producer / (double) measured))
        .row("consumer (ring → PulseSegmenter)", Long.toString(cons), f4(cons / (double) measured))
        .print(out);
    // A JIT one-off of a few hundred bytes is not per-sample allocation (see
    // SamplePathAllocationTest); one byte per sample would be 10 MB.
    return producer == 0 && cons < 1024;
  }

  boolean headroom() throws Exception {
    Table t =
        new Table(
            String.format(
                Locale.ROOT,
                "Headroom: paced simulator (2 ch: command + response), %.0f s per rate, whole"
                    + " chain with logs and the view's LiveModel",
                headroomSeconds),
            "sample rate",
            "channel-samples/s",
            "achieved",
            "pulses",
            "overrun samples",
            "overrun events",
            "p99 latency µs");
    double best = 0;
    boolean ok = true;
    for (double rate : new double[] {50_000, 100_000, 200_000, 400_000, 800_000}) {
      Scenario sc = BenchScenarios.load("steady-cell", rate, 0, 0);
      Session s = paced(sc, headroomSeconds, 0, "headroom-" + (long) rate);
      double achieved = s.result().samples() / (double) headroomSeconds / rate;
      t.row(
          khz(rate),
          String.format(Locale.ROOT, "%.0f k", 2 * rate / 1e3),
          String.format(Locale.ROOT, "%.0f %%", 100 * Math.min(achieved, 9.99)),
          Long.toString(s.result().pulses()),
          Long.toString(s.result().overrunSamples()),
          Long.toString(s.overrunEvents()),
          f0(s.publisher().latencyNs.getValueAtPercentile(99) / 1e3));
      if (s.result().overrunSamples() == 0 && achieved > 0.98) {
        best = Math.max(best, 2 * rate);
      }
    }
    t.print(out);
    out.printf(
        Locale.ROOT,
        "highest rate held with zero overruns: %.0f k channel-samples/s (target ≥ 800 k = 4 ch ×"
            + " 200 kHz)%n",
        best / 1e3);
    ok &= best >= 800_000;

    // A consumer that cannot keep up: 1 s of sleep per pulse at 2 pulses/s, ring ≈ 2.6 s at 400
    // kHz. The losses must show as overrun events whose sample counts add up to the counter.
    Scenario sc = BenchScenarios.load("steady-cell", 400_000, 0, 0);
    Session slow = paced(sc, headroomSeconds, 1000, "slow-consumer");
    boolean counted =
        slow.result().overrunSamples() > 0
            && slow.overrunEvents() > 0
            && slow.overrunEventSamples() == slow.result().overrunSamples();
    new Table(
            "Slow consumer injected (a listener sleeping 1 s per pulse), 2 ch at 400 kHz paced",
            "samples received",
            "overrun samples (counter)",
            "overrun events",
            "samples in overrun events",
            "never silent")
        .row(
            Long.toString(slow.result().samples()),
            Long.toString(slow.result().overrunSamples()),
            Long.toString(slow.overrunEvents()),
            Long.toString(slow.overrunEventSamples()),
            counted ? "yes" : "NO")
        .print(out);
    return ok && counted;
  }

  static String khz(double rate) {
    return SpeedBench.khz(rate);
  }

  static String f0(double v) {
    return SpeedBench.f0(v);
  }

  static String f4(double v) {
    return String.format(Locale.ROOT, "%.4f", v);
  }
}
