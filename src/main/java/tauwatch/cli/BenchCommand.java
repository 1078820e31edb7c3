package tauwatch.cli;

import java.io.PrintWriter;
import java.lang.management.ManagementFactory;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import tauwatch.bench.LiveRuns;
import tauwatch.bench.SpeedBench;
import tauwatch.bench.StaminaRun;

/** {@code tauwatch bench}: measures speed, latency, allocation and headroom, or stamina. */
@Command(
    name = "bench",
    mixinStandardHelpOptions = true,
    description = {
      "Measures the chain on this machine and prints tables beside a naive pipeline measured in"
          + " the same run: decoder, pulse segmenter and per-pulse fit, the whole chain in replay,"
          + " latency and allocation under live pacing, and headroom.",
      "With --stamina it instead records a simulated day faster than real time and reports heap"
          + " per simulated hour, rows against pulses, gaps, overruns and GC pauses.",
      "Exit 0 when every target is met, 3 when one is missed."
    })
final class BenchCommand implements Callable<Integer> {
  @Spec CommandSpec spec;

  @Option(
      names = "--chain-seconds",
      defaultValue = "300",
      description = "Stream seconds in the whole-chain capture (default: ${DEFAULT-VALUE}).")
  double chainSeconds;

  @Option(
      names = "--rounds",
      defaultValue = "5",
      description = "Timed rounds per figure; the median is printed (default: ${DEFAULT-VALUE}).")
  int rounds;

  @Option(
      names = "--latency-seconds",
      defaultValue = "60",
      description = "Length of the paced latency run (default: ${DEFAULT-VALUE}).")
  double latencySeconds;

  @Option(
      names = "--headroom-seconds",
      defaultValue = "8",
      description = "Length of each paced headroom run (default: ${DEFAULT-VALUE}).")
  double headroomSeconds;

  @Option(
      names = "--only",
      split = ",",
      paramLabel = "SECTION",
      description =
          "Run only these sections: decoder, fit (segmenter and fit), chain, latency (with"
              + " allocation), headroom (default: all).")
  java.util.List<String> only;

  @Option(
      names = "--stamina",
      description = "Run the stamina recording instead of the speed tables.")
  boolean stamina;

  @Option(
      names = "--hours",
      defaultValue = "24",
      description = "Simulated hours of the stamina run (default: ${DEFAULT-VALUE}).")
  double hours;

  @Option(
      names = "--work-dir",
      description = "Where captures and session folders go (default: a new temporary folder).")
  Path workDir;

  @Override
  public Integer call() throws Exception {
    if (rounds < 1
        || chainSeconds < 10
        || latencySeconds < 10
        || headroomSeconds < 2
        || hours <= 0) {
      throw new UserInputException(
          "--rounds must be ≥ 1, --chain-seconds and --latency-seconds ≥ 10, --headroom-seconds ≥"
              + " 2, --hours > 0");
    }
    java.util.Set<String> all = java.util.Set.of("decoder", "fit", "chain", "latency", "headroom");
    java.util.Set<String> sections = only == null ? all : java.util.Set.copyOf(only);
    for (String sName : sections) {
      if (!all.contains(sName)) {
        throw new UserInputException(
            "--only: unknown section '" + sName + "' (decoder, fit, chain, latency, headroom)");
      }
    }
    PrintWriter out = spec.commandLine().getOut();
    Path dir =
        workDir != null
            ? Files.createDirectories(workDir)
            : Files.createTempDirectory("tauwatch-bench");
    out.println(machine("start"));
    boolean ok;
    if (stamina) {
      ok = new StaminaRun(out, dir, hours).run();
    } else {
      ok = new SpeedBench(out, dir, chainSeconds, rounds).run(sections);
      ok &= new LiveRuns(out, dir, latencySeconds, headroomSeconds).run(sections);
    }
    out.println(machine("end"));
    out.println("work folder: " + dir);
    out.println(ok ? "all targets met" : "some targets missed (see above)");
    out.flush();
    return ok ? Main.EXIT_OK : Main.EXIT_CHECK_FAILED;
  }

  private static String machine(String when) {
    return String.format(
        Locale.ROOT,
        "machine at %s: %d cores, load average %.2f, Java %s, max heap %d MB",
        when,
        Runtime.getRuntime().availableProcessors(),
        ManagementFactory.getOperatingSystemMXBean().getSystemLoadAverage(),
        System.getProperty("java.version"),
        Runtime.getRuntime().maxMemory() >> 20);
  }
}
