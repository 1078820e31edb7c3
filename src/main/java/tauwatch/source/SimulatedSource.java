package tauwatch.source;

import java.util.concurrent.locks.LockSupport;
import tauwatch.sim.SimulatedRecording;
import tauwatch.stream.SampleWriter;
import tauwatch.stream.StreamFormat;

/**
 * Feeds the simulated cell into the ring, paced to real time like a DAQ or as fast as the analysis
 * takes it.
 *
 * <p>{@link #run} runs on the source thread and allocates nothing: the simulator fills a reusable
 * chunk, which is copied into ring slots. Paced, it is treated as live (a full ring drops and
 * counts an overrun) and publishes every millisecond, as a DAQ delivering small packets would.
 */
public final class SimulatedSource implements SampleSource {
  /** Unpaced chunk: a ring block's worth. */
  private static final int FAST_CHUNK = 256;

  private final SimulatedRecording recording;
  private final boolean paced;
  private final String name;
  private volatile boolean stopped;

  public SimulatedSource(SimulatedRecording recording, boolean paced) {
    this.recording = recording;
    this.paced = paced;
    this.name = "sim:" + recording.scenario().name();
  }

  public SimulatedRecording recording() {
    return recording;
  }

  @Override
  public StreamFormat format() {
    return recording.format();
  }

  @Override
  public String name() {
    return name;
  }

  @Override
  public boolean live() {
    return paced;
  }

  @Override
  public void run(SampleWriter writer, long maxSamples) {
    double rate = recording.format().sampleRateHz();
    int chunk = paced ? Math.max(1, (int) Math.round(rate / 1000)) : FAST_CHUNK;
    double[] cmd = new double[chunk];
    double[] resp = new double[chunk];
    long written = 0;
    long startNanos = System.nanoTime();
    while (!stopped && written < maxSamples) {
      int n = (int) Math.min(chunk, maxSamples - written);
      recording.fill(cmd, resp, 0, n);
      for (int i = 0; i < n; i++) {
        writer.put(cmd[i], resp[i]);
      }
      written += n;
      if (paced) {
        writer.flush();
        long due = startNanos + (long) (written / rate * 1e9);
        long wait;
        while (!stopped && (wait = due - System.nanoTime()) > 0) {
          LockSupport.parkNanos(wait);
        }
      }
    }
    writer.flush();
  }

  @Override
  public void stop() {
    stopped = true;
  }
}
