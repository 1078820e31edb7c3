package tauwatch.source;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import tauwatch.monitor.MonitorResult;
import tauwatch.record.RawCaptureWriter;
import tauwatch.sim.ScenarioLoader;
import tauwatch.sim.SimulatedRecording;
import tauwatch.sim.serve.ByteOutlet;
import tauwatch.sim.serve.SimulatedDaq;
import tauwatch.wire.DeviceProfile;
import tauwatch.wire.DeviceProfileLoader;

/**
 * Raw captures made by the simulated DAQ, replayed: the sweep trigger reaches params.csv, and a
 * pulse that spans a lost frame is rejected while its neighbours are not.
 */
class CaptureAlignmentTest {
  /** The simulator's wiring plus a sweep-trigger line on a third channel. */
  private static final String TRIGGER_PROFILE =
      """
      name = "sim-with-trigger"
      description = "test wiring: simulator channels plus a sweep TTL"
      [transport.tcp]
      port = 0
      [framing]
      kind = "binary"
      sample_format = "int16"
      channels = 3
      samples_per_frame = 50
      [stream]
      sample_rate_hz = 50000.0
      mode = "VC"
      filter_cutoff_hz = 10000.0
      [channels]
      command = 0
      response = 1
      trigger = 2
      trigger_threshold = 8192
      [scaling]
      adc_bits = 16
      adc_range_v = 10.0
      command_mv_per_v = 20.0
      response_mv_per_pa = 5.0
      """;

  @TempDir Path dir;

  /** Writes every frame into a capture, 1 ms apart, except the frame numbered {@code skip}. */
  private static final class CaptureOutlet implements ByteOutlet {
    private final RawCaptureWriter capture;
    private final long skip;
    private long frame;

    CaptureOutlet(RawCaptureWriter capture, long skip) {
      this.capture = capture;
      this.skip = skip;
    }

    @Override
    public boolean write(byte[] buf, int len) {
      long f = frame++;
      if (f == skip) {
        return true;
      }
      try {
        capture.bytes(buf, 0, len, f * 1_000_000L);
        return true;
      } catch (IOException e) {
        throw new UncheckedIOException(e);
      }
    }

    @Override
    public void dropLink(long outageMs) {}

    @Override
    public String describe() {
      return "capture";
    }

    @Override
    public void close() throws IOException {
      capture.close();
    }
  }

  private Path capture(DeviceProfile p, long skipFrame, double seconds) throws Exception {
    Path file = dir.resolve("c" + skipFrame + ".twcap");
    try (CaptureOutlet out =
        new CaptureOutlet(new RawCaptureWriter(file, "test", p.text()), skipFrame)) {
      new SimulatedDaq(
              new SimulatedRecording(ScenarioLoader.load("steady-cell"), 3), p, List.of(), 1, out)
          .serve(seconds, false);
    }
    return file;
  }

  @Test
  void sweepStartsOnTheTriggerChannelNumberTheRowsOfParamsCsv() throws Exception {
    DeviceProfile p = DeviceProfileLoader.parse("trigger.toml", TRIGGER_PROFILE);
    LiveBench.Watching w =
        new LiveBench.Watching(new CaptureFileSource(capture(p, -1, 4.6)), dir.resolve("s"), null);
    MonitorResult r = w.await();
    assertTrue(r.complete(), r.status());
    List<String[]> rows = LiveBench.readCsv(r.sessionDir().resolve("params.csv"));
    List<String> header = Arrays.asList(rows.get(0));
    int t = header.indexOf("t_s");
    int sweep = header.indexOf("sweep");
    int sweepT = header.indexOf("sweep_t_s");
    assertTrue(sweep > 0 && sweepT > 0, "sweep columns in " + header);
    int checked = 0;
    for (String[] row : rows.subList(1, rows.size())) {
      double onset = Double.parseDouble(row[t]);
      if (onset > 2.0) {
        // The simulated DAQ raises the trigger every 2 s, from 0; the rise at 0 is not seen (the
        // line is already high), so the sweep that starts at 2 s is number 1.
        long expected = (long) Math.floor(onset / 2.0);
        assertEquals(expected, Long.parseLong(row[sweep]), "row at " + onset);
        assertEquals(onset - 2.0 * expected, Double.parseDouble(row[sweepT]), 1e-6);
        checked++;
      } else {
        assertEquals("", row[sweep], "no sweep yet at " + onset);
      }
    }
    assertTrue(checked >= 4, "rows after the first sweep: " + checked);
  }

  @Test
  void aPulseSpanningALostFrameIsRejectedAndItsNeighboursAreNot() throws Exception {
    DeviceProfile p = DeviceProfileLoader.loadBuiltIn("simulator");
    // Steady cell: steps at 0.1 s + k·0.5 s, 10 ms wide; frame 1102 (1 ms frames) lies inside
    // the step of the pulse at 1.1 s.
    LiveBench.Watching w =
        new LiveBench.Watching(
            new CaptureFileSource(capture(p, 1102, 2.2)), dir.resolve("g"), null);
    MonitorResult r = w.await();
    assertTrue(r.complete(), r.status());
    assertEquals(1, r.gaps());
    List<String[]> rows = LiveBench.readCsv(r.sessionDir().resolve("params.csv"));
    List<String> header = Arrays.asList(rows.get(0));
    int t = header.indexOf("t_s");
    int accepted = header.indexOf("accepted");
    int reason = header.indexOf("reject_reason");
    int seen = 0;
    for (String[] row : rows.subList(1, rows.size())) {
      double onset = Double.parseDouble(row[t]);
      boolean spans = Math.abs(onset - 1.1) < 0.01;
      assertEquals(spans ? "false" : "true", row[accepted], "pulse at " + onset);
      if (spans) {
        assertTrue(row[reason].contains("gap") || row[reason].contains("lost"), row[reason]);
        seen++;
      }
    }
    assertEquals(1, seen);
    List<String> kinds = LiveBench.kinds(w.events());
    assertTrue(kinds.contains("gap"), kinds.toString());
  }

  @org.junit.jupiter.params.ParameterizedTest(name = "{0}")
  @org.junit.jupiter.params.provider.ValueSource(
      strings = {"int16 counts", "float32 volts", "text lines with counter"})
  void everyFramingCarriesTheCellToTheEstimator(String framing) throws Exception {
    String base =
        TRIGGER_PROFILE
            .replace("channels = 3", "channels = 2")
            .replace("trigger = 2\n", "")
            .replace("trigger_threshold = 8192\n", "");
    String toml =
        switch (framing) {
          case "float32 volts" ->
              base.replace("sample_format = \"int16\"", "sample_format = \"float32\"")
                  .replace("adc_bits = 16\n", "values = \"volts\"\n");
          case "text lines with counter" ->
              base.replace("kind = \"binary\"", "kind = \"text\"\nline_counter = true")
                  .replace("sample_format = \"int16\"\n", "");
          default -> base;
        };
    DeviceProfile p = DeviceProfileLoader.parse(framing + ".toml", toml);
    assertEquals(framing.startsWith("text"), p.framing() == DeviceProfile.Framing.TEXT);
    assertEquals(framing.startsWith("float32") ? "volts" : "counts", p.values());
    LiveBench.Watching w =
        new LiveBench.Watching(new CaptureFileSource(capture(p, -1, 2.2)), dir.resolve("f"), null);
    MonitorResult r = w.await();
    assertTrue(r.complete(), r.status());
    assertEquals(0, w.monitor.counters().corruptFrames());
    // Steady cell truth Ra 10 MΩ, Rin 300 MΩ (VC formulas of CHECKS.md); 5 % on the median.
    assertTrue(w.summary.accepted() >= 3);
    assertTrue(
        LiveBench.relativeError(w.summary, tauwatch.fit.Parameter.ACCESS_RESISTANCE, 10) < 0.05);
    assertTrue(
        LiveBench.relativeError(w.summary, tauwatch.fit.Parameter.INPUT_RESISTANCE, 300) < 0.05);
  }
}
