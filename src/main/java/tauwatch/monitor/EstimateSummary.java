package tauwatch.monitor;

import java.util.Arrays;
import java.util.SplittableRandom;
import tauwatch.fit.Parameter;
import tauwatch.fit.PulseEstimate;
import tauwatch.health.HealthSnapshot;

/**
 * Collects the accepted estimates of a session for its closing summary: median and spread per
 * parameter.
 *
 * <p>Written on the analysis thread; read after the session ends. Memory is bounded, so a day-long
 * watch session does not grow: the first {@value #CAPACITY} accepted values of each parameter are
 * kept exactly (quantiles are then exact, as for any replay or checkout up to ~68 minutes at two
 * pulses a second); past that, a uniform random sample of that size of all values is kept
 * (reservoir sampling, Vitter's Algorithm R, with a fixed seed so that runs repeat), and quantiles
 * are those of the sample. At most {@value #CAPACITY} × 8 bytes per parameter.
 */
public final class EstimateSummary implements EstimateListener {
  /** Values kept per parameter. */
  public static final int CAPACITY = 8192;

  private static final Parameter[] PARAMETERS = Parameter.values();

  private final double[][] values = new double[PARAMETERS.length][64];
  private final int[] kept = new int[PARAMETERS.length];
  private final long[] counts = new long[PARAMETERS.length];
  private final SplittableRandom random = new SplittableRandom(0x5EED);
  private long pulses;
  private long accepted;

  @Override
  public void onEstimate(PulseEstimate e, HealthSnapshot health) {
    pulses++;
    if (!e.accepted()) {
      return;
    }
    accepted++;
    for (Parameter p : PARAMETERS) {
      double v = e.value(p);
      if (!Double.isNaN(v)) {
        add(p.ordinal(), v);
      }
    }
  }

  private void add(int i, double v) {
    long seen = ++counts[i];
    if (kept[i] < CAPACITY) {
      if (kept[i] == values[i].length) {
        values[i] = Arrays.copyOf(values[i], Math.min(CAPACITY, values[i].length * 2));
      }
      values[i][kept[i]++] = v;
      return;
    }
    long slot = random.nextLong(seen);
    if (slot < CAPACITY) {
      values[i][(int) slot] = v;
    }
  }

  public long pulses() {
    return pulses;
  }

  public long accepted() {
    return accepted;
  }

  /** Accepted values of a parameter seen so far (all of them, not only those kept). */
  public int count(Parameter p) {
    return (int) Math.min(Integer.MAX_VALUE, counts[p.ordinal()]);
  }

  /** Values held across all parameters: bounded by {@value #CAPACITY} per parameter. */
  public int retained() {
    int n = 0;
    for (int k : kept) {
      n += k;
    }
    return n;
  }

  /** The median of the accepted values, NaN if none. */
  public double median(Parameter p) {
    return quantile(p, 0.5);
  }

  /** A quantile (0–1) of the accepted (or sampled) values by linear interpolation, NaN if none. */
  public double quantile(Parameter p, double q) {
    int n = kept[p.ordinal()];
    if (n == 0) {
      return Double.NaN;
    }
    double[] s = Arrays.copyOf(values[p.ordinal()], n);
    Arrays.sort(s);
    double pos = q * (n - 1);
    int lo = (int) Math.floor(pos);
    int hi = Math.min(n - 1, lo + 1);
    return s[lo] + (pos - lo) * (s[hi] - s[lo]);
  }

  /**
   * The values kept for a parameter: every accepted value in pulse order while there have been at
   * most {@value #CAPACITY}, a uniform sample of them after that.
   */
  public double[] values(Parameter p) {
    return Arrays.copyOf(values[p.ordinal()], kept[p.ordinal()]);
  }
}
