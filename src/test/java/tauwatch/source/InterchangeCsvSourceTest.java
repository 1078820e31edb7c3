package tauwatch.source;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import tauwatch.stream.ClampMode;
import tauwatch.stream.SampleBlock;
import tauwatch.stream.SampleBlockHandler;
import tauwatch.stream.SampleRing;

class InterchangeCsvSourceTest {
  @TempDir Path dir;

  private Path write(String name, String text) throws IOException {
    Path f = dir.resolve(name);
    Files.writeString(f, text);
    return f;
  }

  /** Runs a source through a real ring and collects what arrives. */
  private static List<double[]> drain(SampleSource s, List<Long> lost) throws Exception {
    List<double[]> rows = new ArrayList<>();
    SampleBlockHandler h =
        (SampleBlock b, long seq, boolean end) -> {
          if (b.lostBeforeSamples > 0) {
            lost.add(b.lostBeforeSamples);
          }
          for (int i = 0; i < b.length; i++) {
            rows.add(new double[] {b.firstSampleIndex + i, b.command[i], b.response[i]});
          }
        };
    SampleRing ring = new SampleRing(64, 16, false, h);
    ring.start();
    s.run(ring.writer(), Long.MAX_VALUE);
    ring.writer().endOfStream();
    ring.awaitDrainedAndStop(10, java.util.concurrent.TimeUnit.SECONDS);
    return rows;
  }

  @Test
  void readsVoltageClampRowsAndTheSampleRateFromTheTimeColumn() throws Exception {
    Path f =
        write(
            "vc.csv", "t_s,cmd_mV,im_pA\n0.5,-70,-12.5\n0.50002,-75,1.5e3\n0.50004,-75,-3.25E-1\n");
    InterchangeCsvSource s = new InterchangeCsvSource(f, 10_000);
    assertEquals(ClampMode.VOLTAGE_CLAMP, s.format().mode());
    assertEquals(50_000, s.format().sampleRateHz(), 1e-6);
    assertEquals(0.5, s.format().startTimeS());
    assertEquals(10_000, s.format().filterCutoffHz());
    List<double[]> rows = drain(s, new ArrayList<>());
    assertEquals(3, rows.size());
    assertEquals(-12.5, rows.get(0)[2]);
    assertEquals(1500.0, rows.get(1)[2]);
    assertEquals(-0.325, rows.get(2)[2], 1e-15);
    assertEquals(-75.0, rows.get(2)[1]);
  }

  @Test
  void theHeaderDecidesCurrentClamp() throws Exception {
    Path f = write("cc.csv", "t_s,cmd_pA,vm_mV\r\n0,0,-65\r\n0.0001,-50,-65.2\r\n");
    assertEquals(ClampMode.CURRENT_CLAMP, new InterchangeCsvSource(f, 0).format().mode());
  }

  @Test
  void missingRowsBecomeAGapOfTheirLength() throws Exception {
    Path f = write("gap.csv", "t_s,cmd_mV,im_pA\n0,0,1\n0.001,0,2\n0.005,0,3\n0.006,0,4\n");
    List<Long> lost = new ArrayList<>();
    List<double[]> rows = drain(new InterchangeCsvSource(f, 0), lost);
    assertEquals(List.of(3L), lost);
    assertEquals(5.0, rows.get(2)[0], "stream index skips the lost samples");
  }

  @Test
  void aBadHeaderIsNamedWithFileAndLine() throws IOException {
    Path f = write("h.csv", "time,cmd,im\n0,0,0\n");
    String m =
        assertThrows(SourceException.class, () -> new InterchangeCsvSource(f, 0)).getMessage();
    assertEquals(
        f
            + ":1: header must be 't_s,cmd_mV,im_pA' (voltage clamp) or 't_s,cmd_pA,vm_mV' (current"
            + " clamp), got 'time,cmd,im'",
        m);
  }

  @Test
  void aMalformedRowIsNamedWithFileAndLine() throws Exception {
    Path f = write("bad.csv", "t_s,cmd_mV,im_pA\n0,0,1\n0.001,0,2\n0.002,zero,3\n");
    InterchangeCsvSource s = new InterchangeCsvSource(f, 0);
    SourceException e = assertThrows(SourceException.class, () -> drain(s, new ArrayList<>()));
    assertEquals(f + ":4: malformed value in column 2 (expected a number)", e.getMessage());
  }

  @Test
  void aShortRowIsNamedWithFileAndLine() throws Exception {
    Path f = write("short.csv", "t_s,cmd_mV,im_pA\n0,0,1\n0.001,0,2\n0.002,3\n");
    InterchangeCsvSource s = new InterchangeCsvSource(f, 0);
    SourceException e = assertThrows(SourceException.class, () -> drain(s, new ArrayList<>()));
    assertEquals(f + ":4: expected 3 values, found 2", e.getMessage());
  }

  @Test
  void timeOffTheSampleClockIsNamed() throws Exception {
    Path f = write("clock.csv", "t_s,cmd_mV,im_pA\n0,0,1\n0.001,0,2\n0.0025,0,3\n");
    InterchangeCsvSource s = new InterchangeCsvSource(f, 0);
    SourceException e = assertThrows(SourceException.class, () -> drain(s, new ArrayList<>()));
    assertEquals(
        f + ":4: t_s 0.0025 is off the sample clock (interval 0.00100000 s from the first rows)",
        e.getMessage());
  }

  @Test
  void aMissingOrEmptyFileIsNamed() throws IOException {
    Path none = dir.resolve("none.csv");
    assertEquals(
        none + ": no such file",
        assertThrows(SourceException.class, () -> new InterchangeCsvSource(none, 0)).getMessage());
    Path header = write("only.csv", "t_s,cmd_mV,im_pA\n");
    assertEquals(
        header + ":1: no samples after the header",
        assertThrows(SourceException.class, () -> new InterchangeCsvSource(header, 0))
            .getMessage());
  }
}
