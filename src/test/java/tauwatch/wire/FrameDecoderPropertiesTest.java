package tauwatch.wire;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import java.util.stream.LongStream;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;
import tauwatch.stream.StreamCounters;

/**
 * Fuzzing the binary decoder: whatever arrives, it never throws, never hands on a frame that was
 * damaged, and finds every intact frame again. CRC-32 detects every single-bit error and every
 * burst up to 32 bits (standard CRC property — from memory), which is what lets these properties be
 * exact.
 *
 * <p>Each property runs over a few hundred generated cases from fixed seeds (plain JUnit
 * parameterised tests; a failing case names its seed, which regenerates it exactly).
 */
class FrameDecoderPropertiesTest {

  static LongStream seeds300() {
    return LongStream.range(20261201L, 20261201L + 300);
  }

  static LongStream seeds200() {
    return LongStream.range(99L, 99L + 200);
  }

  private static byte[] randomBytes(SplittableRandom r, int maxLength) {
    byte[] b = new byte[r.nextInt(maxLength + 1)];
    r.nextBytes(b);
    return b;
  }

  /** Damage applied to one frame of a stream. */
  enum Damage {
    NONE,
    FLIP_BIT,
    TRUNCATE,
    WRONG_CRC,
    GARBAGE_BEFORE
  }

  @ParameterizedTest(name = "seed {0}")
  @MethodSource("seeds300")
  void randomBytesNeverThrowAndYieldNoFrames(long caseSeed) {
    byte[] noise = randomBytes(new SplittableRandom(caseSeed), 4000);
    WireFormatTest.Collector c = new WireFormatTest.Collector();
    FrameDecoder d = new FrameDecoder(c, new StreamCounters());
    d.accept(noise, 0, noise.length);
    d.reset();
    assertEquals(0, c.values.size());
  }

  @ParameterizedTest(name = "seed {0}")
  @MethodSource("seeds300")
  void damagedFramesAreNeverHandedOnAndEveryIntactFrameIsFound(long caseSeed) {
    SplittableRandom r = new SplittableRandom(caseSeed ^ 4711);
    int frames = 1 + r.nextInt(30);
    int chunkBytes = 1 + r.nextInt(700);
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

  @ParameterizedTest(name = "seed {0}")
  @MethodSource("seeds200")
  void textDecoderNeverThrowsAndOnlyHandsOnWellFormedLines(long caseSeed) {
    SplittableRandom r = new SplittableRandom(caseSeed);
    boolean counter = r.nextBoolean();
    byte[] noise = randomBytes(r, 2000);
    if (r.nextBoolean()) {
      // Bias half the cases toward text: digits, commas and line breaks, so lines get parsed.
      byte[] alphabet = "0123456789,-\n\r ".getBytes(java.nio.charset.StandardCharsets.US_ASCII);
      for (int i = 0; i < noise.length; i++) {
        noise[i] = alphabet[r.nextInt(alphabet.length)];
      }
    }
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
