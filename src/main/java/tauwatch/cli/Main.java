package tauwatch.cli;

import java.io.PrintWriter;
import picocli.CommandLine;
import picocli.CommandLine.Command;

/**
 * The {@code tauwatch} command: dispatches to its subcommands and turns every failure into one line
 * and a non-zero exit code.
 *
 * <p>Exit codes: 0 success, 1 bad input (a file, scenario or configuration that cannot be used), 2
 * bad usage (an unknown option or a malformed value), 3 a check that ran and failed.
 */
@Command(
    name = "tauwatch",
    mixinStandardHelpOptions = true,
    versionProvider = VersionProvider.class,
    description = {
      "Watches a patch-clamped cell's passive properties live: access resistance, input"
          + " resistance, capacitance, time constant and holding current, from every test pulse.",
      "It observes and alarms; it never drives the amplifier."
    },
    subcommands = {
      WatchCommand.class,
      ReplayCommand.class,
      SimulateCommand.class,
      CheckoutCommand.class,
      ReportCommand.class,
      BenchCommand.class,
      AccuracyCommand.class,
      CommandLine.HelpCommand.class
    })
public final class Main {
  public static final int EXIT_OK = 0;
  public static final int EXIT_BAD_INPUT = 1;
  public static final int EXIT_USAGE = 2;
  public static final int EXIT_CHECK_FAILED = 3;

  public static void main(String[] args) {
    System.exit(run(args, new PrintWriter(System.out, true), new PrintWriter(System.err, true)));
  }

  /** Runs a command line with the given outputs; returns the exit code. */
  public static int run(String[] args, PrintWriter out, PrintWriter err) {
    CommandLine cl = new CommandLine(new Main());
    cl.setOut(out);
    cl.setErr(err);
    cl.setParameterExceptionHandler(
        (ex, a) -> {
          String cmd = ex.getCommandLine().getCommandSpec().qualifiedName();
          err.println(cmd + ": " + firstLine(ex.getMessage()) + " (see " + cmd + " --help)");
          return EXIT_USAGE;
        });
    cl.setExecutionExceptionHandler(
        (ex, c, parsed) -> {
          String cmd = c.getCommandSpec().qualifiedName();
          if (ex instanceof UserInputException || ex instanceof ConfigException) {
            err.println(cmd + ": " + firstLine(ex.getMessage()));
            return EXIT_BAD_INPUT;
          }
          err.println(cmd + ": unexpected failure: " + firstLine(String.valueOf(ex)));
          return EXIT_BAD_INPUT;
        });
    return cl.execute(args);
  }

  static String firstLine(String s) {
    if (s == null) {
      return "";
    }
    int nl = s.indexOf('\n');
    return (nl < 0 ? s : s.substring(0, nl)).trim();
  }
}
