package tauwatch.wire;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.constraints.IntRange;
import net.jqwik.api.constraints.Size;
import tauwatch.stream.StreamCounters;

/**
 * Fuzzing the binary decoder: whatever arrives, it never throws, never hands on a frame that was
 * damaged, and finds every intact frame again. CRC-32 detects every single-bit error and every
 * burst up to 32 bits (standard CRC property — from memory), which is what lets these properties be
 * exact.
 */
class FrameDecoderPropertiesTest {

  /** Damage applied to one frame of a stream. */
  enum Damage {
    NONE,
    FLIP_BIT,
    TRUNCATE,
    WRONG_CRC,
    GARBAGE_BEFORE
  }

  @Property(tries = 300, seed = "20261201")
  void randomBytesNeverThrowAndYieldNoFrames(@ForAll @Size(max = 4000) byte[] noise) {
    WireFormatTest.Collector c = new WireFormatTest.Collector();
    FrameDecoder d = new FrameDecoder(c, new StreamCounters());
    d.accept(noise, 0, noise.length);
    d.reset();
    assertEquals(0, c.values.size());
  }

  @Property(tries = 300, seed = "4711")
  void damagedFramesAreNeverHandedOnAndEveryIntactFrameIsFound(
      @ForAll long seed,
      @ForAll @IntRange(min = 1, max = 30) int frames,
      @ForAll @IntRange(min = 1, max = 700) int chunkBytes) {
    SplittableRandom r = new SplittableRandom(seed);
    ByteArrayOutputStream wire = new ByteArrayOutputStream();
    List<double[]> intact = new ArrayList<>();
    List<Long> intactSeq = new ArrayList<>();
    int damagedWithSync = 0;
    boolean anyDamage = false;
    for (int k = 0; k < frames; k++) {
      int format = r.nextBoolean() ? WireFormat.FORMAT_INT16 : WireFormat.FORMAT_FLOAT32;
      int channels = 1 + r.nextInt(4);
      int samples = 1 + r.nextInt(60);
      FrameEncoder e = new FrameEncoder(format, channels, samples);
      double[] v = new double[channels * samples];
      for (int i = 0; i < v.length; i++) {
        v[i] =
            format == WireFormat.FORMAT_INT16
                ? r.nextInt(-32768, 32768)
                : (float) r.nextDouble(-5, 5);
        e.set(i / channels, i % channels, v[i]);
      }
      int n = e.finish(k, 1000L * k, 50_000);
      byte[] b = e.buffer().clone();
      Damage dmg = Damage.values()[r.nextInt(Damage.values().length)];
      int len = n;
      switch (dmg) {
        case FLIP_BIT:
          int at = r.nextInt(n);
          b[at] ^= (byte) (1 << r.nextInt(8));
          if (at >= 4) {
            damagedWithSync++;
          }
          break;
        case TRUNCATE:
          len = 1 + r.nextInt(n - 1);
          if (len >= 4) {
            damagedWithSync++;
          }
          break;
        case WRONG_CRC:
          b[n - 1 - r.nextInt(4)] ^= (byte) (1 + r.nextInt(255));
          damagedWithSync++;
          break;
        case GARBAGE_BEFORE:
          int g = 1 + r.nextInt(80);
          for (int i = 0; i < g; i++) {
            wire.write(r.nextInt(256));
          }
          anyDamage = true;
          break;
        default:
          break;
      }
      anyDamage |= dmg != Damage.NONE && dmg != Damage.GARBAGE_BEFORE;
      wire.write(b, 0, len);
      if (dmg == Damage.NONE || dmg == Damage.GARBAGE_BEFORE) {
        intact.add(v);
        intactSeq.add((long) k);
      }
    }
    byte[] all = wire.toByteArray();
    WireFormatTest.Collector c = new WireFormatTest.Collector();
    StreamCounters counters = new StreamCounters();
    FrameDecoder d = new FrameDecoder(c, counters);
    for (int off = 0; off < all.length; off += chunkBytes) {
      d.accept(all, off, Math.min(chunkBytes, all.length - off));
    }
    d.reset();
    assertEquals(intactSeq, c.sequences, "exactly the intact frames, in order");
    for (int i = 0; i < intact.size(); i++) {
      assertArrayEquals(intact.get(i), c.values.get(i));
    }
    assertEquals(intact.size(), counters.framesReceived());
    assertTrue(
        counters.corruptFrames() >= damagedWithSync,
        "every damaged frame whose sync survived is counted corrupt");
    if (anyDamage) {
      assertTrue(counters.corruptFrames() + d.skippedBytes() > 0, "damage is never silent");
    }
  }

  @Property(tries = 200, seed = "99")
  void textDecoderNeverThrowsAndOnlyHandsOnWellFormedLines(
      @ForAll @Size(max = 2000) byte[] noise, @ForAll boolean counter) {
    List<Integer> widths = new ArrayList<>();
    FrameSink sink =
        f -> {
          widths.add(f.channels);
          assertTrue(f.samples >= 1);
        };
    TextLineDecoder d = new TextLineDecoder(sink, new StreamCounters(), 3, counter);
    d.accept(noise, 0, noise.length);
    d.reset();
    widths.forEach(w -> assertEquals(3, w));
  }
}
