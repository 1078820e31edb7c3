package tauwatch.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import tauwatch.record.LogFormatException;
import tauwatch.record.SessionLogs;
import tauwatch.record.SessionReport;

/** {@code tauwatch report SESSION_DIR}: the end-of-recording report of a session folder. */
@Command(
    name = "report",
    mixinStandardHelpOptions = true,
    description = {
      "Reads a session folder's params.csv, events.csv and session.json and writes into it:"
          + " spans.csv (the usable spans), one PNG trend plot per parameter and report.html, a"
          + " single self-contained file with the metadata, plots, summary table and events.",
      "Prints the usable spans and the summary table."
    })
final class ReportCommand implements Callable<Integer> {
  @Spec CommandSpec spec;

  @Parameters(index = "0", paramLabel = "SESSION_DIR", description = "The session folder.")
  Path dir;

  @Override
  public Integer call() throws Exception {
    writeReport(dir, spec.commandLine().getOut());
    return Main.EXIT_OK;
  }

  /** Writes the report of a session folder and prints its spans and summary. */
  static void writeReport(Path dir, PrintWriter out) throws UserInputException, IOException {
    // Plots are drawn with Java2D; no display is needed or wanted.
    System.setProperty("java.awt.headless", "true");
    SessionReport report;
    try {
      report = new SessionReport(SessionLogs.read(dir));
    } catch (LogFormatException e) {
      throw new UserInputException(e.getMessage(), e);
    }
    Path html = report.write();
    out.println("usable spans (every judged parameter within its criteria):");
    out.print(report.spansText());
    out.println("summary (accepted pulses):");
    out.print(report.summaryText());
    out.println("report: " + html);
    out.flush();
  }
}
