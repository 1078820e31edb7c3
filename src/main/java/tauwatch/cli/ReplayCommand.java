package tauwatch.cli;

import java.nio.file.Path;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import tauwatch.monitor.MonitorConfig;
import tauwatch.monitor.MonitorResult;
import tauwatch.source.SampleSource;

/** {@code tauwatch replay FILE}: analyses a recorded stream as fast as possible. */
@Command(
    name = "replay",
    mixinStandardHelpOptions = true,
    description = {
      "Analyses a recorded stream as fast as possible and writes the same logs as watch.",
      "FILE is an interchange CSV (header t_s,cmd_mV,im_pA for voltage clamp or t_s,cmd_pA,vm_mV"
          + " for current clamp, then one row per sample) or a raw capture made by watch --capture"
          + " (decoded again with the device profile stored in it); the content tells which."
    })
final class ReplayCommand implements Callable<Integer> {
  @Spec CommandSpec spec;

  @Parameters(index = "0", paramLabel = "FILE", description = "The recording to analyse.")
  Path file;

  @Option(names = "--print-pulses", description = "Print one line per pulse estimate.")
  boolean printPulses;

  @Mixin SessionOptions session;

  @Override
  public Integer call() throws Exception {
    MonitorConfig config = ConfigLoader.load(session.config);
    double filterHz =
        session.filterCutoffHz != null ? session.filterCutoffHz : config.filterCutoffHz();
    SourceOpener.Opened opened = SourceOpener.openFile(file, filterHz);
    SampleSource src = opened.source();
    MonitorResult r =
        SessionRunner.run(
            src,
            config,
            session,
            null,
            printPulses,
            spec.commandLine().getOut(),
            m -> {
              if (opened.profile() != null) {
                m.sessionField("device_profile", opened.profileField());
              }
            });
    return r.complete() ? Main.EXIT_OK : Main.EXIT_BAD_INPUT;
  }
}
