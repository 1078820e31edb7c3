package tauwatch.wire;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import tauwatch.stream.SampleBlock;
import tauwatch.stream.SampleBlockHandler;
import tauwatch.stream.SampleRing;

class SampleFeedTest {

  /** Copies what reaches the ring's consumer. */
  static final class Received implements SampleBlockHandler {
    final List<Double> command = new ArrayList<>();
    final List<Double> response = new ArrayList<>();
    final List<Long> sweepStarts = new ArrayList<>();
    long lost;
    int lostFlags;
    int restoredFlags;

    @Override
    public void onBlock(SampleBlock b, long sequence, boolean endOfBatch) {
      lost += b.lostBeforeSamples;
      lostFlags += b.hasFlag(SampleBlock.FLAG_SIGNAL_LOST) ? 1 : 0;
      restoredFlags += b.hasFlag(SampleBlock.FLAG_SIGNAL_RESTORED) ? 1 : 0;
      for (int i = 0; i < b.length; i++) {
        command.add(b.command[i]);
        response.add(b.response[i]);
        if (b.sweepStart[i] != 0) {
          sweepStarts.add(b.firstSampleIndex + i);
        }
      }
    }
  }

  private static byte[] frame(DeviceProfile p, long seq, long first, double rate, double[][] raw) {
    FrameEncoder e = new FrameEncoder(p.sampleFormat(), p.channels(), raw.length);
    for (int s = 0; s < raw.length; s++) {
      for (int ch = 0; ch < p.channels(); ch++) {
        e.set(s, ch, raw[s][ch]);
      }
    }
    int n = e.finish(seq, first, rate);
    return java.util.Arrays.copyOf(e.buffer(), n);
  }

  private static Received run(DeviceProfile p, byte[]... frames) throws Exception {
    Received got = new Received();
    SampleRing ring = new SampleRing(64, 256, false, got);
    ring.start();
    SampleFeed feed = new SampleFeed(p, ring.writer());
    FrameDecoder d = new FrameDecoder(feed, ring.writer().counters());
    for (byte[] f : frames) {
      d.accept(f, 0, f.length);
    }
    lastFeed = feed;
    ring.writer().endOfStream();
    assertTrue(ring.awaitDrainedAndStop(5, TimeUnit.SECONDS));
    return got;
  }

  private static SampleFeed lastFeed;

  @Test
  void samplesAreScaledAndAJumpInTheSampleIndexBecomesAGapOfThatLength() throws Exception {
    DeviceProfile p = DeviceProfileLoader.loadBuiltIn("simulator");
    double[][] two = {{-12288, 1000}, {-12288, 2000}};
    Received got = run(p, frame(p, 0, 0, 50_000, two), frame(p, 3, 9, 50_000, two));
    assertEquals(4, got.command.size());
    assertEquals(-75.0, got.command.get(0), 1e-12);
    assertEquals(2000 * 2000.0 / 32768, got.response.get(1), 1e-12);
    assertEquals(7, got.lost); // samples 2..8 never arrived
    assertEquals(0, lastFeed.mismatchFrames());
  }

  @Test
  void framesThatContradictTheProfileAreDroppedAndCounted() throws Exception {
    DeviceProfile p = DeviceProfileLoader.loadBuiltIn("simulator");
    double[][] one = {{0, 10}};
    Received got = run(p, frame(p, 0, 0, 20_000, one), frame(p, 1, 1, 50_000, one));
    assertEquals(1, got.command.size());
    assertEquals(1, lastFeed.mismatchFrames());
    assertEquals(SampleFeed.Mismatch.SAMPLE_RATE, lastFeed.lastMismatch());

    DeviceProfile twelveBit = DeviceProfileLoader.loadBuiltIn("usb-board-text");
    // A 16-bit stream read with a 12-bit profile: counts beyond ±2048 cannot come from its ADC.
    SampleFeed feed = new SampleFeed(twelveBit, new SampleRing(8, 16, false).writer());
    DecodedFrame f = new DecodedFrame(8);
    f.channels = 2;
    f.samples = 1;
    f.firstSample = -1;
    f.sequence = -1;
    f.values[0] = 100;
    f.values[1] = 30000;
    feed.onFrame(f);
    assertEquals(SampleFeed.Mismatch.RANGE, feed.lastMismatch());
  }

  @Test
  void aRisingTriggerMarksEachSweepStart() throws Exception {
    DeviceProfile p = DeviceProfileLoader.loadBuiltIn("usb-board-16bit");
    double lo = 0;
    double hi = 16000; // above the 8192-count threshold
    double[][] raw = {
      {0, 0, hi}, {0, 0, hi}, {0, 0, lo}, {0, 0, lo}, {0, 0, hi}, {0, 0, hi}, {0, 0, lo}, {0, 0, hi}
    };
    Received got = run(p, frame(p, 0, 0, 20_000, raw));
    // A trigger already high at the first sample is not a start (its rise was not seen).
    assertEquals(List.of(4L, 7L), got.sweepStarts);
  }
}
