package tauwatch.bench;

import com.sun.management.GarbageCollectionNotificationInfo;
import java.io.IOException;
import java.io.PrintWriter;
import java.lang.management.GarbageCollectorMXBean;
import java.lang.management.ManagementFactory;
import java.lang.management.MemoryPoolMXBean;
import java.lang.management.MemoryType;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.stream.Stream;
import javax.management.Notification;
import javax.management.NotificationEmitter;
import javax.management.NotificationListener;
import javax.management.openmbean.CompositeData;
import tauwatch.monitor.EstimateSummary;
import tauwatch.monitor.Monitor;
import tauwatch.monitor.MonitorConfig;
import tauwatch.monitor.MonitorResult;
import tauwatch.monitor.PulseEstimators;
import tauwatch.monitor.live.LiveModel;
import tauwatch.sim.Scenario;
import tauwatch.sim.ScenarioLoader;
import tauwatch.sim.SimulatedRecording;
import tauwatch.sim.TestPulseProtocol;
import tauwatch.source.SimulatedSource;

/**
 * {@code tauwatch bench --stamina}: a simulated day of the shipped steady cell recorded faster than
 * real time with every log on, watched for growth: used heap after a forced GC at each simulated
 * hour, {@code params.csv} rows against the pulses sent, gap and overrun events, and GC pauses.
 *
 * <p>The session runs on its own threads with the listeners a {@code watch} session has that keep
 * history (the closing summary, the live view's LiveModel and its trend); this driver only polls
 * the counters.
 */
public final class StaminaRun {
  /** Allowed spread of the used heap after GC across the simulated hours. */
  static final double HEAP_FLAT_TOLERANCE = 0.05;

  private final PrintWriter out;
  private final Path workDir;
  private final double hours;

  public StaminaRun(PrintWriter out, Path workDir, double hours) {
    this.out = out;
    this.workDir = workDir;
    this.hours = hours;
  }

  /** One GC as the JVM reported it. */
  record Pause(String collector, String cause, long durationMs) {
    /** A collection this run asked for (one per simulated hour). */
    boolean forced() {
      return cause.equals("System.gc()");
    }
  }

  public boolean run() throws Exception {
    Scenario sc = ScenarioLoader.loadBuiltIn("steady-cell");
    double rate = sc.amplifier().sampleRateHz();
    double seconds = hours * 3600;
    SimulatedSource src = new SimulatedSource(new SimulatedRecording(sc, 24), false);
    MonitorConfig config = MonitorConfig.defaults();
    Monitor m = new Monitor(src, config, PulseEstimators.forFormat(src.format(), config), workDir);
    EstimateSummary summary = new EstimateSummary();
    SnapshotPublisher snapshots = new SnapshotPublisher(0);
    LiveModel view = new LiveModel(src.name(), src.format(), config.health());
    m.addListener(summary).addListener(view).addEventListener(view).addListener(snapshots);

    List<Pause> pauses = java.util.Collections.synchronizedList(new ArrayList<>());
    List<NotificationEmitter> emitters = new ArrayList<>();
    NotificationListener gcListener =
        (Notification n, Object handback) -> {
          if (GarbageCollectionNotificationInfo.GARBAGE_COLLECTION_NOTIFICATION.equals(
              n.getType())) {
            GarbageCollectionNotificationInfo i =
                GarbageCollectionNotificationInfo.from((CompositeData) n.getUserData());
            pauses.add(new Pause(i.getGcName(), i.getGcCause(), i.getGcInfo().getDuration()));
          }
        };
    for (GarbageCollectorMXBean gc : ManagementFactory.getGarbageCollectorMXBeans()) {
      if (gc instanceof NotificationEmitter e) {
        e.addNotificationListener(gcListener, null, null);
        emitters.add(e);
      }
    }

    long t0 = System.nanoTime();
    BackgroundSession t = new BackgroundSession(m, seconds, "stamina-monitor");
    Table heap =
        new Table(
            "Stamina: heap after a forced GC at each simulated hour",
            "hour",
            "wall s",
            "pulses so far",
            "used heap MB",
            "old gen MB");
    List<Double> used = new ArrayList<>();
    long hourSamples = Math.round(3600 * rate);
    int hour = 1;
    while (t.isAlive()) {
      t.join(20);
      long samples = m.counters() == null ? 0 : m.counters().samplesReceived();
      if (samples >= hour * hourSamples && hour <= Math.floor(hours)) {
        System.gc();
        double mb = ManagementFactory.getMemoryMXBean().getHeapMemoryUsage().getUsed() / 1e6;
        used.add(mb);
        SnapshotPublisher.Snapshot s = snapshots.latest.get();
        heap.row(
            Integer.toString(hour),
            SpeedBench.f1((System.nanoTime() - t0) * 1e-9),
            Long.toString(s == null ? 0 : s.pulse()),
            SpeedBench.f2(mb),
            SpeedBench.f2(oldGenAfterGcMb()));
        hour++;
      }
    }
    double wall = (System.nanoTime() - t0) * 1e-9;
    // GC notifications arrive asynchronously: wait (briefly) for the last forced GC's, so that the
    // count below is of the GCs this run forced, not of those whose news happened to be in.
    long deadline = System.nanoTime() + 2_000_000_000L;
    while (forcedPausesSeen(pauses) < used.size() && System.nanoTime() < deadline) {
      Thread.sleep(10);
    }
    for (NotificationEmitter e : emitters) {
      e.removeNotificationListener(gcListener);
    }
    MonitorResult r = t.await("stamina session");
    heap.print(out);

    long rows = ChainReplay.dataRows(r.sessionDir().resolve("params.csv"));
    long expected = expectedPulses(sc.protocol(), seconds);
    long[] gapOverrun = gapAndOverrunEvents(r.sessionDir().resolve("events.csv"));
    double lo = used.stream().mapToDouble(Double::doubleValue).min().orElse(Double.NaN);
    double hi = used.stream().mapToDouble(Double::doubleValue).max().orElse(Double.NaN);
    // The first hour includes class loading and JIT structures settling on the heap: flatness
    // is judged from hour 2 on when there are at least 3 hours.
    List<Double> settled = used.size() >= 3 ? used.subList(1, used.size()) : used;
    double sLo = settled.stream().mapToDouble(Double::doubleValue).min().orElse(Double.NaN);
    double sHi = settled.stream().mapToDouble(Double::doubleValue).max().orElse(Double.NaN);
    boolean flat = (sHi - sLo) <= HEAP_FLAT_TOLERANCE * sLo;

    List<Long> young = new ArrayList<>();
    long youngMax = 0;
    long youngCount = 0;
    long youngTotal = 0;
    long explicit = 0;
    long otherMax = 0;
    long otherCount = 0;
    synchronized (pauses) {
      for (Pause p : pauses) {
        if (p.forced()) {
          explicit++;
        } else if (p.collector().contains("Young")) {
          youngCount++;
          young.add(p.durationMs());
          youngTotal += p.durationMs();
          youngMax = Math.max(youngMax, p.durationMs());
        } else {
          otherCount++;
          otherMax = Math.max(otherMax, p.durationMs());
        }
      }
    }
    boolean rowsOk = rows == r.pulses() && rows == expected;
    boolean streamOk = gapOverrun[0] == 0 && gapOverrun[1] == 0 && r.overrunSamples() == 0;
    new Table(
            String.format(
                Locale.ROOT,
                "Stamina: %.0f simulated hours of %s (2 ch at %.0f kHz) with logs on",
                hours,
                sc.name(),
                rate / 1e3),
            "figure",
            "value",
            "check")
        .row("wall time", SpeedBench.f1(wall) + " s", "")
        .row(
            "speed",
            SpeedBench.f0(seconds / wall)
                + "× real time, "
                + SpeedBench.f1(2 * r.samples() / wall / 1e6)
                + " M samples/s (2 ch)",
            "")
        .row("samples per channel", Long.toString(r.samples()), "")
        .row(
            "params.csv rows / pulses analysed / pulses sent",
            rows + " / " + r.pulses() + " / " + expected,
            rowsOk ? "equal" : "DIFFER")
        .row("accepted pulses", Long.toString(r.accepted()), "")
        .row(
            "gap events / overrun events / overrun samples",
            gapOverrun[0] + " / " + gapOverrun[1] + " / " + r.overrunSamples(),
            streamOk ? "none" : "SOME")
        .row(
            "used heap after GC, hours 1–" + used.size(),
            SpeedBench.f2(lo) + " – " + SpeedBench.f2(hi) + " MB",
            "")
        .row(
            "spread from hour " + (used.size() >= 3 ? 2 : 1),
            SpeedBench.f2(sLo)
                + " – "
                + SpeedBench.f2(sHi)
                + " MB ("
                + SpeedBench.f1(100 * (sHi - sLo) / sLo)
                + " %)",
            flat ? "flat (≤ 5 %)" : "GROWS")
        .row(
            "young GC pauses: count, total, median, p99, max (ms, JMX whole-ms resolution)",
            youngCount
                + ", "
                + youngTotal
                + ", "
                + pct(young, 0.5)
                + ", "
                + pct(young, 0.99)
                + ", "
                + youngMax,
            "")
        .row("other GC pauses (not forced): count, max", otherCount + ", " + otherMax + " ms", "")
        .row("forced GCs (one per hour, by this run)", Long.toString(explicit), "")
        .row("summary values kept (bounded)", Integer.toString(summary.retained()), "")
        .row(
            "view trend rows held (ring of " + view.trends().capacity() + ")",
            Long.toString(Math.min(view.trends().rowCount(), view.trends().capacity())),
            "")
        .print(out);
    return rowsOk && streamOk && flat;
  }

  private static long pct(List<Long> v, double q) {
    if (v.isEmpty()) {
      return 0;
    }
    List<Long> s = new ArrayList<>(v);
    java.util.Collections.sort(s);
    return s.get((int) Math.min(s.size() - 1, Math.floor(q * s.size())));
  }

  private static double oldGenAfterGcMb() {
    for (MemoryPoolMXBean p : ManagementFactory.getMemoryPoolMXBeans()) {
      if (p.getType() == MemoryType.HEAP
          && p.getName().contains("Old")
          && p.getCollectionUsage() != null) {
        return p.getCollectionUsage().getUsed() / 1e6;
      }
    }
    return Double.NaN;
  }

  /** Pulses whose window (step + 20 ms off window) ends within the stream. */
  private static long forcedPausesSeen(List<Pause> pauses) {
    synchronized (pauses) {
      return pauses.stream().filter(Pause::forced).count();
    }
  }

  static long expectedPulses(TestPulseProtocol p, double seconds) {
    double lastStartMs = seconds * 1e3 - p.stepWidthMs() - 20.0;
    return lastStartMs < p.firstOnsetMs()
        ? 0
        : (long) Math.floor((lastStartMs - p.firstOnsetMs()) / p.periodMs()) + 1;
  }

  /** {gap rows, overrun rows} of an events.csv. */
  private static long[] gapAndOverrunEvents(Path events) throws IOException {
    long[] n = new long[2];
    try (Stream<String> lines = Files.lines(events)) {
      lines.forEach(
          l -> {
            String[] f = l.split(",", 4);
            if (f.length > 2 && f[2].equals("gap")) {
              n[0]++;
            } else if (f.length > 2 && f[2].equals("overrun")) {
              n[1]++;
            }
          });
    }
    return n;
  }
}
