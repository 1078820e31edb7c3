package tauwatch.wire;

import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.Test;
import tauwatch.stream.StreamCounters;

/**
 * Throughput of {@link FrameDecoder} and {@link TextLineDecoder} on the simulator's frame shape (2
 * int16 channels, 50 samples per frame). A benchmark: excluded from the test run (tag {@code
 * bench}); run with {@code mvn -o test -Dtest=DecoderSpeedBenchmark
 * -Dsurefire.excludedGroups=none}. Prints, asserts nothing; also reports bytes allocated by the
 * decoding thread (expected 0).
 */
@Tag("bench")
class DecoderSpeedBenchmark {

  @Test
  void printDecoderSpeed() {
    FrameEncoder e = new FrameEncoder(WireFormat.FORMAT_INT16, 2, 50);
    for (int s = 0; s < 50; s++) {
      e.set(s, 0, -11469);
      e.set(s, 1, s * 13);
    }
    int frameBytes = e.finish(0, 0, 50_000);
    int frames = 2000;
    byte[] stream = new byte[frameBytes * frames];
    for (int f = 0; f < frames; f++) {
      e.finish(f, 50L * f, 50_000);
      System.arraycopy(e.buffer(), 0, stream, f * frameBytes, frameBytes);
    }
    long[] sink = new long[1];
    FrameSink count = fr -> sink[0] += fr.samples;
    FrameDecoder d = new FrameDecoder(count, new StreamCounters());
    for (int i = 0; i < 200; i++) {
      d.accept(stream, 0, stream.length);
    }
    com.sun.management.ThreadMXBean mx =
        (com.sun.management.ThreadMXBean) java.lang.management.ManagementFactory.getThreadMXBean();
    long tid = Thread.currentThread().getId();
    long a0 = mx.getThreadAllocatedBytes(tid);
    int rounds = 1000;
    long t0 = System.nanoTime();
    for (int i = 0; i < rounds; i++) {
      d.accept(stream, 0, stream.length);
    }
    double s = (System.nanoTime() - t0) * 1e-9;
    long allocated = mx.getThreadAllocatedBytes(tid) - a0;
    System.out.printf(
        "binary: %.1f MB/s, %.1f M samples/s per channel, %d bytes allocated%n",
        rounds * (double) stream.length / s / 1e6, rounds * frames * 50.0 / s / 1e6, allocated);

    TextLineEncoder te = new TextLineEncoder(2, true, 10_000);
    double[] raw = new double[2];
    for (int i = 0; i < 10_000; i++) {
      raw[0] = -11469;
      raw[1] = i % 2000 - 1000;
      te.line(i, raw);
    }
    TextLineDecoder td = new TextLineDecoder(count, new StreamCounters(), 2, true);
    for (int i = 0; i < 50; i++) {
      td.accept(te.buffer(), 0, te.length());
    }
    a0 = mx.getThreadAllocatedBytes(tid);
    t0 = System.nanoTime();
    for (int i = 0; i < 300; i++) {
      td.accept(te.buffer(), 0, te.length());
    }
    s = (System.nanoTime() - t0) * 1e-9;
    allocated = mx.getThreadAllocatedBytes(tid) - a0;
    System.out.printf(
        "text: %.1f MB/s, %.2f M lines/s, %d bytes allocated%n",
        300.0 * te.length() / s / 1e6, 300 * 10_000 / s / 1e6, allocated);
  }
}
