package tauwatch.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.time.Duration;
import java.util.concurrent.Callable;
import java.util.concurrent.atomic.AtomicReference;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import tauwatch.checkout.CheckoutExpectation;
import tauwatch.checkout.CheckoutExpectationLoader;
import tauwatch.checkout.CheckoutReport;
import tauwatch.checkout.RigCheckout;
import tauwatch.monitor.Monitor;
import tauwatch.monitor.MonitorConfig;
import tauwatch.monitor.MonitorResult;
import tauwatch.source.SampleSource;
import tauwatch.source.SimulatedSource;

/** {@code tauwatch checkout}: proves the chain reads a known cell right. */
@Command(
    name = "checkout",
    mixinStandardHelpOptions = true,
    description = {
      "Runs the whole chain against a known cell and prints a pass/fail table: each parameter's"
          + " expected value, measured median and spread, tolerance and verdict, plus noise, sample"
          + " rate, dropped and corrupt frames and lost samples. Exit 0 when all pass, 3 when any"
          + " fails. The table is also written to checkout.txt in the session folder.",
      "With --source sim (the default) and no --expect, the expectation is the simulated cell's"
          + " own truth; with --expect, the nominal values of a model circuit"
          + " (simulator/checkout/*.toml)."
    })
final class CheckoutCommand implements Callable<Integer> {
  @Spec CommandSpec spec;

  @Option(
      names = "--source",
      paramLabel = "URI",
      description =
          "What to check: sim:SCENARIO, tcp://HOST:PORT, serial:DEVICE or file:PATH (default:"
              + " the expectation's simulated twin).")
  String source;

  @Option(
      names = "--expect",
      paramLabel = "NAME|FILE",
      description =
          "Expected values and tolerances: a built-in model circuit (model-circuit) or a file.")
  String expect;

  @Option(
      names = "--duration",
      paramLabel = "TIME",
      converter = DurationConverter.class,
      description = "Stream time to check for (default: ${DEFAULT-VALUE}).")
  Duration duration = Duration.ofSeconds(10);

  @Option(
      names = "--profile",
      paramLabel = "FILE|NAME",
      description = "Device profile for tcp:// and serial: sources (default: simulator).")
  String profile;

  @Option(names = "--seed", paramLabel = "N", description = "Noise seed for the simulator.")
  Long seed;

  @Option(names = "--paced", description = "Run the in-process simulator in real time.")
  boolean paced;

  @Mixin SessionOptions session;

  @Override
  public Integer call() throws Exception {
    PrintWriter out = spec.commandLine().getOut();
    MonitorConfig config = ConfigLoader.load(session.config);
    CheckoutExpectation limits;
    try {
      limits =
          CheckoutExpectationLoader.load(
              expect == null ? CheckoutExpectationLoader.DEFAULT : expect);
    } catch (IllegalArgumentException e) {
      throw new UserInputException(e.getMessage());
    }
    String uri = source;
    if (uri == null) {
      if (limits.scenario() == null) {
        throw new UserInputException(
            "--expect " + expect + " names no simulated twin; give --source");
      }
      uri = "sim:" + limits.scenario();
    }
    double filterHz =
        session.filterCutoffHz != null ? session.filterCutoffHz : config.filterCutoffHz();
    SourceOpener.Opened opened = SourceOpener.open(uri, paced, seed, filterHz, profile, null);
    SampleSource src = opened.source();
    CheckoutExpectation expectation = limits;
    if (expect == null && src instanceof SimulatedSource sim) {
      double mid = duration.toNanos() * 0.5e-9;
      expectation =
          CheckoutExpectationLoader.fromTruth(
              sim.recording().scenario().name(), sim.recording().truthAt(mid), limits);
    }
    RigCheckout checkout = new RigCheckout(expectation);
    AtomicReference<Monitor> monitor = new AtomicReference<>();
    MonitorResult r =
        SessionRunner.run(
            src,
            config,
            session,
            duration,
            false,
            out,
            m -> {
              m.addListener(checkout);
              monitor.set(m);
              if (opened.profile() != null) {
                m.sessionField("device_profile", opened.profileField());
              }
            });
    CheckoutReport report =
        checkout.judge(monitor.get().counters(), src.format().sampleRateHz(), src.live());
    String table = report.table();
    out.print(table);
    out.flush();
    try {
      Files.writeString(r.sessionDir().resolve("checkout.txt"), table, StandardCharsets.UTF_8);
    } catch (IOException e) {
      throw new UserInputException("cannot write checkout.txt: " + e.getMessage(), e);
    }
    if (!r.complete()) {
      return Main.EXIT_BAD_INPUT;
    }
    return report.allPass() ? Main.EXIT_OK : Main.EXIT_CHECK_FAILED;
  }
}
