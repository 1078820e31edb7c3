package tauwatch.monitor;

import java.util.Arrays;
import tauwatch.fit.Parameter;
import tauwatch.fit.PulseEstimate;
import tauwatch.health.HealthSnapshot;

/**
 * Collects the accepted estimates of a session for its closing summary: median and spread per
 * parameter.
 *
 * <p>Written on the analysis thread; read after the session ends. Keeps every accepted value (8
 * bytes per parameter per pulse), so it suits replays and checkouts, not day-long live runs.
 */
public final class EstimateSummary implements EstimateListener {
  private static final Parameter[] PARAMETERS = Parameter.values();

  private final double[][] values = new double[PARAMETERS.length][64];
  private final int[] counts = new int[PARAMETERS.length];
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
        int i = p.ordinal();
        if (counts[i] == values[i].length) {
          values[i] = Arrays.copyOf(values[i], values[i].length * 2);
        }
        values[i][counts[i]++] = v;
      }
    }
  }

  public long pulses() {
    return pulses;
  }

  public long accepted() {
    return accepted;
  }

  /** Accepted values of a parameter. */
  public int count(Parameter p) {
    return counts[p.ordinal()];
  }

  /** The median of the accepted values, NaN if none. */
  public double median(Parameter p) {
    return quantile(p, 0.5);
  }

  /** A quantile (0–1) of the accepted values by linear interpolation, NaN if none. */
  public double quantile(Parameter p, double q) {
    int n = counts[p.ordinal()];
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

  /** The accepted values of a parameter, in pulse order. */
  public double[] values(Parameter p) {
    return Arrays.copyOf(values[p.ordinal()], counts[p.ordinal()]);
  }
}
