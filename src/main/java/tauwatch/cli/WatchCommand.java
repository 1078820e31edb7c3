package tauwatch.cli;

import java.awt.GraphicsEnvironment;
import java.nio.file.Path;
import java.time.Duration;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import tauwatch.monitor.MonitorConfig;
import tauwatch.monitor.MonitorResult;
import tauwatch.source.SampleSource;

/** {@code tauwatch watch}: the live monitor. */
@Command(
    name = "watch",
    mixinStandardHelpOptions = true,
    description = {
      "Watches a cell live: finds every test pulse, fits it, prints the estimates with their"
          + " health state, and logs params.csv, events.csv and session.json.",
      "With no options it watches the built-in simulated cell."
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
      spec.commandLine()
          .getErr()
          .println("watch: the live view is not in this version; watching on the console");
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
}
