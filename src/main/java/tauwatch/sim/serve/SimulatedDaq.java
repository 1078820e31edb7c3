package tauwatch.sim.serve;

import java.util.List;
import java.util.SplittableRandom;
import java.util.concurrent.locks.LockSupport;
import tauwatch.sim.SimulatedRecording;
import tauwatch.wire.DeviceProfile;
import tauwatch.wire.FrameEncoder;
import tauwatch.wire.TextLineEncoder;

/**
 * The simulated cell as a DAQ on the wire: samples the recording in real time, scales them back to
 * raw values per the device profile, frames them (binary or text) and writes them to an outlet,
 * injecting the requested faults.
 *
 * <p>Runs on the caller's thread until the duration is reached or {@link #stop()} is called (any
 * thread). Allocation-free per frame: one chunk of samples, one encoder buffer. Like a real DAQ it
 * keeps sampling while no client is connected (the frame sequence and the sample counter advance),
 * so a client that reconnects sees an exact gap. Sweeps of the acquisition program are marked on
 * the trigger channel, if the profile has one, every {@value #SWEEP_PERIOD_S} s.
 */
public final class SimulatedDaq {
  /** How long one injected link drop lasts. */
  public static final long OUTAGE_MS = 1500;

  static final double SWEEP_PERIOD_S = 2.0;
  private static final double NOISE_BURST_S = 0.020;
  private static final double NOISE_BURST_RMS_PA = 200.0;

  private final SimulatedRecording recording;
  private final DeviceProfile profile;
  private final ByteOutlet outlet;
  private final SplittableRandom random;
  private final double corrupt;
  private final double drop;
  private final double garbage;
  private final double truncate;
  private final double noiseBurstsPerS;
  private final double disconnectEveryS;
  private volatile boolean stopped;

  private long framesSent;
  private long framesCorrupted;
  private long framesDropped;
  private long framesTruncated;
  private long linkDrops;
  private long noiseBursts;

  public SimulatedDaq(
      SimulatedRecording recording,
      DeviceProfile profile,
      List<FaultKind.Fault> faults,
      long faultSeed,
      ByteOutlet outlet) {
    if (Math.abs(profile.sampleRateHz() - recording.format().sampleRateHz())
        > 1e-6 * profile.sampleRateHz()) {
      throw new IllegalArgumentException(
          String.format(
              "profile %s says %.6g Hz but scenario %s samples at %.6g Hz",
              profile.name(),
              profile.sampleRateHz(),
              recording.scenario().name(),
              recording.format().sampleRateHz()));
    }
    if (profile.mode() != recording.format().mode()) {
      throw new IllegalArgumentException(
          "profile "
              + profile.name()
              + " is for "
              + profile.mode().code()
              + "; the simulator is VC");
    }
    this.recording = recording;
    this.profile = profile;
    this.outlet = outlet;
    this.random = new SplittableRandom(faultSeed);
    this.corrupt = rate(faults, FaultKind.CORRUPT);
    this.drop = rate(faults, FaultKind.DROP);
    this.garbage = rate(faults, FaultKind.GARBAGE);
    this.truncate = rate(faults, FaultKind.TRUNCATE);
    this.noiseBurstsPerS = rate(faults, FaultKind.NOISE);
    this.disconnectEveryS = rate(faults, FaultKind.DISCONNECT);
  }

  private static double rate(List<FaultKind.Fault> faults, FaultKind kind) {
    double r = 0;
    for (FaultKind.Fault f : faults) {
      if (f.kind() == kind) {
        r = f.rate();
      }
    }
    return r;
  }

  /** Serves until {@code durationS} of stream time (infinite for no limit) or {@link #stop()}. */
  public void serve(double durationS) {
    serve(durationS, true);
  }

  /**
   * Serves as {@link #serve(double)}, or as fast as the outlet takes the bytes when {@code paced}
   * is false (for making captures and tests; link drops then never happen, since they are timed).
   */
  public void serve(double durationS, boolean paced) {
    double rate = profile.sampleRateHz();
    int perFrame = profile.samplesPerFrame();
    int channels = profile.channels();
    double[] cmd = new double[perFrame];
    double[] resp = new double[perFrame];
    double[] raw = new double[channels];
    boolean binary = profile.framing() == DeviceProfile.Framing.BINARY;
    FrameEncoder frames =
        binary ? new FrameEncoder(profile.sampleFormat(), channels, perFrame) : null;
    TextLineEncoder lines =
        binary ? null : new TextLineEncoder(channels, profile.lineCounter(), perFrame);
    byte[] extra = new byte[64];
    double cmdScale = profile.commandScale();
    double respScale = profile.responseScale();
    long sweepSamples = Math.round(SWEEP_PERIOD_S * rate);
    long triggerWidth = Math.max(1, Math.round(0.001 * rate));
    double thr = profile.triggerThreshold();
    double triggerHigh = thr + Math.abs(thr) + 1;
    double triggerLow = thr - Math.abs(thr) - 1;
    long noiseBurstLeft = 0;
    double noiseChance = noiseBurstsPerS * perFrame / rate;
    long nextDropNs = disconnectEveryS > 0 ? (long) (disconnectEveryS * 1e9) : Long.MAX_VALUE;
    // A micro-sample of slack: a duration given in ns and turned into seconds can land a hair
    // below a whole sample count, which truncation would cut by one.
    long maxSamples =
        Double.isInfinite(durationS) ? Long.MAX_VALUE : (long) Math.floor(durationS * rate + 1e-6);
    long sample = 0;
    long sequence = 0;
    long startNs = System.nanoTime();
    while (!stopped && sample < maxSamples) {
      recording.fill(cmd, resp, 0, perFrame);
      if (noiseChance > 0 && noiseBurstLeft == 0 && random.nextDouble() < noiseChance) {
        noiseBurstLeft = Math.round(NOISE_BURST_S * rate);
        noiseBursts++;
      }
      if (binary) {
        for (int s = 0; s < perFrame; s++) {
          fillRaw(raw, cmd[s], resp[s], cmdScale, respScale, noiseBurstLeft > 0);
          if (noiseBurstLeft > 0) {
            noiseBurstLeft--;
          }
          if (profile.hasTrigger()) {
            raw[profile.triggerChannel()] =
                (sample + s) % sweepSamples < triggerWidth ? triggerHigh : triggerLow;
          }
          for (int ch = 0; ch < channels; ch++) {
            frames.set(s, ch, raw[ch]);
          }
        }
        int len = frames.finish(sequence, sample, profile.sampleFormat() == 0 ? 0 : rate);
        send(frames.buffer(), len, extra);
      } else {
        lines.clear();
        for (int s = 0; s < perFrame; s++) {
          fillRaw(raw, cmd[s], resp[s], cmdScale, respScale, noiseBurstLeft > 0);
          if (noiseBurstLeft > 0) {
            noiseBurstLeft--;
          }
          if (profile.hasTrigger()) {
            raw[profile.triggerChannel()] =
                (sample + s) % sweepSamples < triggerWidth ? triggerHigh : triggerLow;
          }
          lines.line(sample + s, raw);
        }
        send(lines.buffer(), lines.length(), extra);
      }
      sample += perFrame;
      sequence++;
      if (!paced) {
        continue;
      }
      long due = startNs + (long) (sample / rate * 1e9);
      long now = System.nanoTime();
      if (now - startNs >= nextDropNs) {
        outlet.dropLink(OUTAGE_MS);
        linkDrops++;
        nextDropNs = now - startNs + OUTAGE_MS * 1_000_000 + (long) (disconnectEveryS * 1e9);
      }
      long wait;
      while (!stopped && (wait = due - System.nanoTime()) > 0) {
        LockSupport.parkNanos(wait);
      }
    }
  }

  private void fillRaw(
      double[] raw,
      double cmdUnits,
      double respUnits,
      double cmdScale,
      double respScale,
      boolean burst) {
    double r = respUnits;
    if (burst) {
      r += NOISE_BURST_RMS_PA * random.nextGaussian();
    }
    raw[profile.commandChannel()] = (cmdUnits - profile.commandOffset()) / cmdScale;
    raw[profile.responseChannel()] = (r - profile.responseOffset()) / respScale;
  }

  /** Writes one frame, with the faults that befall it. */
  private void send(byte[] buf, int len, byte[] extra) {
    if (drop > 0 && random.nextDouble() < drop) {
      framesDropped++;
      return;
    }
    int sendLen = len;
    int flipAt = -1;
    if (corrupt > 0 && random.nextDouble() < corrupt) {
      flipAt = random.nextInt(len);
      buf[flipAt] ^= (byte) (1 << random.nextInt(8));
      framesCorrupted++;
    } else if (truncate > 0 && random.nextDouble() < truncate) {
      sendLen = 1 + random.nextInt(len - 1);
      framesTruncated++;
    }
    outlet.write(buf, sendLen);
    framesSent++;
    if (garbage > 0 && random.nextDouble() < garbage) {
      int n = 1 + random.nextInt(extra.length);
      for (int i = 0; i < n; i++) {
        extra[i] = (byte) random.nextInt(256);
      }
      outlet.write(extra, n);
    }
  }

  public void stop() {
    stopped = true;
  }

  public long framesSent() {
    return framesSent;
  }

  public long framesCorrupted() {
    return framesCorrupted;
  }

  public long framesDropped() {
    return framesDropped;
  }

  public long framesTruncated() {
    return framesTruncated;
  }

  public long linkDrops() {
    return linkDrops;
  }

  public long noiseBursts() {
    return noiseBursts;
  }
}
