package tauwatch.wire;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.lang.management.ManagementFactory;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import tauwatch.stream.SampleRing;

/**
 * Decoding and feeding the ring allocate nothing per frame: the JVM's per-thread allocation counter
 * (com.sun.management.ThreadMXBean#getThreadAllocatedBytes) does not move while frames — good,
 * corrupt and with garbage between them — are decoded, scaled and put into the ring. An allocation
 * counter, not a timing.
 */
class DecodeAllocationTest {

  @Test
  void decodingScalingAndFeedingTheRingAllocateNothingPerFrame() throws Exception {
    DeviceProfile p = DeviceProfileLoader.loadBuiltIn("simulator");
    FrameEncoder e = new FrameEncoder(WireFormat.FORMAT_INT16, 2, 50);
    int frameBytes = e.frameBytes();
    int frames = 200;
    byte[] stream = new byte[(frameBytes + 3) * frames];
    int at = 0;
    for (int f = 0; f < frames; f++) {
      for (int s = 0; s < 50; s++) {
        e.set(s, 0, -11469);
        e.set(s, 1, s - 25);
      }
      e.finish(f, 50L * f, 50_000);
      System.arraycopy(e.buffer(), 0, stream, at, frameBytes);
      if (f % 10 == 3) {
        stream[at + 30] ^= 0x10; // a corrupt frame
      }
      at += frameBytes;
      stream[at++] = 0x11; // garbage between frames
      stream[at++] = (byte) 0xA7;
      stream[at++] = 0x00;
    }
    SampleRing ring = new SampleRing(1024, 256, true, (b, seq, end) -> {});
    ring.start();
    SampleFeed feed = new SampleFeed(p, ring.writer());
    FrameDecoder d = new FrameDecoder(feed, ring.writer().counters());
    for (int i = 0; i < 300; i++) {
      d.accept(stream, 0, at); // warm-up: let the JIT compile the path
      ring.writer().flush();
    }
    com.sun.management.ThreadMXBean mx =
        (com.sun.management.ThreadMXBean) ManagementFactory.getThreadMXBean();
    long id = Thread.currentThread().getId();
    long before = mx.getThreadAllocatedBytes(id);
    for (int i = 0; i < 300; i++) {
      d.accept(stream, 0, at); // 60 000 frames, 3 M samples
      ring.writer().flush();
    }
    long after = mx.getThreadAllocatedBytes(id);
    // A one-off of a few dozen bytes can come from the JIT (a branch taken for the first time
    // deoptimises and rematerialises scalar-replaced objects); it cannot scale with the frame
    // count: one byte per frame would be 60 000 bytes here.
    assertTrue(after - before < 1024, "bytes allocated over 60 000 frames: " + (after - before));
    ring.writer().endOfStream();
    ring.awaitDrainedAndStop(5, TimeUnit.SECONDS);
  }
}
