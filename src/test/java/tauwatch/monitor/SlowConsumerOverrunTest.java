package tauwatch.monitor;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import tauwatch.event.EventKind;
import tauwatch.event.MonitorEvent;
import tauwatch.event.StreamClock;
import tauwatch.health.HealthCriteria;
import tauwatch.health.HealthMonitor;
import tauwatch.stream.ClampMode;
import tauwatch.stream.SampleBlockHandler;
import tauwatch.stream.SampleRing;
import tauwatch.stream.SampleWriter;
import tauwatch.stream.StreamCounters;
import tauwatch.stream.StreamFormat;

/**
 * A consumer that falls behind a live source loses samples, and the loss is never silent: it is
 * counted, and it reaches the event log in stream order as an {@code overrun} whose sample count
 * equals the counter's. Functional, not timed: the consumer is held on a latch while the source
 * writes, so the number of samples that fit is fixed by the ring's size (DESIGN.md: "Overload is
 * never silent").
 */
class SlowConsumerOverrunTest {
  private static final double RATE = 50_000;
  private static final int SLOTS = 8;
  private static final int BLOCK = 256;

  @Test
  void aStalledConsumerYieldsOneOverrunEventCountingEveryLostSample() throws Exception {
    StreamFormat format = new StreamFormat(RATE, ClampMode.VOLTAGE_CLAMP, 10_000, 0, "slow");
    StreamClock clock = new StreamClock(0);
    List<MonitorEvent> events = Collections.synchronizedList(new ArrayList<>());
    HealthMonitor health = new HealthMonitor(HealthCriteria.defaults(), events::add, clock);
    StreamWatch watch = new StreamWatch(format, clock, health, events::add);
    CountDownLatch release = new CountDownLatch(1);
    boolean[] held = {false};
    SampleBlockHandler stalled =
        (block, sequence, endOfBatch) -> {
          if (!held[0]) {
            held[0] = true;
            try {
              // Bounded: a broken test must not hang the build.
              release.await(20, TimeUnit.SECONDS);
            } catch (InterruptedException e) {
              Thread.currentThread().interrupt();
            }
          }
        };
    SampleRing ring = new SampleRing(SLOTS, BLOCK, true, watch, stalled);
    ring.start();
    SampleWriter w = ring.writer();

    long whileStalled = 100L * BLOCK;
    for (long i = 0; i < whileStalled; i++) {
      w.put(-70, 0.01 * (i % 100));
    }
    release.countDown();
    // Let the consumer wake and drain before writing on, so that only the stall loses samples
    // (bounded wait; the counts below do not depend on how long it takes).
    long deadline = System.nanoTime() + 20_000_000_000L;
    while (ring.remainingCapacity() < SLOTS && System.nanoTime() < deadline) {
      Thread.sleep(1);
    }
    long after = 4L * BLOCK;
    for (long i = 0; i < after; i++) {
      w.put(-70, 0);
    }
    w.endOfStream();
    assertTrue(ring.awaitDrainedAndStop(20, TimeUnit.SECONDS), "the ring drained");

    StreamCounters c = ring.counters();
    // The stalled consumer holds its slot, so exactly SLOTS blocks fit while it is stalled.
    long fitted = (long) SLOTS * BLOCK;
    assertEquals(whileStalled - fitted, c.overrunSamples(), "samples counted as overrun");
    assertEquals(1, c.overrunEpisodes(), "one overrun episode");
    assertEquals(fitted + after, c.samplesReceived(), "samples that reached the ring");
    assertEquals(
        whileStalled + after,
        c.samplesReceived() + c.overrunSamples(),
        "every sample either arrived or was counted lost");

    List<MonitorEvent> overruns = new ArrayList<>();
    synchronized (events) {
      for (MonitorEvent e : events) {
        if (e.kind() == EventKind.OVERRUN) {
          overruns.add(e);
        }
      }
    }
    assertEquals(1, overruns.size(), "one overrun event: " + overruns);
    MonitorEvent e = overruns.get(0);
    assertEquals(
        c.overrunSamples(),
        Long.parseLong(e.detail().split(" ", 2)[0]),
        "the event names the lost samples: " + e.detail());
    // Stream indices skip the lost samples, so the event sits at the first sample after them.
    assertEquals(whileStalled / RATE, e.streamTimeS(), 1e-12, "event time");
  }
}
