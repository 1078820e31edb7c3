package tauwatch.bench;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.stream.Stream;
import tauwatch.fit.PulseEstimate;
import tauwatch.monitor.Monitor;
import tauwatch.monitor.MonitorConfig;
import tauwatch.monitor.MonitorResult;
import tauwatch.monitor.PulseEstimators;
import tauwatch.source.CaptureFileSource;

/**
 * The product's whole chain over a raw capture, as {@code tauwatch replay} runs it: capture bytes →
 * decoder → ring → segmenter → estimator → health → {@code params.csv}.
 *
 * <p>{@link #run} blocks the caller; the monitor runs its own source and analysis threads.
 */
public final class ChainReplay {
  /** What one replay did, with every estimate for the comparison with the naive pipeline. */
  public record Result(
      MonitorResult monitor, double seconds, long paramsRows, List<PulseEstimate> estimates) {}

  private ChainReplay() {}

  public static Result run(Path capture, Path logDir) throws IOException, InterruptedException {
    MonitorConfig config = MonitorConfig.defaults();
    CaptureFileSource source = new CaptureFileSource(capture);
    List<PulseEstimate> estimates = new ArrayList<>();
    Monitor m =
        new Monitor(source, config, PulseEstimators.forFormat(source.format(), config), logDir);
    m.addListener((e, h) -> estimates.add(e));
    long t0 = System.nanoTime();
    MonitorResult r = m.run((Duration) null);
    double s = (System.nanoTime() - t0) * 1e-9;
    return new Result(r, s, dataRows(r.sessionDir().resolve("params.csv")), estimates);
  }

  /** Rows of a CSV file after its header. */
  public static long dataRows(Path csv) throws IOException {
    try (Stream<String> lines = Files.lines(csv)) {
      return lines.count() - 1;
    }
  }
}
