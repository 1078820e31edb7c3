package tauwatch.health;

import java.util.Arrays;
import tauwatch.fit.Parameter;
import tauwatch.fit.PulseEstimate;

/**
 * The uncertainty-weighted average of each parameter over the last N accepted pulses, with its
 * standard error.
 *
 * <p>Single-threaded (the analysis thread); preallocated rings, {@link #add} allocates nothing.
 *
 * <p>Inverse-variance weighting (any statistics text): x̄ = Σ x_i/σ_i² / Σ 1/σ_i², SE(x̄) = (Σ
 * 1/σ_i²)^(−1/2), the minimum-variance unbiased combination of independent estimates of one value.
 * A pulse without a standard error for a parameter does not enter that parameter's average.
 * Rejected pulses are never added: the caller feeds accepted estimates only.
 */
public final class WeightedRunningAverage {
  private static final Parameter[] PARAMETERS = Parameter.values();

  private final int size;
  private final double[][] values;
  private final double[][] weights;
  private int next;
  private int count;

  public WeightedRunningAverage(int size) {
    if (size < 1) {
      throw new IllegalArgumentException("average_pulses must be >= 1, got " + size);
    }
    this.size = size;
    values = new double[PARAMETERS.length][size];
    weights = new double[PARAMETERS.length][size];
  }

  /** Adds an accepted estimate (the oldest of N drops out). */
  public void add(PulseEstimate e) {
    for (Parameter p : PARAMETERS) {
      double v = e.value(p);
      double se = e.standardError(p);
      boolean usable = Double.isFinite(v) && se > 0 && Double.isFinite(se);
      values[p.ordinal()][next] = usable ? v : 0;
      weights[p.ordinal()][next] = usable ? 1 / (se * se) : 0;
    }
    next = (next + 1) % size;
    count = Math.min(size, count + 1);
  }

  /** The weighted average of {@code p}, NaN when no held pulse has a standard error for it. */
  public double value(Parameter p) {
    double sw = 0;
    double swx = 0;
    double[] w = weights[p.ordinal()];
    double[] x = values[p.ordinal()];
    for (int i = 0; i < count; i++) {
      sw += w[i];
      swx += w[i] * x[i];
    }
    return sw > 0 ? swx / sw : Double.NaN;
  }

  /** The standard error of {@link #value}, NaN when unknown. */
  public double standardError(Parameter p) {
    double sw = 0;
    double[] w = weights[p.ordinal()];
    for (int i = 0; i < count; i++) {
      sw += w[i];
    }
    return sw > 0 ? 1 / Math.sqrt(sw) : Double.NaN;
  }

  /** Accepted pulses held (at most N). */
  public int pulses() {
    return count;
  }

  public void clear() {
    for (double[] w : weights) {
      Arrays.fill(w, 0);
    }
    count = 0;
    next = 0;
  }
}
