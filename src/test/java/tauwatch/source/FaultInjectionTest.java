package tauwatch.source;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import tauwatch.event.EventKind;
import tauwatch.event.MonitorEvent;
import tauwatch.fit.Parameter;
import tauwatch.monitor.MonitorResult;
import tauwatch.sim.serve.FaultKind;
import tauwatch.stream.StreamCounters;
import tauwatch.wire.DeviceProfile;
import tauwatch.wire.DeviceProfileLoader;

/**
 * Each fault the serving simulator injects reaches the monitor as the events and states it should,
 * and the monitor carries on. Truth for the estimates: the steady cell's Ra 10 MΩ, Rin 300 MΩ, Cm
 * 30 pF (VC formulas of CHECKS.md).
 */
class FaultInjectionTest {
  private static final int SAMPLES_PER_FRAME = 50;

  @TempDir Path dir;

  @Test
  void corruptDroppedTruncatedAndGarbledFramesAreCountedAndNoneOfTheirSamplesIsAnalysed()
      throws Exception {
    DeviceProfile profile = DeviceProfileLoader.loadBuiltIn("simulator");
    List<FaultKind.Fault> faults =
        List.of(
            FaultKind.parse("corrupt:0.01"),
            FaultKind.parse("drop:0.01"),
            FaultKind.parse("garbage:0.01"),
            FaultKind.parse("truncate:0.01"));
    LiveBench.Watching w;
    MonitorResult r;
    StreamCounters c;
    try (LiveBench bench = new LiveBench("steady-cell", 1, faults, profile, 0)) {
      w =
          new LiveBench.Watching(
              DeviceStreamSource.tcp("127.0.0.1", bench.port(), profile, null), dir, null);
      bench.serveWhenConnected(3.0).awaitServed();
      Thread.sleep(200);
      r = w.stopAndWait();
      c = w.monitor.counters();
      long damaged = bench.daq.framesCorrupted() + bench.daq.framesTruncated();
      long lost = damaged + bench.daq.framesDropped();
      System.out.printf(
          "faults: sent %d, corrupted %d, truncated %d, dropped %d; monitor: corrupt %d, resyncs"
              + " %d, dropped %d, gap samples %d, pulses %d accepted %d%n",
          bench.daq.framesSent(),
          bench.daq.framesCorrupted(),
          bench.daq.framesTruncated(),
          bench.daq.framesDropped(),
          c.corruptFrames(),
          c.resyncs(),
          c.droppedFrames(),
          c.gapSamples(),
          r.pulses(),
          r.accepted());
      assertTrue(damaged >= 10 && bench.daq.framesDropped() >= 10, "faults were injected");
      // Every damaged frame is counted (the last one may still be waiting for its end).
      assertTrue(c.corruptFrames() >= damaged - 1, c.corruptFrames() + " < " + damaged);
      assertTrue(
          c.droppedFrames() >= lost - 1 && c.droppedFrames() <= lost, "" + c.droppedFrames());
    }
    assertTrue(r.complete(), r.status());
    // No sample of a damaged frame reached the ring: what arrived is whole good frames, and what
    // is missing is exactly the lost frames' samples.
    assertEquals(SAMPLES_PER_FRAME * c.framesReceived(), c.samplesReceived());
    assertEquals(SAMPLES_PER_FRAME * c.droppedFrames(), c.gapSamples());
    // Never silent, never a flood: resync events carry counts, at most about one per second.
    long resyncEvents = w.count(EventKind.RESYNC);
    assertTrue(resyncEvents >= 1 && resyncEvents <= 5, "resync events: " + resyncEvents);
    long corruptReported = 0;
    synchronized (w.raised) {
      for (MonitorEvent e : w.raised) {
        if (e.kind() == EventKind.RESYNC) {
          corruptReported += Long.parseLong(e.detail().substring(0, e.detail().indexOf(' ')));
        }
      }
    }
    assertEquals(c.corruptFrames(), corruptReported, "every corrupt frame is in the event log");
    assertTrue(w.count(EventKind.GAP) >= c.gaps() - 1 && c.gaps() > 0);
    assertTrue(LiveBench.relativeError(w.summary, Parameter.ACCESS_RESISTANCE, 10) < 0.05);
    assertTrue(LiveBench.relativeError(w.summary, Parameter.INPUT_RESISTANCE, 300) < 0.05);
  }

  @Test
  void linkDropsGiveSignalLostWithinASecondAnExactGapAndRecovery() throws Exception {
    DeviceProfile profile = DeviceProfileLoader.loadBuiltIn("simulator");
    LiveBench.Watching w;
    long dropNanos;
    try (LiveBench bench =
        new LiveBench("steady-cell", 1, List.of(FaultKind.parse("disconnect:1.0")), profile, 0)) {
      w =
          new LiveBench.Watching(
              DeviceStreamSource.tcp("127.0.0.1", bench.port(), profile, null), dir, null);
      long start = System.nanoTime();
      // 7 s: the 1.5 s outage starts at 1 s; the rest leaves the reconnect back-off (up to 2 s)
      // room to succeed even on a loaded machine.
      bench.serveWhenConnected(7.0);
      dropNanos = start + 1_000_000_000L;
      bench.awaitServed();
      w.stopAndWait();
      assertTrue(bench.daq.linkDrops() >= 1);
    }
    long lost = w.firstNanos(EventKind.SIGNAL_LOST, dropNanos - 200_000_000L);
    long restored = w.firstNanos(EventKind.SIGNAL_RESTORED, lost);
    System.out.printf(
        "disconnect: signal lost %.0f ms after the drop, restored %.0f ms after the outage%n",
        (lost - dropNanos) / 1e6, (restored - dropNanos - 1.5e9) / 1e6);
    // The 1 s requirement is measured and printed; the bound allows for a loaded machine.
    assertTrue(lost > 0 && lost - dropNanos < 5_000_000_000L, "no signal after the drop");
    assertTrue(restored > 0, "signal restored after the outage");
    // The device kept counting while away, so the gap is the outage's length in samples.
    long gap =
        w.raised.stream()
            .filter(e -> e.kind() == EventKind.GAP)
            .mapToLong(e -> Long.parseLong(e.detail().substring(0, e.detail().indexOf(' '))))
            .findFirst()
            .orElse(-1);
    assertTrue(gap >= 70_000 && gap <= 90_000, "gap of " + gap + " samples for a 1.5 s outage");
    assertTrue(w.summary.accepted() >= 2);
  }

  @Test
  void noiseBurstsLeaveTheStreamWholeAndTheMediansWithinTolerance() throws Exception {
    DeviceProfile profile = DeviceProfileLoader.loadBuiltIn("simulator");
    LiveBench.Watching w;
    MonitorResult r;
    try (LiveBench bench =
        new LiveBench("steady-cell", 1, List.of(FaultKind.parse("noise:4")), profile, 0)) {
      w =
          new LiveBench.Watching(
              DeviceStreamSource.tcp("127.0.0.1", bench.port(), profile, null), dir, null);
      bench.serveWhenConnected(3.0).awaitServed();
      Thread.sleep(100);
      r = w.stopAndWait();
      System.out.printf(
          "noise: %d bursts, %d pulses, %d accepted%n",
          bench.daq.noiseBursts(), r.pulses(), r.accepted());
      assertTrue(bench.daq.noiseBursts() >= 5);
    }
    assertEquals(0, w.monitor.counters().corruptFrames());
    assertEquals(0, w.monitor.counters().gapSamples());
    assertTrue(LiveBench.relativeError(w.summary, Parameter.ACCESS_RESISTANCE, 10) < 0.05);
    assertTrue(LiveBench.relativeError(w.summary, Parameter.INPUT_RESISTANCE, 300) < 0.05);
  }

  @Test
  void aStreamThatContradictsTheProfileGivesMismatchEventsAndNoNumbers() throws Exception {
    DeviceProfile served = DeviceProfileLoader.loadBuiltIn("simulator");
    // The monitor is told 20 kHz while the frames state 50 kHz: every τ would be 2.5× off.
    DeviceProfile told =
        DeviceProfileLoader.parse(
            "wrong-rate.toml",
            served
                .text()
                .replace("sample_rate_hz = 50000.0", "sample_rate_hz = 20000.0")
                .replace("filter_cutoff_hz = 10000.0", "filter_cutoff_hz = 5000.0"));
    LiveBench.Watching w;
    try (LiveBench bench = new LiveBench("steady-cell", 1, List.of(), served, 0)) {
      w =
          new LiveBench.Watching(
              DeviceStreamSource.tcp("127.0.0.1", bench.port(), told, null), dir, null);
      bench.serveWhenConnected(2.2).awaitServed();
      w.stopAndWait();
    }
    long mismatches = w.count(EventKind.STREAM_MISMATCH);
    assertTrue(mismatches >= 1 && mismatches <= 4, "stream_mismatch events: " + mismatches);
    String detail =
        w.raised.stream()
            .filter(e -> e.kind() == EventKind.STREAM_MISMATCH)
            .findFirst()
            .orElseThrow()
            .detail();
    assertTrue(detail.contains("state 50000") && detail.contains("says 20000"), detail);
    assertEquals(0, w.monitor.counters().samplesReceived(), "no sample of a contradicting frame");
    assertEquals(0, w.summary.pulses());
    assertTrue(w.count(EventKind.SIGNAL_LOST) >= 1, "no good frames: no signal");
  }
}
