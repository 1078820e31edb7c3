package tauwatch.wire;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.zip.CRC32;
import org.junit.jupiter.api.Test;
import tauwatch.stream.StreamCounters;

class WireFormatTest {

  /** Collects copies of every frame a decoder hands on. */
  static final class Collector implements FrameSink {
    final List<double[]> values = new ArrayList<>();
    final List<Long> sequences = new ArrayList<>();
    final List<Long> firstSamples = new ArrayList<>();
    final List<Double> rates = new ArrayList<>();

    @Override
    public void onFrame(DecodedFrame f) {
      double[] v = new double[f.channels * f.samples];
      System.arraycopy(f.values, 0, v, 0, v.length);
      values.add(v);
      sequences.add(f.sequence);
      firstSamples.add(f.firstSample);
      rates.add(f.sampleRateHz);
    }
  }

  @Test
  void crc32OfTheCheckStringIsTheCatalogueCheckValue() {
    // CRC-32/ISO-HDLC check value for "123456789" is 0xCBF43926 (CRC catalogue — from memory).
    CRC32 crc = new CRC32();
    crc.update("123456789".getBytes(StandardCharsets.US_ASCII));
    assertEquals(0xCBF43926L, crc.getValue());
  }

  @Test
  void theExampleFrameInTheSpecificationDecodesToItsStatedValues() throws Exception {
    String doc = Files.readString(Path.of("drivers/WIRE-FORMAT.md"), StandardCharsets.UTF_8);
    int start = doc.indexOf("```hex") + 6;
    String hex = doc.substring(start, doc.indexOf("```", start)).trim();
    String[] parts = hex.split("\\s+");
    byte[] bytes = new byte[parts.length];
    for (int i = 0; i < parts.length; i++) {
      bytes[i] = (byte) Integer.parseInt(parts[i], 16);
    }
    Collector c = new Collector();
    StreamCounters counters = new StreamCounters();
    new FrameDecoder(c, counters).accept(bytes, 0, bytes.length);
    assertEquals(1, c.values.size());
    assertEquals(0, counters.corruptFrames());
    assertEquals(7L, c.sequences.get(0));
    assertEquals(1000L, c.firstSamples.get(0));
    assertEquals(50000.0, c.rates.get(0));
    assertArrayEquals(new double[] {-11469, 164, -12288, -1638, -12288, -820}, c.values.get(0));

    DeviceProfile sim = DeviceProfileLoader.loadBuiltIn("simulator");
    // Scaling as the specification states: ±10 V over 16 bits, 20 mV/V, 5 mV/pA.
    assertEquals(-75.0, -12288 * sim.commandScale(), 1e-12);
    assertEquals(-70.00, -11469 * sim.commandScale(), 0.005);
    assertEquals(10.01, 164 * sim.responseScale(), 0.005);
    assertEquals(2000.0 / 32768, sim.responseScale(), 1e-15);
  }

  @Test
  void theEncoderWritesTheSpecifiedExampleByteForByte() {
    FrameEncoder e = new FrameEncoder(WireFormat.FORMAT_INT16, 2, 3);
    double[] v = {-11469, 164, -12288, -1638, -12288, -820};
    for (int i = 0; i < v.length; i++) {
      e.set(i / 2, i % 2, v[i]);
    }
    int n = e.finish(7, 1000, 50000);
    assertEquals(WireFormat.frameBytes(WireFormat.FORMAT_INT16, 2, 3), n);
    assertEquals(0x69, e.buffer()[n - 4] & 0xff);
    assertEquals(0xB9, e.buffer()[n - 1] & 0xff);
  }

  @Test
  void float32FramesRoundTripExactly() {
    FrameEncoder e = new FrameEncoder(WireFormat.FORMAT_FLOAT32, 3, 4);
    for (int s = 0; s < 4; s++) {
      for (int ch = 0; ch < 3; ch++) {
        e.set(s, ch, (float) (s * 1.25 - ch * 0.5));
      }
    }
    int n = e.finish(0xFFFFFFFFL, 0xFFFFFFF0L, 0);
    Collector c = new Collector();
    new FrameDecoder(c, new StreamCounters()).accept(e.buffer(), 0, n);
    assertEquals(4294967295L, c.sequences.get(0));
    assertEquals(4294967280L, c.firstSamples.get(0));
    assertEquals(0.0, c.rates.get(0));
    assertEquals(1.25 * 3 - 1.0, c.values.get(0)[3 * 3 + 2], 0);
  }

  @Test
  void textLinesSkipTheFirstLineAndCountMalformedOnes() {
    Collector c = new Collector();
    StreamCounters counters = new StreamCounters();
    TextLineDecoder d = new TextLineDecoder(c, counters, 2, true);
    byte[] text =
        "34,-5\n10,-11469,164\r\n11, -12288 ,-1638\n12,x,1\n13,1\n15,7,8\n"
            .getBytes(StandardCharsets.US_ASCII);
    d.accept(text, 0, text.length);
    assertEquals(6, d.skippedBytes()); // the joined-mid-line first line
    assertEquals(2, counters.corruptFrames());
    assertEquals(3, counters.framesReceived());
    assertEquals(1, counters.resyncs());
    // Lines 10 and 11 form one run; 15 starts a new run after the jump.
    assertEquals(2, c.values.size());
    assertArrayEquals(new double[] {-11469, 164, -12288, -1638}, c.values.get(0));
    assertEquals(10L, c.firstSamples.get(0));
    assertEquals(15L, c.firstSamples.get(1));
  }

  @Test
  void textEncoderAndDecoderAgree() {
    TextLineEncoder enc = new TextLineEncoder(2, true, 4);
    enc.line(0, new double[] {0, 0}); // skipped as a possible partial line
    for (int i = 1; i <= 3; i++) {
      enc.line(i, new double[] {-i * 1000, i * 7});
    }
    Collector c = new Collector();
    new TextLineDecoder(c, new StreamCounters(), 2, true).accept(enc.buffer(), 0, enc.length());
    assertArrayEquals(new double[] {-1000, 7, -2000, 14, -3000, 21}, c.values.get(0));
    assertEquals(1L, c.firstSamples.get(0));
  }
}
