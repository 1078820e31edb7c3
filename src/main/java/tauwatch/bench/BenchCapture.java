package tauwatch.bench;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Path;
import java.util.List;
import tauwatch.record.RawCaptureWriter;
import tauwatch.sim.Scenario;
import tauwatch.sim.SimulatedRecording;
import tauwatch.sim.serve.ByteOutlet;
import tauwatch.sim.serve.SimulatedDaq;
import tauwatch.wire.DeviceProfile;

/**
 * Writes a raw capture of the simulated cell as the serving simulator frames it, without a socket
 * and without pacing: the input of the whole-chain replay benchmarks.
 *
 * <p>Single-threaded; runs once per benchmark. Each frame's receive time is stamped as if it had
 * arrived on the stream's own clock, so the capture looks like a live recording.
 */
public final class BenchCapture {
  private BenchCapture() {}

  /** Writes {@code seconds} of {@code scenario} (noise seed {@code seed}) to {@code file}. */
  public static void write(
      Path file, Scenario scenario, long seed, DeviceProfile profile, double seconds)
      throws IOException {
    try (RawCaptureWriter w =
        new RawCaptureWriter(file, "sim:" + scenario.name(), profile.text())) {
      long startNanos = System.nanoTime();
      double nsPerFrame = profile.samplesPerFrame() / profile.sampleRateHz() * 1e9;
      ByteOutlet outlet =
          new ByteOutlet() {
            private long frames;

            @Override
            public boolean write(byte[] buf, int len) {
              try {
                w.bytes(buf, 0, len, startNanos + (long) (++frames * nsPerFrame));
              } catch (IOException e) {
                throw new UncheckedIOException(e);
              }
              return true;
            }

            @Override
            public void dropLink(long outageMs) {}

            @Override
            public String describe() {
              return "file:" + file;
            }

            @Override
            public void close() {}
          };
      new SimulatedDaq(new SimulatedRecording(scenario, seed), profile, List.of(), 1, outlet)
          .serve(seconds, false);
    } catch (UncheckedIOException e) {
      throw e.getCause();
    }
  }
}
