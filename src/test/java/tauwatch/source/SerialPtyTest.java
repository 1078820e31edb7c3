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
class SerialPtyTest {
  @TempDir Path dir;

  @Test
  void estimatesOverASerialPseudoTerminalMatchTheTruth() throws Exception {
    Path a = dir.resolve("ttyA");
    Path b = dir.resolve("ttyB");
    Process socat;
    try {
      socat =
          new ProcessBuilder(
                  "socat", "-d", "-d", "pty,raw,echo=0,link=" + a, "pty,raw,echo=0,link=" + b)
              .start();
    } catch (IOException e) {
      Assumptions.abort("socat is not installed (.ci/run installs it): " + e.getMessage());
      return;
    }
    try {
      awaitPtys(socat, a, b);
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
      socat.destroy();
      if (!socat.waitFor(5, TimeUnit.SECONDS)) {
        socat.destroyForcibly();
      }
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
                // socat ended; the latch times out below with a clear message.
                System.err.println("socat stderr: " + e.getMessage());
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
