package tauwatch.wire;

import tauwatch.stream.SampleWriter;

/**
 * Scales decoded frames to command and response samples per the device profile and feeds them to
 * the ring, keeping the stream's accounting: sequence gaps, signal loss and recovery, sweep
 * triggers, and frames that contradict the profile.
 *
 * <p>Single-threaded (the source thread); allocation-free per frame. A frame whose channel count,
 * sample format or stated rate differs from the profile, or whose values lie beyond what the
 * profile's digitiser can produce, is dropped whole and counted as a mismatch, so a wrongly scaled
 * stream never reaches the estimator as numbers. Samples missing by the frames' sample counter
 * become a {@link SampleWriter#gap}; after a loss of signal where the counter cannot tell (no
 * counter, or the device restarted it), the gap is estimated from the wall clock so that stream
 * time keeps pace with real time.
 */
public final class SampleFeed implements FrameSink {
  /** Why a frame was dropped as contradicting the profile. */
  public enum Mismatch {
    CHANNELS,
    SAMPLE_FORMAT,
    SAMPLE_RATE,
    RANGE
  }

  private static final long HALF_U32 = 1L << 31;

  private final DeviceProfile profile;
  private final SampleWriter writer;
  private final double cmdScale;
  private final double respScale;
  private final double rawLimit;
  private final int cmdCh;
  private final int respCh;
  private final int trigCh;
  private final double trigThreshold;
  private final double rateHz;
  private long sampleLimit = Long.MAX_VALUE;

  /** One frame's scaled samples on their way to the ring. */
  private final double[] cmd = new double[WireFormat.MAX_SAMPLES_PER_FRAME];

  private final double[] resp = new double[WireFormat.MAX_SAMPLES_PER_FRAME];
  private final byte[] sweep = new byte[WireFormat.MAX_SAMPLES_PER_FRAME];

  private long expectedFirst = -1;
  private long lastSequence = -1;
  private boolean triggerHigh = true; // no sweep start on the very first sample
  private boolean down;
  private long lastFrameNanos;
  private long nowNanos;

  private long mismatchFrames;
  private Mismatch lastMismatch;
  private double lastMismatchValue;
  private long counterRestarts;

  public SampleFeed(DeviceProfile profile, SampleWriter writer) {
    this.profile = profile;
    this.writer = writer;
    this.cmdScale = profile.commandScale();
    this.respScale = profile.responseScale();
    this.rawLimit = profile.rawLimit();
    this.cmdCh = profile.commandChannel();
    this.respCh = profile.responseChannel();
    this.trigCh = profile.triggerChannel();
    this.trigThreshold = profile.triggerThreshold();
    this.rateHz = profile.sampleRateHz();
  }

  /**
   * Sets the receive time of the bytes about to be decoded: {@link System#nanoTime()} for a live
   * link, the recorded time for a replayed capture.
   */
  public void at(long nanos) {
    this.nowNanos = nanos;
  }

  /** Stops putting samples once the writer's stream index reaches {@code limit}. */
  public void limit(long limit) {
    this.sampleLimit = limit;
  }

  @Override
  public void onFrame(DecodedFrame f) {
    if (!scaledToProfile(f)) {
      mismatchFrames++;
      return;
    }
    long now = nowNanos;
    if (f.sequence >= 0) {
      if (lastSequence >= 0) {
        long missed = (f.sequence - lastSequence - 1) & 0xffffffffL;
        if (missed > 0 && missed < HALF_U32) {
          writer.counters().addDroppedFrames(missed);
        }
      }
      lastSequence = f.sequence;
    }
    long gap = 0;
    boolean counterBroken = f.firstSample < 0;
    if (f.firstSample >= 0 && expectedFirst >= 0) {
      long d = (f.firstSample - expectedFirst) & 0xffffffffL;
      if (d < HALF_U32) {
        gap = d;
      } else {
        counterRestarts++;
        counterBroken = true;
      }
    }
    if (down) {
      if (counterBroken && lastFrameNanos != 0) {
        gap = Math.max(0, Math.round((now - lastFrameNanos) * 1e-9 * rateHz) - f.samples);
      }
      writer.gap(gap);
      writer.signalRestored();
      down = false;
    } else if (gap > 0) {
      writer.gap(gap);
    }
    final double[] v = f.values;
    final int ch = f.channels;
    int n = (int) Math.max(0, Math.min(f.samples, sampleLimit - writer.nextSampleIndex()));
    if (trigCh >= 0) {
      for (int s = 0; s < n; s++) {
        boolean high = v[s * ch + trigCh] >= trigThreshold;
        sweep[s] = high && !triggerHigh ? (byte) 1 : (byte) 0;
        triggerHigh = high;
      }
    }
    writer.putAll(cmd, resp, trigCh >= 0 ? sweep : null, 0, n);
    expectedFirst = f.firstSample >= 0 ? (f.firstSample + f.samples) & 0xffffffffL : -1;
    lastFrameNanos = now;
  }

  /**
   * Checks the frame against the profile and, when it fits, scales its command and response into
   * the scratch arrays; false (the mismatch recorded) when it contradicts the profile.
   */
  private boolean scaledToProfile(DecodedFrame f) {
    if (f.channels != profile.channels()) {
      return rejected(Mismatch.CHANNELS, f.channels);
    }
    if (f.sampleFormat != profile.sampleFormat()) {
      return rejected(Mismatch.SAMPLE_FORMAT, f.sampleFormat);
    }
    if (f.sampleRateHz > 0 && Math.abs(f.sampleRateHz - rateHz) > 1e-4 * rateHz) {
      return rejected(Mismatch.SAMPLE_RATE, f.sampleRateHz);
    }
    // Scaled into the frame's scratch on the way, so the samples are read once.
    final double[] v = f.values;
    final int ch = f.channels;
    final double cmdOffset = profile.commandOffset();
    final double respOffset = profile.responseOffset();
    if (rawLimit < Double.POSITIVE_INFINITY) {
      for (int s = 0, n = f.samples; s < n; s++) {
        double c = v[s * ch + cmdCh];
        double r = v[s * ch + respCh];
        if (!(Math.abs(c) <= rawLimit) || !(Math.abs(r) <= rawLimit)) {
          return rejected(Mismatch.RANGE, Math.abs(c) > Math.abs(r) ? c : r);
        }
        cmd[s] = c * cmdScale + cmdOffset;
        resp[s] = r * respScale + respOffset;
      }
    } else {
      for (int s = 0, n = f.samples; s < n; s++) {
        cmd[s] = v[s * ch + cmdCh] * cmdScale + cmdOffset;
        resp[s] = v[s * ch + respCh] * respScale + respOffset;
      }
    }
    return true;
  }

  /** Records why the frame does not fit the profile; false, for {@link #scaledToProfile}. */
  private boolean rejected(Mismatch m, double value) {
    lastMismatch = m;
    lastMismatchValue = value;
    return false;
  }

  /** The link went quiet or closed: tells the ring once per loss. */
  public void signalLost() {
    if (!down) {
      writer.signalLost();
      down = true;
    }
  }

  /** Forgets the sequence and counter state (the link was reopened), but not a loss of signal. */
  public void linkReopened() {
    lastSequence = -1;
  }

  public boolean signalDown() {
    return down;
  }

  /** System.nanoTime() of the last good frame, 0 before the first. */
  public long lastFrameNanos() {
    return lastFrameNanos;
  }

  public long mismatchFrames() {
    return mismatchFrames;
  }

  public Mismatch lastMismatch() {
    return lastMismatch;
  }

  public double lastMismatchValue() {
    return lastMismatchValue;
  }

  public long counterRestarts() {
    return counterRestarts;
  }

  public DeviceProfile profile() {
    return profile;
  }
}
