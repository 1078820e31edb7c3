package tauwatch.source;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import tauwatch.fit.Parameter;
import tauwatch.monitor.MonitorResult;
import tauwatch.record.RawCaptureWriter;
import tauwatch.sim.CellTruth;
import tauwatch.sim.ScenarioLoader;
import tauwatch.wire.DeviceProfile;
import tauwatch.wire.DeviceProfileLoader;

/**
 * The whole chain over a real loopback TCP socket: the simulator serves in the wire format, the
 * monitor reads it, and the estimates match the simulated cell's truth within the backbone's
 * tolerances (5 % on the median of Ra, Rin and Cm at the default scenario's noise; the VC formulas
 * of CHECKS.md, Gillis 1995 — from memory, define the truth).
 */
class TcpEndToEndTest {
  @TempDir Path dir;

  @Test
  void estimatesOverTcpMatchTheTruthAndTheCaptureReplaysToTheSameNumbers() throws Exception {
    DeviceProfile profile = DeviceProfileLoader.loadBuiltIn("simulator");
    Path capture = dir.resolve("run.twcap");
    MonitorResult live;
    LiveBench.Watching watching;
    try (LiveBench bench = new LiveBench("steady-cell", 1, List.of(), profile, 0);
        RawCaptureWriter cap = new RawCaptureWriter(capture, "tcp://test", profile.text())) {
      DeviceStreamSource src = DeviceStreamSource.tcp("127.0.0.1", bench.port(), profile, cap);
      watching = new LiveBench.Watching(src, dir.resolve("live"), Duration.ofMillis(3600));
      bench.serveWhenConnected(30);
      live = watching.await();
    }
    assertTrue(live.complete(), live.status());
    CellTruth truth = ScenarioLoader.load("steady-cell").truthAt(0);
    assertTrue(watching.summary.accepted() >= 5, "accepted " + watching.summary.accepted());
    for (Parameter p :
        List.of(
            Parameter.ACCESS_RESISTANCE,
            Parameter.INPUT_RESISTANCE,
            Parameter.MEMBRANE_CAPACITANCE)) {
      double t =
          p == Parameter.ACCESS_RESISTANCE
              ? truth.accessMOhm()
              : p == Parameter.INPUT_RESISTANCE ? truth.inputMOhm() : truth.capacitancePf();
      double err = LiveBench.relativeError(watching.summary, p, t);
      System.out.printf(
          "tcp: %s median %.4g vs truth %.4g (%.2f %%)%n",
          p.symbol(), watching.summary.median(p), t, 100 * err);
      assertTrue(err < 0.05, p + " off by " + err);
    }
    assertEquals(0, live.gaps());
    System.out.println("tcp events: " + LiveBench.kinds(watching.events()));
    assertTrue(!LiveBench.kinds(watching.events()).contains("resync"));

    // The capture holds the bytes as received: replaying it gives the very same estimates.
    CaptureFileSource replay = new CaptureFileSource(capture);
    Duration sameLength = Duration.ofNanos(Math.round(live.samples() * 1e9 / 50_000));
    LiveBench.Watching again = new LiveBench.Watching(replay, dir.resolve("replay"), sameLength);
    MonitorResult r = again.await();
    assertTrue(r.complete(), r.status());
    assertEquals(live.samples(), r.samples());
    assertEquals(watching.summary.accepted(), again.summary.accepted());
    for (Parameter p : List.of(Parameter.ACCESS_RESISTANCE, Parameter.TIME_CONSTANT)) {
      assertEquals(watching.summary.median(p), again.summary.median(p), 0.0, p.symbol());
    }

    // The built-in source with the same seed shows the same cell; only the command's 16-bit
    // coding on the wire (0.006 mV steps) separates the two.
    var builtIn =
        new SimulatedSource(
            new tauwatch.sim.SimulatedRecording(ScenarioLoader.load("steady-cell"), 1), false);
    LiveBench.Watching direct = new LiveBench.Watching(builtIn, dir.resolve("direct"), sameLength);
    direct.await();
    for (Parameter p : List.of(Parameter.ACCESS_RESISTANCE, Parameter.MEMBRANE_CAPACITANCE)) {
      double a = watching.summary.median(p);
      double b = direct.summary.median(p);
      assertTrue(Math.abs(a - b) / b < 0.005, p.symbol() + ": wire " + a + " vs built-in " + b);
    }
    assertTrue(Files.readString(r.sessionDir().resolve("session.json")).contains("mode"));
  }
}
