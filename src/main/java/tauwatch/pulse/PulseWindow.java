package tauwatch.pulse;

import tauwatch.stream.ClampMode;

/**
 * The samples of one test pulse: baseline before the step, the step with its on-transient and
 * steady state, and the off-transient after it.
 *
 * <p>A reusable buffer owned by the {@link PulseSegmenter}; valid only during the listener call
 * that hands it out. Consumers that keep anything must copy it.
 *
 * <p>Timing follows the interchange contract: the command change first shown on row {@link
 * #onsetIndex} takes effect at that row's time, and the response on that row was sampled just
 * before the change acted. So {@code response[onsetIndex]} is still a baseline sample and the
 * transient starts at {@link #onsetTimeS()}.
 */
public final class PulseWindow {
  /** Command samples: mV in voltage clamp, pA in current clamp. */
  public final double[] command;

  /** Response samples: pA in voltage clamp, mV in current clamp. */
  public final double[] response;

  /** Valid samples. */
  public int length;

  /** Index of the first row that shows the step command. */
  public int onsetIndex;

  /** Index of the first row that shows the command back at the holding level. */
  public int offsetIndex;

  /** Stream index of {@code command[0]}. */
  public long firstSampleIndex;

  /** Seconds between samples. */
  public double sampleIntervalS;

  /** Stream time in seconds of stream index 0. */
  public double streamStartS;

  /** Command level before the step (mV in VC, pA in CC), measured from the command channel. */
  public double holdingLevel;

  /** Command level during the step, measured from the command channel. */
  public double stepLevel;

  public ClampMode mode = ClampMode.VOLTAGE_CLAMP;

  /** −3 dB cutoff of the amplifier's 4-pole Bessel filter in Hz; 0 when none or unknown. */
  public double filterCutoffHz;

  /** Running number of the pulse in the session, from 1. */
  public long pulseNumber;

  /** Samples were lost inside the window (a gap or an overrun); its estimate must be rejected. */
  public boolean spansGap;

  /** The acquisition program's sweep number at the onset, or −1 when the stream has no trigger. */
  public long sweepNumber = -1;

  /** Seconds from the start of that sweep to the onset, or NaN without a trigger. */
  public double sweepTimeS = Double.NaN;

  /** {@link System#nanoTime()} when the source received the window's last sample. */
  public long lastSampleReceivedNanos;

  public PulseWindow(int capacity) {
    command = new double[capacity];
    response = new double[capacity];
  }

  public int capacity() {
    return command.length;
  }

  /** The step amplitude measured from the command levels (mV in VC, pA in CC). */
  public double stepAmplitude() {
    return stepLevel - holdingLevel;
  }

  /** Stream time of the step onset in seconds. */
  public double onsetTimeS() {
    return streamStartS + (firstSampleIndex + onsetIndex) * sampleIntervalS;
  }

  /** Time in seconds of row {@code i} relative to the step onset. */
  public double timeFromOnsetS(int i) {
    return (i - onsetIndex) * sampleIntervalS;
  }

  /** Step width in samples. */
  public int stepSamples() {
    return offsetIndex - onsetIndex;
  }
}
