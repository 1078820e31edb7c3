package tauwatch.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.net.ServerSocket;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import tauwatch.sim.serve.FaultKind;

/** The wire commands as a user runs them: simulate --serve, watch over TCP, replay, checkout. */
class WireCommandsTest {
  @TempDir Path dir;

  /** One command line's exit code and output. */
  record Run(int code, String out, String err) {}

  static Run run(String... args) {
    StringWriter out = new StringWriter();
    StringWriter err = new StringWriter();
    int code = Main.run(args, new PrintWriter(out, true), new PrintWriter(err, true));
    return new Run(code, out.toString(), err.toString());
  }

  private static int freePort() throws Exception {
    try (ServerSocket s = new ServerSocket(0)) {
      return s.getLocalPort();
    }
  }

  @Test
  void simulateServesAndWatchReadsOverTcpAndTheCaptureReplays() throws Exception {
    int port = freePort();
    String uri = "tcp://127.0.0.1:" + port;
    AtomicInteger serveCode = new AtomicInteger(-1);
    StringWriter serveOut = new StringWriter();
    Thread server =
        new Thread(
            () ->
                serveCode.set(
                    Main.run(
                        new String[] {
                          "simulate", "--serve", uri, "--duration", "4s", "--seed", "3"
                        },
                        new PrintWriter(serveOut, true),
                        new PrintWriter(new StringWriter(), true))),
            "test-simulate");
    server.start();
    Path capture = dir.resolve("run.twcap");
    Run watch =
        run(
            "watch",
            "--headless",
            "--quiet",
            "--source",
            uri,
            "--duration",
            "2500ms",
            "--capture",
            capture.toString(),
            "--log-dir",
            dir.resolve("logs").toString());
    server.join(15_000);
    assertEquals(0, watch.code(), watch.err());
    assertTrue(watch.out().contains("complete"), watch.out());
    assertEquals(0, serveCode.get(), serveOut.toString());
    assertTrue(
        serveOut.toString().contains("serving sim:steady-cell on " + uri), serveOut.toString());
    Path session;
    try (Stream<Path> s = Files.list(dir.resolve("logs"))) {
      session = s.findFirst().orElseThrow();
    }
    String json = Files.readString(session.resolve("session.json"), StandardCharsets.UTF_8);
    assertTrue(json.contains("device_profile") && json.contains("simulator"), json);

    Run replay = run("replay", capture.toString(), "--log-dir", dir.resolve("replay").toString());
    assertEquals(0, replay.code(), replay.err());
    assertTrue(replay.out().contains("complete"), replay.out());
    assertTrue(replay.out().contains("Ra"), replay.out());
  }

  @Test
  void helpListsEveryFaultKindAndTheNewOptions() {
    String help = run("simulate", "--help").out();
    for (FaultKind k : FaultKind.values()) {
      assertTrue(help.contains(k.code() + " ("), k.code() + " missing from simulate --help");
    }
    String watch = run("watch", "--help").out();
    assertTrue(watch.contains("--profile") && watch.contains("--capture"), watch);
    assertTrue(run("checkout", "--help").out().contains("--expect"));
  }

  @Test
  void servingBeyondLoopbackNeedsAnExplicitFlagAndBadInputGetsOneLine() {
    Run remote = run("simulate", "--serve", "tcp://10.1.2.3:4000", "--duration", "1s");
    assertEquals(Main.EXIT_BAD_INPUT, remote.code());
    assertTrue(remote.err().contains("not a loopback address"), remote.err());
    assertEquals(1, remote.err().strip().lines().count());
    Run fault = run("simulate", "--serve", "tcp://127.0.0.1:4000", "--fault", "gremlins");
    assertEquals(Main.EXIT_BAD_INPUT, fault.code());
    assertTrue(fault.err().contains("unknown kind"), fault.err());
    Run profile = run("watch", "--source", "tcp://127.0.0.1:4000", "--profile", "no-such-rig");
    assertEquals(Main.EXIT_BAD_INPUT, profile.code());
    assertTrue(profile.err().contains("no-such-rig"), profile.err());
  }

  @Test
  void checkoutPassesOnTheSimulatedModelCircuit() throws Exception {
    Run r =
        run(
            "checkout",
            "--expect",
            "model-circuit",
            "--duration",
            "5s",
            "--log-dir",
            dir.toString());
    System.out.println(r.out());
    assertEquals(Main.EXIT_OK, r.code(), r.out() + r.err());
    assertTrue(r.out().contains("PASS"), r.out());
    Path session;
    try (Stream<Path> s = Files.list(dir)) {
      session = s.findFirst().orElseThrow();
    }
    assertTrue(Files.readString(session.resolve("checkout.txt")).contains("PASS"));
  }

  @Test
  void checkoutFailsAndNamesTheRowWhenTheCellIsOutsideTheTolerance() throws Exception {
    // The model circuit with a 13 MΩ series resistor: 30 % above the nominal 10 MΩ.
    Path scenario = dir.resolve("worn-circuit.toml");
    String text =
        new String(
                WireCommandsTest.class
                    .getResourceAsStream("/tauwatch/simulator/model-circuit.toml")
                    .readAllBytes(),
                StandardCharsets.UTF_8)
            .replace("access_mohm = 10.0", "access_mohm = 13.0")
            .replace("name = \"model-circuit\"", "name = \"worn-circuit\"");
    Files.writeString(scenario, text);
    Run r =
        run(
            "checkout",
            "--source",
            "sim:" + scenario,
            "--expect",
            "model-circuit",
            "--duration",
            "5s",
            "--log-dir",
            dir.resolve("logs").toString());
    System.out.println(r.out());
    assertEquals(Main.EXIT_CHECK_FAILED, r.code(), r.out() + r.err());
    String raRow = r.out().lines().filter(l -> l.startsWith("Ra ")).findFirst().orElseThrow();
    assertTrue(raRow.endsWith("FAIL"), raRow);
    assertTrue(r.out().contains("FAIL (Ra"), r.out());
  }

  @Test
  void checkoutOverTcpMeasuresTheSampleRateAgainstTheWallClock() throws Exception {
    int port = freePort();
    String uri = "tcp://127.0.0.1:" + port;
    Thread server =
        new Thread(
            () ->
                Main.run(
                    new String[] {
                      "simulate", "--serve", uri, "--scenario", "model-circuit", "--duration", "5s"
                    },
                    new PrintWriter(new StringWriter(), true),
                    new PrintWriter(new StringWriter(), true)),
            "test-simulate");
    server.start();
    Run r =
        run(
            "checkout",
            "--source",
            uri,
            "--expect",
            "model-circuit",
            "--duration",
            "3500ms",
            "--log-dir",
            dir.toString());
    server.join(15_000);
    System.out.println(r.out());
    assertEquals(Main.EXIT_OK, r.code(), r.out() + r.err());
    String rate =
        r.out().lines().filter(l -> l.startsWith("sample rate")).findFirst().orElseThrow();
    assertTrue(rate.contains("vs wall clock") && rate.endsWith("pass"), rate);
  }
}
