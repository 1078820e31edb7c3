package tauwatch.source;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStreamReader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import tauwatch.fit.Parameter;
import tauwatch.monitor.MonitorResult;
import tauwatch.sim.ScenarioLoader;
import tauwatch.sim.SimulatedRecording;
import tauwatch.sim.serve.SerialOutlet;
import tauwatch.sim.serve.SimulatedDaq;
import tauwatch.wire.DeviceProfile;
import tauwatch.wire.DeviceProfileLoader;

/**
 * The whole chain over a real pseudo-terminal pair (socat) read through jSerialComm, as a board on
 * USB serial would be. Truth: the steady cell's Ra 10 MΩ, Rin 300 MΩ, Cm 30 pF (VC formulas of
 * CHECKS.md); tolerance 5 % on the median as over TCP.
 */
@org.junit.jupiter.api.Tag("serial")
class SerialPtyTest {
  @TempDir Path dir;

  @Test
  void estimatesOverASerialPseudoTerminalMatchTheTruth() throws Exception {
    Path a = dir.resolve("ttyA");
    Path b = dir.resolve("ttyB");
    Process socat = startSocat(a, b);
    try {
      DeviceProfile profile = DeviceProfileLoader.loadBuiltIn("simulator");
      LiveBench.Watching w =
          new LiveBench.Watching(
              DeviceStreamSource.serial(a.toString(), profile, null),
              dir.resolve("logs"),
              Duration.ofMillis(2600));
      MonitorResult r;
      SimulatedDaq daq;
      try (SerialOutlet outlet = new SerialOutlet(b.toString(), profile.serial())) {
        daq =
            new SimulatedDaq(
                new SimulatedRecording(ScenarioLoader.load("steady-cell"), 1),
                profile,
                List.of(),
                7,
                outlet);
        Thread serving = new Thread(() -> daq.serve(10), "test-serial-daq");
        serving.setDaemon(true);
        Thread.sleep(200); // let the reader open its end first
        serving.start();
        r = w.await();
        daq.stop();
        serving.join(5000);
      }
      assertTrue(r.complete(), r.status());
      assertTrue(w.summary.accepted() >= 3, "accepted " + w.summary.accepted());
      for (Object[] pt :
          new Object[][] {
            {Parameter.ACCESS_RESISTANCE, 10.0},
            {Parameter.INPUT_RESISTANCE, 300.0},
            {Parameter.MEMBRANE_CAPACITANCE, 30.0}
          }) {
        Parameter p = (Parameter) pt[0];
        double err = LiveBench.relativeError(w.summary, p, (Double) pt[1]);
        System.out.printf(
            "serial: %s median %.4g (%.2f %%)%n", p.symbol(), w.summary.median(p), 100 * err);
        assertTrue(err < 0.05, p + " off by " + err);
      }
      assertTrue(w.monitor.counters().corruptFrames() == 0);
    } finally {
      end(socat);
    }
  }

  @Test
  void unpluggingThePortGivesNoSignalAndPluggingItBackRestoresIt() throws Exception {
    Path a = dir.resolve("ttyA");
    Path b = dir.resolve("ttyB");
    DeviceProfile profile = DeviceProfileLoader.loadBuiltIn("simulator");
    Process socat = startSocat(a, b);
    LiveBench.Watching w;
    long unplugged;
    long pluggedIn;
    try {
      w =
          new LiveBench.Watching(
              DeviceStreamSource.serial(a.toString(), profile, null), dir.resolve("logs"), null);
      Thread.sleep(200);
      Daq first = new Daq(b, profile, 1);
      Thread.sleep(1200);
      unplugged = System.nanoTime();
      end(socat); // the "cable" is gone: both pty ends vanish
      first.stop();
      Thread.sleep(800);
      socat = startSocat(a, b);
      pluggedIn = System.nanoTime();
      Daq second = new Daq(b, profile, 2);
      long deadline = System.nanoTime() + 8_000_000_000L;
      while (w.firstNanos(tauwatch.event.EventKind.SIGNAL_RESTORED, pluggedIn) < 0
          && System.nanoTime() < deadline) {
        Thread.sleep(50);
      }
      Thread.sleep(1000);
      w.stopAndWait();
      second.stop();
    } finally {
      end(socat);
    }
    long lost = w.firstNanos(tauwatch.event.EventKind.SIGNAL_LOST, unplugged);
    long restored = w.firstNanos(tauwatch.event.EventKind.SIGNAL_RESTORED, pluggedIn);
    System.out.printf(
        "serial unplug: signal lost %.0f ms after the unplug, restored %.0f ms after re-plugging%n",
        (lost - unplugged) / 1e6, (restored - pluggedIn) / 1e6);
    // The requirement is "no signal" within 1 s; it is measured and printed above (a few ms on an
    // idle machine). The assertion allows for a loaded 2-core machine: it checks the behaviour,
    // not the timing (timings belong to benchmarks).
    assertTrue(lost > 0 && lost - unplugged < 5_000_000_000L, "no signal after the unplug");
    assertTrue(restored > 0, "signal restored once the port is back");
    assertTrue(w.summary.accepted() >= 2);
  }

  /** A simulated DAQ writing to one pty end on its own thread. */
  private static final class Daq {
    private final SerialOutlet outlet;
    private final SimulatedDaq daq;
    private final Thread thread;

    Daq(Path port, DeviceProfile profile, long seed) throws Exception {
      outlet = new SerialOutlet(port.toString(), profile.serial());
      daq =
          new SimulatedDaq(
              new SimulatedRecording(ScenarioLoader.load("steady-cell"), seed),
              profile,
              List.of(),
              7,
              outlet);
      thread = new Thread(() -> daq.serve(30), "test-serial-daq");
      thread.setDaemon(true);
      thread.start();
    }

    void stop() throws InterruptedException {
      daq.stop();
      thread.join(5000);
      outlet.close();
    }
  }

  private static Process startSocat(Path a, Path b) throws Exception {
    Process socat;
    try {
      socat =
          new ProcessBuilder(
                  "socat", "-d", "-d", "pty,raw,echo=0,link=" + a, "pty,raw,echo=0,link=" + b)
              .start();
    } catch (IOException e) {
      Assumptions.abort("socat is not installed (.ci/run installs it): " + e.getMessage());
      throw e;
    }
    awaitPtys(socat, a, b);
    return socat;
  }

  private static void end(Process socat) throws InterruptedException {
    socat.destroy();
    if (!socat.waitFor(5, TimeUnit.SECONDS)) {
      socat.destroyForcibly();
    }
  }

  /** Waits (5 s at most) for socat's two "PTY is" lines and both links. */
  private static void awaitPtys(Process socat, Path a, Path b) throws Exception {
    CountDownLatch ptys = new CountDownLatch(2);
    Thread reader =
        new Thread(
            () -> {
              try (BufferedReader r =
                  new BufferedReader(
                      new InputStreamReader(socat.getErrorStream(), StandardCharsets.UTF_8))) {
                String line;
                while ((line = r.readLine()) != null) {
                  if (line.contains("PTY is")) {
                    ptys.countDown();
                  }
                }
              } catch (IOException e) {
                // The stream closes when socat is ended; before two PTY lines the latch fails
                // below.
                System.err.println("socat stderr closed: " + e.getMessage());
              }
            },
            "socat-stderr");
    reader.setDaemon(true);
    reader.start();
    assertTrue(ptys.await(5, TimeUnit.SECONDS), "socat did not report two PTYs within 5 s");
    long deadline = System.nanoTime() + 5_000_000_000L;
    while (!(Files.exists(a) && Files.exists(b)) && System.nanoTime() < deadline) {
      Thread.sleep(10);
    }
    assertTrue(Files.exists(a) && Files.exists(b), "socat links did not appear within 5 s");
  }
}
