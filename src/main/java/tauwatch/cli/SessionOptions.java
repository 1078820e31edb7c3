package tauwatch.cli;

import java.nio.file.Path;
import picocli.CommandLine.Option;
import tauwatch.record.SessionFolder;

/** Options every analysing command shares: where the logs go and which configuration applies. */
final class SessionOptions {
  @Option(
      names = "--log-dir",
      paramLabel = "DIR",
      description = "Folder for session folders (default: ${DEFAULT-VALUE}).")
  Path logDir = SessionFolder.defaultLogDir();

  @Option(
      names = "--config",
      paramLabel = "FILE",
      description = "Monitor configuration (TOML) overriding the built-in defaults.")
  Path config;

  @Option(
      names = "--filter-cutoff-hz",
      paramLabel = "HZ",
      description =
          "Cutoff of the amplifier's 4-pole Bessel filter the data went through, where the source"
              + " does not say (overrides amplifier.filter_cutoff_hz).")
  Double filterCutoffHz;

  @Option(
      names = "--no-report",
      description =
          "Do not write spans.csv, the trend plots and report.html when the session ends.")
  boolean noReport;
}
