package tauwatch.bench.naive;

import java.io.BufferedWriter;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.BlockingQueue;
import java.util.concurrent.LinkedBlockingQueue;
import tauwatch.pulse.SegmenterOptions;
import tauwatch.record.RawCaptureReader;
import tauwatch.wire.DeviceProfile;
import tauwatch.wire.DeviceProfileLoader;
import tauwatch.wire.ProfileException;

/**
 * The naive chain end to end: a reader thread decodes a raw capture into {@link Sample} objects and
 * puts each on a bounded {@link LinkedBlockingQueue}; a consumer thread takes them one by one,
 * finds the pulses, fits them and writes one {@code params.csv} row per pulse with {@link
 * String#format}, flushed as written (as the product's log is).
 *
 * <p>{@link #run} blocks the caller until both threads end. The baseline of {@code tauwatch bench}.
 */
public final class NaivePipeline {
  /** Queue bound: a first version picks a round number. */
  static final int QUEUE_CAPACITY = 100_000;

  /** What one run did. */
  public record Result(long samples, long pulses, double seconds, List<NaiveEstimate> estimates) {}

  private NaivePipeline() {}

  /** Replays {@code capture} and writes {@code paramsCsv}. */
  public static Result run(Path capture, Path paramsCsv)
      throws IOException, InterruptedException, ProfileException {
    DeviceProfile profile;
    try (RawCaptureReader r = new RawCaptureReader(capture)) {
      profile = DeviceProfileLoader.parse(capture.toString(), r.profileToml());
    }
    BlockingQueue<Sample> queue = new LinkedBlockingQueue<>(QUEUE_CAPACITY);
    List<NaiveEstimate> estimates = new ArrayList<>();
    long[] samples = {0};
    Throwable[] failure = {null};
    long t0 = System.nanoTime();
    Thread reader =
        new Thread(
            () -> {
              NaiveFrameReader frames =
                  new NaiveFrameReader(
                      profile,
                      s -> {
                        try {
                          queue.put(s);
                        } catch (InterruptedException e) {
                          Thread.currentThread().interrupt();
                          throw new IllegalStateException(e);
                        }
                      });
              try (RawCaptureReader r = new RawCaptureReader(capture)) {
                while (r.next()) {
                  if (r.type() == RawCaptureReader.BYTES) {
                    frames.accept(r.payload(), r.payloadOffset(), r.length(), r.nanos());
                  }
                }
                queue.put(Sample.END);
              } catch (IOException | InterruptedException | RuntimeException e) {
                failure[0] = e;
                queue.offer(Sample.END);
              }
            },
            "naive-reader");
    SegmenterOptions seg = SegmenterOptions.defaults();
    try (BufferedWriter out = Files.newBufferedWriter(paramsCsv, StandardCharsets.UTF_8)) {
      out.write("t_s,pulse,ra_mohm,rin_mohm,rt_mohm,cm_pf,tau_ms,hold_pa,accepted\n");
      NaivePulseFinder finder =
          new NaivePulseFinder(
              profile.sampleRateHz(),
              seg.edgeThreshold(),
              seg.baselineMs(),
              seg.maxStepMs(),
              seg.offWindowMs(),
              new NaiveEstimator(profile.filterCutoffHz()),
              e -> {
                estimates.add(e);
                try {
                  out.write(
                      String.format(
                          Locale.ROOT,
                          "%.6f,%d,%.4f,%.4f,%.4f,%.4f,%.5f,%.3f,%b%n",
                          e.onsetS(),
                          e.pulse(),
                          e.raMOhm(),
                          e.rinMOhm(),
                          e.rtMOhm(),
                          e.cmPf(),
                          e.tauMs(),
                          e.holdPa(),
                          e.accepted()));
                  out.flush();
                } catch (IOException ex) {
                  throw new UncheckedIOException(ex);
                }
              });
      reader.start();
      while (true) {
        Sample s = queue.take();
        if (s == Sample.END) {
          break;
        }
        samples[0]++;
        finder.onSample(s);
      }
    }
    reader.join();
    if (failure[0] != null) {
      throw new IOException("naive reader failed: " + failure[0], failure[0]);
    }
    double seconds = (System.nanoTime() - t0) * 1e-9;
    return new Result(samples[0], estimates.size(), seconds, estimates);
  }
}
