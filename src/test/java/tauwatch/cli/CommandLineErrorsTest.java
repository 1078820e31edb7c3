package tauwatch.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** Bad input gets one line naming the file, line or key, and a non-zero exit code. */
class CommandLineErrorsTest {
  @TempDir Path dir;

  record Run(int code, String out, String err) {
    List<String> errLines() {
      return err.lines().toList();
    }
  }

  private Run run(String... args) {
    StringWriter out = new StringWriter();
    StringWriter err = new StringWriter();
    int code = Main.run(args, new PrintWriter(out, true), new PrintWriter(err, true));
    return new Run(code, out.toString(), err.toString());
  }

  private void assertOneLine(Run r, int code, String expected) {
    assertEquals(code, r.code(), r.err());
    assertEquals(1, r.errLines().size(), "one line: " + r.err());
    assertTrue(r.errLines().get(0).contains(expected), r.err());
  }

  @Test
  void everyCommandHasHelp() {
    for (String cmd : new String[] {"watch", "replay", "bench"}) {
      Run r = run(cmd, "--help");
      assertEquals(0, r.code());
      assertTrue(r.out().contains("Usage: tauwatch " + cmd), r.out());
    }
    assertEquals(0, run("--help").code());
  }

  @Test
  void aBenchmarkWithNoRoundsIsRefusedInOneLine() {
    assertOneLine(run("bench", "--rounds", "0"), Main.EXIT_BAD_INPUT, "--rounds must be");
  }

  @Test
  void anUnknownOptionIsAUsageError() {
    assertOneLine(run("watch", "--colour"), Main.EXIT_USAGE, "Unknown option: '--colour'");
  }

  @Test
  void aMalformedDurationIsAUsageError() {
    assertOneLine(run("watch", "--duration", "soon"), Main.EXIT_USAGE, "'soon' is not a duration");
  }

  @Test
  void anUnknownScenarioIsNamed() {
    Run r = run("watch", "--headless", "--source", "sim:no-such-cell", "--log-dir", dir.toString());
    assertOneLine(r, Main.EXIT_BAD_INPUT, "no-such-cell");
    assertNoSessionLeft();
  }

  @Test
  void aMalformedSourceIsNamed() {
    assertOneLine(
        run("watch", "--source", "udp://x", "--log-dir", dir.toString()),
        Main.EXIT_BAD_INPUT,
        "--source udp://x: expected sim, sim:SCENARIO, tcp://HOST:PORT, serial:DEVICE or file:PATH");
  }

  @Test
  void aMissingReplayFileIsNamed() {
    Path f = dir.resolve("absent.csv");
    assertOneLine(
        run("replay", f.toString(), "--log-dir", dir.toString()), 1, f + ": no such file");
    assertNoSessionLeft();
  }

  @Test
  void aConfigKeyThatDoesNotExistIsNamed() throws Exception {
    Path cfg = dir.resolve("lab.toml");
    Files.writeString(cfg, "[limits.ra]\nmax = 25\n[health]\nbaseline_pulses = 10\n");
    assertOneLine(
        run("watch", "--config", cfg.toString(), "--log-dir", dir.toString()),
        Main.EXIT_BAD_INPUT,
        cfg + ": unknown key 'health.baseline_pulses'");
    assertNoSessionLeft();
  }

  @Test
  void aConfigValueOutOfRangeIsNamed() throws Exception {
    Path cfg = dir.resolve("lab.toml");
    Files.writeString(cfg, "[health]\ndrift_warning_fraction = 1.5\n");
    assertOneLine(
        run("watch", "--config", cfg.toString(), "--log-dir", dir.toString()),
        Main.EXIT_BAD_INPUT,
        "drift_warning_fraction must be in (0, 1), got 1.5");
  }

  @Test
  void aMalformedLineMidFileFailsTheSessionVisiblyNotSilently() throws Exception {
    Path f = dir.resolve("broken.csv");
    StringBuilder sb = new StringBuilder("t_s,cmd_mV,im_pA\n");
    for (int i = 0; i < 1000; i++) {
      sb.append(i * 2e-5).append(",-70,-16\n");
    }
    sb.append("0.02,-70,oops\n");
    Files.writeString(f, sb.toString());
    Path logs = dir.resolve("logs");
    Run r = run("replay", f.toString(), "--log-dir", logs.toString());
    assertOneLine(r, Main.EXIT_BAD_INPUT, f + ":1002: malformed value in column 3");
    // The session folder says it failed; nothing half-written looks complete.
    try (Stream<Path> s = Files.list(logs)) {
      Path session = s.findFirst().orElseThrow();
      String json = Files.readString(session.resolve("session.json"));
      assertTrue(json.contains("\"status\" : \"failed: " + f + ":1002"), json);
      assertFalse(json.contains("\"complete\""));
      String events = Files.readString(session.resolve("events.csv"));
      assertTrue(events.contains("source_error"), events);
    }
  }

  private void assertNoSessionLeft() {
    try (Stream<Path> s = Files.list(dir)) {
      assertTrue(
          s.noneMatch(p -> Files.isDirectory(p)), "no session folder is created for bad input");
    } catch (java.io.IOException e) {
      throw new AssertionError(e);
    }
  }
}
