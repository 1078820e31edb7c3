package tauwatch.stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;

class SampleRingTest {

  @Test
  void deliversEverySampleInOrderWithStreamIndices() throws Exception {
    long[] next = {0};
    long[] bad = {0};
    SampleBlockHandler h =
        (b, seq, end) -> {
          for (int i = 0; i < b.length; i++) {
            if (b.firstSampleIndex + i != next[0] || b.command[i] != next[0]) {
              bad[0]++;
            }
            next[0]++;
          }
        };
    SampleRing ring = new SampleRing(64, 32, false, h);
    ring.start();
    SampleWriter w = ring.writer();
    for (int i = 0; i < 100_000; i++) {
      w.put(i, -i);
      if (i % 1000 == 999) {
        w.flush();
      }
    }
    w.endOfStream();
    assertTrue(ring.awaitDrainedAndStop(10, TimeUnit.SECONDS));
    assertEquals(100_000, next[0]);
    assertEquals(0, bad[0]);
    assertEquals(100_000, ring.counters().samplesReceived());
  }

  @Test
  void aFullRingDropsCountsAndReportsTheOverrunInBand() throws Exception {
    CountDownLatch release = new CountDownLatch(1);
    List<Long> lost = new ArrayList<>();
    List<Boolean> overrunFlag = new ArrayList<>();
    long[] received = {0};
    SampleBlockHandler slow =
        (b, seq, end) -> {
          try {
            release.await();
          } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
          }
          if (b.lostBeforeSamples > 0) {
            lost.add(b.lostBeforeSamples);
            overrunFlag.add(b.hasFlag(SampleBlock.FLAG_OVERRUN));
          }
          received[0] += b.length;
        };
    SampleRing ring = new SampleRing(8, 16, true, slow);
    ring.start();
    SampleWriter w = ring.writer();
    for (int i = 0; i < 1000; i++) {
      w.put(i, i);
    }
    release.countDown();
    Thread.sleep(50);
    for (int i = 0; i < 16; i++) {
      w.put(i, i);
    }
    w.endOfStream();
    assertTrue(ring.awaitDrainedAndStop(10, TimeUnit.SECONDS));
    StreamCounters c = ring.counters();
    assertEquals(1, c.overrunEpisodes());
    assertEquals(1016 - received[0], c.overrunSamples(), "every sample is delivered or counted");
    assertEquals(List.of(c.overrunSamples()), lost);
    assertEquals(List.of(true), overrunFlag);
  }

  @Test
  void gapsAndSignalNewsArriveInStreamOrder() throws Exception {
    List<String> news = new ArrayList<>();
    SampleBlockHandler h =
        (b, seq, end) -> {
          if (b.lostBeforeSamples > 0) {
            news.add("lost " + b.lostBeforeSamples + " before " + b.firstSampleIndex);
          }
          if (b.hasFlag(SampleBlock.FLAG_SIGNAL_LOST)) {
            news.add("lost signal at " + b.firstSampleIndex);
          }
          if (b.hasFlag(SampleBlock.FLAG_SIGNAL_RESTORED)) {
            news.add("restored at " + b.firstSampleIndex);
          }
        };
    SampleRing ring = new SampleRing(16, 16, false, h);
    ring.start();
    SampleWriter w = ring.writer();
    for (int i = 0; i < 10; i++) {
      w.put(i, i);
    }
    w.gap(5);
    w.put(0, 0);
    w.signalLost();
    w.signalRestored();
    w.put(0, 0);
    w.endOfStream();
    assertTrue(ring.awaitDrainedAndStop(10, TimeUnit.SECONDS));
    assertEquals(List.of("lost 5 before 15", "lost signal at 16", "restored at 16"), news);
    assertEquals(1, ring.counters().gaps());
    assertEquals(5, ring.counters().gapSamples());
  }

  @Test
  void bulkPutsGiveTheSameStreamAsSinglePutsAcrossBlockBoundaries() throws Exception {
    List<double[]> seen = new ArrayList<>();
    SampleBlockHandler h =
        (b, seq, end) -> {
          for (int i = 0; i < b.length; i++) {
            seen.add(
                new double[] {
                  b.firstSampleIndex + i, b.command[i], b.response[i], b.sweepStart[i]
                });
          }
        };
    SampleRing ring = new SampleRing(64, 32, false, h);
    ring.start();
    SampleWriter w = ring.writer();
    double[] cmd = new double[50];
    double[] resp = new double[50];
    byte[] sweep = new byte[50];
    int k = 0;
    long expectedSweeps = 0;
    for (int frame = 0; frame < 40; frame++) {
      // Frames of 1..50 samples, some with sweep starts, straddling the 32-sample blocks.
      int n = 1 + (frame * 17) % 50;
      for (int i = 0; i < n; i++, k++) {
        cmd[i] = k;
        resp[i] = -k;
        sweep[i] = (byte) (k % 23 == 0 ? 1 : 0);
        if (frame % 2 == 0 && k % 23 == 0) {
          expectedSweeps++;
        }
      }
      w.putAll(cmd, resp, frame % 2 == 0 ? sweep : null, 0, n);
    }
    w.endOfStream();
    assertTrue(ring.awaitDrainedAndStop(10, TimeUnit.SECONDS));
    assertEquals(k, seen.size());
    for (int i = 0; i < k; i++) {
      double[] row = seen.get(i);
      assertEquals(i, row[0]);
      assertEquals(i, row[1]);
      assertEquals(-i, row[2]);
    }
    long sweeps = seen.stream().filter(r -> r[3] != 0).count();
    assertEquals(expectedSweeps, sweeps, "sweep starts only where the even frames had them");
    assertEquals(k, ring.counters().samplesReceived());
  }

  @Test
  void theConsumerHandsSlotsBackBeforeItsBatchEnds() throws Exception {
    // The ring is filled before the consumer starts, so its first batch is the whole ring; the
    // handler then stalls inside that batch until the producer has published more blocks, which
    // it can only do if handled slots were released before the batch's end.
    int slots = 32;
    CountDownLatch producerGotSpace = new CountDownLatch(1);
    boolean[] stalledAndReleased = new boolean[1];
    SampleBlockHandler h =
        (b, seq, end) -> {
          if (seq == SampleRing.RELEASE_EVERY_BLOCKS + 4) {
            try {
              stalledAndReleased[0] = producerGotSpace.await(5, TimeUnit.SECONDS);
            } catch (InterruptedException e) {
              Thread.currentThread().interrupt();
            }
          }
        };
    SampleRing ring = new SampleRing(slots, 4, false, h);
    SampleWriter w = ring.writer();
    CountDownLatch filled = new CountDownLatch(1);
    CountDownLatch consumerStarted = new CountDownLatch(1);
    Thread producer = // one thread for every write: the ring has a single producer
        new Thread(
            () -> {
              for (int i = 0; i < slots * 4; i++) {
                w.put(i, -i);
              }
              filled.countDown();
              try {
                consumerStarted.await();
              } catch (InterruptedException e) {
                return;
              }
              for (int i = 0; i < 5 * 4; i++) {
                w.put(i, -i);
              }
              producerGotSpace.countDown();
              w.endOfStream();
            });
    producer.start();
    assertTrue(filled.await(5, TimeUnit.SECONDS));
    ring.start();
    consumerStarted.countDown();
    assertTrue(ring.awaitDrainedAndStop(10, TimeUnit.SECONDS));
    producer.join(5000);
    assertTrue(stalledAndReleased[0], "the producer wrote on while the batch was still running");
    assertEquals(slots + 5 + 1, ring.counters().blocksPublished());
  }
}
