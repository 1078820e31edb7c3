package tauwatch.cli;

import java.awt.GraphicsEnvironment;
import java.nio.file.Path;
import java.time.Duration;
import java.util.concurrent.Callable;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicReference;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import tauwatch.monitor.MonitorConfig;
import tauwatch.monitor.MonitorResult;
import tauwatch.monitor.PulseEstimators;
import tauwatch.monitor.live.LiveSession;
import tauwatch.monitor.live.LiveSessionFactory;
import tauwatch.monitor.live.SessionControl;
import tauwatch.source.SampleSource;
import tauwatch.view.LiveViewLauncher;

/** {@code tauwatch watch}: the live monitor. */
@Command(
    name = "watch",
    mixinStandardHelpOptions = true,
    description = {
      "Watches a cell live: finds every test pulse, fits it, prints the estimates with their"
          + " health state, and logs params.csv, events.csv and session.json.",
      "With no options it watches the built-in simulated cell, in a window when a display is"
          + " present (--headless for the console)."
    })
final class WatchCommand implements Callable<Integer> {
  @Spec CommandSpec spec;

  @Option(
      names = "--source",
      paramLabel = "URI",
      description =
          "sim, sim:SCENARIO (a built-in name or a .toml file), tcp://HOST:PORT, serial:DEVICE or"
              + " file:PATH (an interchange CSV or a raw capture). Default: the device address in"
              + " --profile if one is given, else sim.")
  String source;

  @Option(
      names = "--profile",
      paramLabel = "FILE|NAME",
      description =
          "Device profile for tcp:// and serial: sources: a drivers/*.toml file or a built-in name"
              + " (simulator, usb-board-16bit, usb-board-text, network-daq-float32; default:"
              + " simulator).")
  String profile;

  @Option(
      names = "--capture",
      paramLabel = "FILE",
      description =
          "Record the device stream as received (raw capture with the profile in its header), for"
              + " replay FILE or --source file:FILE later.")
  Path capture;

  @Option(names = "--headless", description = "Console only, even when a display is present.")
  boolean headless;

  @Option(
      names = "--duration",
      paramLabel = "TIME",
      converter = DurationConverter.class,
      description = "Stop after this much stream time, e.g. 20s, 5m, 2h (default: until Ctrl-C).")
  Duration duration;

  @Option(
      names = "--no-pacing",
      description = "Run the simulator as fast as the analysis goes, not in real time.")
  boolean noPacing;

  @Option(names = "--seed", paramLabel = "N", description = "Noise seed for the simulator.")
  Long seed;

  @Option(names = "--quiet", description = "Print events only, not every pulse.")
  boolean quiet;

  @Mixin SessionOptions session;

  @Override
  public Integer call() throws Exception {
    MonitorConfig config = ConfigLoader.load(session.config);
    double filterHz =
        session.filterCutoffHz != null ? session.filterCutoffHz : config.filterCutoffHz();
    String uri = source;
    if (uri == null) {
      uri = profile == null ? "sim" : SourceOpener.uriOf(SourceOpener.profile(profile));
    }
    SourceOpener.Opened opened =
        SourceOpener.open(uri, !noPacing, seed, filterHz, profile, capture);
    SampleSource src = opened.source();
    if (!headless && !GraphicsEnvironment.isHeadless()) {
      return watchInWindow(src, config, filterHz);
    }
    MonitorResult r;
    try (opened) {
      r =
          SessionRunner.run(
              src,
              config,
              session,
              duration,
              !quiet,
              spec.commandLine().getOut(),
              m -> {
                if (opened.profile() != null) {
                  m.sessionField("device_profile", opened.profileField());
                }
                if (opened.capture() != null) {
                  m.sessionField("capture", opened.capture().file().toString());
                }
              });
    }
    return r.complete() ? Main.EXIT_OK : Main.EXIT_BAD_INPUT;
  }

  /** The live view: runs until the window is closed; later sessions start from its controls. */
  private int watchInWindow(SampleSource first, MonitorConfig config, double filterHz)
      throws UserInputException, InterruptedException {
    LiveSession firstSession = startLive(first, config);
    AtomicReference<LiveSession> current = new AtomicReference<>(firstSession);
    LiveSessionFactory factory =
        uri -> {
          try {
            LiveSession s = startLive(SourceOpener.open(uri, !noPacing, seed, filterHz), config);
            current.set(s);
            return s;
          } catch (UserInputException e) {
            throw new IllegalArgumentException(e.getMessage(), e);
          }
        };
    // Ctrl-C or a kill while the window is open: end the session so its files close cleanly.
    Thread hook =
        new Thread(
            () -> {
              LiveSession s = current.get();
              s.stop();
              try {
                s.awaitEnd(10, TimeUnit.SECONDS);
              } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
              }
            },
            "tauwatch-shutdown");
    Runtime.getRuntime().addShutdownHook(hook);
    SessionControl last = LiveViewLauncher.show(factory, firstSession);
    try {
      Runtime.getRuntime().removeShutdownHook(hook);
    } catch (IllegalStateException shuttingDown) {
      // The JVM is already exiting and runs the hook itself.
      return Main.EXIT_OK;
    }
    last.stop();
    if (last instanceof LiveSession ls && !ls.awaitEnd(15, TimeUnit.SECONDS)) {
      spec.commandLine().getErr().println("watch: the session did not close its logs in 15 s");
      return Main.EXIT_BAD_INPUT;
    }
    if (last.sessionDir() != null) {
      spec.commandLine().getOut().println("session folder: " + last.sessionDir());
    }
    return Main.EXIT_OK;
  }

  private LiveSession startLive(SampleSource src, MonitorConfig config) throws UserInputException {
    try {
      return LiveSession.start(
          src, config, PulseEstimators.forFormat(src.format(), config), session.logDir, duration);
    } catch (IllegalArgumentException e) {
      throw new UserInputException(src.name() + ": " + e.getMessage());
    }
  }
}
