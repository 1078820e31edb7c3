package tauwatch.cli;

import java.io.IOException;
import java.io.PrintStream;
import java.io.PrintWriter;
import java.time.Duration;
import java.util.Locale;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.TimeUnit;
import java.util.function.Consumer;
import tauwatch.fit.Parameter;
import tauwatch.monitor.EstimateSummary;
import tauwatch.monitor.Monitor;
import tauwatch.monitor.MonitorConfig;
import tauwatch.monitor.MonitorResult;
import tauwatch.monitor.PulseEstimators;
import tauwatch.record.ConsoleReporter;
import tauwatch.source.SampleSource;
import tauwatch.source.SourceException;

/** Runs one session for a command: console output, Ctrl-C handling and the closing summary. */
final class SessionRunner {
  private static final Parameter[] SUMMARY = {
    Parameter.ACCESS_RESISTANCE,
    Parameter.INPUT_RESISTANCE,
    Parameter.TOTAL_RESISTANCE,
    Parameter.MEMBRANE_CAPACITANCE,
    Parameter.CHARGE_CAPACITANCE,
    Parameter.TIME_CONSTANT,
    Parameter.HOLDING_CURRENT,
    Parameter.RESTING_POTENTIAL
  };

  private SessionRunner() {}

  static MonitorResult run(
      SampleSource source,
      MonitorConfig config,
      SessionOptions session,
      Duration duration,
      boolean everyPulse,
      PrintWriter out)
      throws UserInputException, IOException, InterruptedException {
    return run(source, config, session, duration, everyPulse, out, m -> {});
  }

  /**
   * @param customise called with the monitor before it runs: extra listeners, session fields
   */
  static MonitorResult run(
      SampleSource source,
      MonitorConfig config,
      SessionOptions session,
      Duration duration,
      boolean everyPulse,
      PrintWriter out,
      Consumer<Monitor> customise)
      throws UserInputException, IOException, InterruptedException {
    PrintStream console = new PrintStream(new WriterOutputStream(out), true);
    ConsoleReporter reporter = new ConsoleReporter(console, everyPulse);
    EstimateSummary summary = new EstimateSummary();
    Monitor monitor;
    try {
      monitor =
          new Monitor(
              source, config, PulseEstimators.forFormat(source.format(), config), session.logDir);
    } catch (IllegalArgumentException e) {
      throw new UserInputException(source.name() + ": " + e.getMessage());
    }
    monitor.addListener(reporter::onEstimate).addListener(summary).addEventListener(reporter);
    customise.accept(monitor);
    CountDownLatch finished = new CountDownLatch(1);
    Thread hook =
        new Thread(
            () -> {
              monitor.stop();
              try {
                finished.await(15, TimeUnit.SECONDS);
              } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
              }
            },
            "tauwatch-shutdown");
    Runtime.getRuntime().addShutdownHook(hook);
    MonitorResult result;
    try {
      result = monitor.run(duration);
    } catch (SourceException e) {
      throw new UserInputException(e.getMessage(), e);
    } finally {
      finished.countDown();
      removeHook(hook);
    }
    printSummary(result, summary, out);
    if (!session.noReport && result.sessionDir() != null) {
      ReportCommand.writeReport(result.sessionDir(), out);
    }
    return result;
  }

  /** Removes the Ctrl-C hook; false when the JVM is already shutting down and runs it. */
  private static boolean removeHook(Thread hook) {
    try {
      return Runtime.getRuntime().removeShutdownHook(hook);
    } catch (IllegalStateException shuttingDown) {
      return false;
    }
  }

  static void printSummary(MonitorResult r, EstimateSummary s, PrintWriter out) {
    out.printf(
        Locale.ROOT,
        "%s: %d samples, %d pulses, %d accepted, %d gaps, %d samples overrun%n",
        r.status(),
        r.samples(),
        r.pulses(),
        r.accepted(),
        r.gaps(),
        r.overrunSamples());
    if (s.accepted() > 0) {
      out.println("median of accepted pulses (5th–95th percentile):");
      for (Parameter p : SUMMARY) {
        if (s.count(p) > 0) {
          out.printf(
              Locale.ROOT,
              "  %-6s %10.4g %-3s (%.4g – %.4g)%n",
              p.symbol(),
              s.median(p),
              p.unit(),
              s.quantile(p, 0.05),
              s.quantile(p, 0.95));
        }
      }
    }
    out.println("session folder: " + r.sessionDir());
    out.flush();
  }
}
