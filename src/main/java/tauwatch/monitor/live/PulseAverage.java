package tauwatch.monitor.live;

/**
 * The sample-by-sample mean of the latest accepted pulse traces, for the transient panel's average
 * overlay: averaging N pulses lowers uncorrelated noise by √N (common practice), so a slow change
 * of the transient's shape shows before a single noisy pulse would show it.
 *
 * <p>Single writer: {@link #add} on the analysis thread, per accepted pulse. Keeps a running sum in
 * doubles over a ring of the latest {@code n} traces (which are immutable and shared with the
 * snapshots, so nothing is copied in); each call makes one new averaged trace (two float arrays, a
 * few kB). A trace that does not align with the ones held (another step timing, rate or mode)
 * starts the average afresh.
 */
public final class PulseAverage {
  /** Pulses averaged by default. */
  public static final int DEFAULT_PULSES = 10;

  private final PulseTrace[] ring;
  private int count;
  private int next;
  private double[] sumCommand = new double[0];
  private double[] sumResponse = new double[0];

  public PulseAverage(int pulses) {
    if (pulses < 1) {
      throw new IllegalArgumentException("pulses to average must be at least 1, got " + pulses);
    }
    ring = new PulseTrace[pulses];
  }

  /** Pulses the average holds at most. */
  public int capacity() {
    return ring.length;
  }

  /**
   * Adds an accepted pulse's trace and returns the mean of the latest traces, this one included.
   */
  public PulseTrace add(PulseTrace t) {
    if (count > 0 && !t.alignsWith(ring[(next - 1 + ring.length) % ring.length])) {
      java.util.Arrays.fill(ring, null);
      count = 0;
      next = 0;
    }
    int n = t.length();
    if (count == 0) {
      if (sumResponse.length != n) {
        sumCommand = new double[n];
        sumResponse = new double[n];
      } else {
        java.util.Arrays.fill(sumCommand, 0);
        java.util.Arrays.fill(sumResponse, 0);
      }
    }
    PulseTrace old = ring[next];
    if (old != null) {
      for (int i = 0; i < n; i++) {
        sumCommand[i] -= old.command(i);
        sumResponse[i] -= old.response(i);
      }
    } else {
      count++;
    }
    for (int i = 0; i < n; i++) {
      sumCommand[i] += t.command(i);
      sumResponse[i] += t.response(i);
    }
    ring[next] = t;
    next = (next + 1) % ring.length;
    float[] c = new float[n];
    float[] r = new float[n];
    for (int i = 0; i < n; i++) {
      c[i] = (float) (sumCommand[i] / count);
      r[i] = (float) (sumResponse[i] / count);
    }
    return PulseTrace.withSamples(t, c, r, t.pulseNumber());
  }

  /** Traces in the current average. */
  public int count() {
    return count;
  }
}
