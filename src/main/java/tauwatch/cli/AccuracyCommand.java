package tauwatch.cli;

import java.io.PrintWriter;
import java.util.List;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import tauwatch.bench.AccuracyBenchmark;
import tauwatch.bench.AccuracyTable;

/**
 * {@code tauwatch accuracy}: the accuracy benchmark of the estimator against the raw-peak readout.
 */
@Command(
    name = "accuracy",
    mixinStandardHelpOptions = true,
    description = {
      "Simulates a grid of cells (Ra 5-40 MOhm, Rin 100 MOhm-2 GOhm, Cm 5-200 pF, with and"
          + " without a dendrite) under noise levels, filter cutoffs and sample rates, and prints"
          + " the median and 95th-percentile relative error of Ra, Rin, Cm and tau for Tauwatch's"
          + " estimator and for the raw-peak readout side by side.",
      "Exit 0 when the Ra error ratio (raw peak / Tauwatch) at a 10 kHz filter and 50 kHz"
          + " sampling is at least 10 at every noise level, 3 when it is not."
    })
final class AccuracyCommand implements Callable<Integer> {
  @Spec CommandSpec spec;

  @Option(
      names = "--grid",
      paramLabel = "quick|full",
      description =
          "quick (16 cells, 2 conditions, seconds) or full (72 cells, 24 conditions,"
              + " minutes); default: ${DEFAULT-VALUE}.")
  String grid = "full";

  @Option(
      names = "--threads",
      paramLabel = "N",
      description = "Worker threads (default: ${DEFAULT-VALUE}).")
  int threads = Math.min(2, Runtime.getRuntime().availableProcessors());

  @Option(names = "--detail", description = "Also print one row per cell and condition.")
  boolean detail;

  @Override
  public Integer call() throws Exception {
    AccuracyBenchmark.Grid g =
        switch (grid) {
          case "quick" -> AccuracyBenchmark.Grid.quick();
          case "full" -> AccuracyBenchmark.Grid.full();
          default ->
              throw new UserInputException("--grid must be quick or full, got '" + grid + "'");
        };
    if (threads < 1) {
      throw new UserInputException("--threads must be at least 1, got " + threads);
    }
    PrintWriter out = spec.commandLine().getOut();
    AccuracyBenchmark bench = new AccuracyBenchmark(g, threads);
    long t0 = System.nanoTime();
    List<AccuracyBenchmark.Result> results = bench.run();
    AccuracyTable.write(results, detail, out);
    out.printf(
        java.util.Locale.ROOT,
        "%d cells x %d conditions in %.1f s%n",
        bench.cells().size(),
        bench.conditions().size(),
        (System.nanoTime() - t0) * 1e-9);
    out.flush();
    double worst = AccuracyTable.worstHeadlineRatio(results);
    return Double.isNaN(worst) || worst >= 10 ? Main.EXIT_OK : Main.EXIT_CHECK_FAILED;
  }
}
