package tauwatch.monitor.live;

import tauwatch.pulse.PulseWindow;
import tauwatch.stream.ClampMode;

/**
 * A compact copy of one pulse's command and response, for drawing the transient.
 *
 * <p>Immutable once made; made on the analysis thread from the segmenter's reused window (one copy
 * per pulse, a few kB as floats) and read by the view thread. Times are in ms from the step onset.
 */
public final class PulseTrace {
  private final long pulseNumber;
  private final ClampMode mode;
  private final double sampleIntervalMs;
  private final int onsetIndex;
  private final int offsetIndex;
  private final float[] command;
  private final float[] response;
  private final double responseMin;
  private final double responseMax;

  private PulseTrace(PulseWindow w) {
    pulseNumber = w.pulseNumber;
    mode = w.mode;
    sampleIntervalMs = w.sampleIntervalS * 1e3;
    onsetIndex = w.onsetIndex;
    offsetIndex = w.offsetIndex;
    int n = w.length;
    command = new float[n];
    response = new float[n];
    double lo = Double.POSITIVE_INFINITY;
    double hi = Double.NEGATIVE_INFINITY;
    for (int i = 0; i < n; i++) {
      command[i] = (float) w.command[i];
      double r = w.response[i];
      response[i] = (float) r;
      if (r < lo) {
        lo = r;
      }
      if (r > hi) {
        hi = r;
      }
    }
    responseMin = n == 0 ? Double.NaN : lo;
    responseMax = n == 0 ? Double.NaN : hi;
  }

  /** Copies the window's valid samples; call during the listener call that hands it out. */
  public static PulseTrace copyOf(PulseWindow w) {
    return new PulseTrace(w);
  }

  public long pulseNumber() {
    return pulseNumber;
  }

  public ClampMode mode() {
    return mode;
  }

  public int length() {
    return response.length;
  }

  /** Time of sample {@code i} in ms from the step onset. */
  public double timeMs(int i) {
    return (i - onsetIndex) * sampleIntervalMs;
  }

  public double response(int i) {
    return response[i];
  }

  public double command(int i) {
    return command[i];
  }

  public double sampleIntervalMs() {
    return sampleIntervalMs;
  }

  /** Step width in ms. */
  public double stepMs() {
    return (offsetIndex - onsetIndex) * sampleIntervalMs;
  }

  public double startMs() {
    return timeMs(0);
  }

  public double endMs() {
    return timeMs(Math.max(0, response.length - 1));
  }

  /** Smallest response sample, NaN when empty. */
  public double responseMin() {
    return responseMin;
  }

  /** Largest response sample, NaN when empty. */
  public double responseMax() {
    return responseMax;
  }
}
