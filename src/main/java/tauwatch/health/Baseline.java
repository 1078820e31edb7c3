package tauwatch.health;

import java.util.Arrays;
import tauwatch.fit.Parameter;
import tauwatch.fit.PulseEstimate;

/**
 * The reference values drift is measured against: the median of the first N accepted pulses, or of
 * the latest N when the user sets the baseline anew.
 *
 * <p>Single-threaded (the analysis thread). Keeps the last N accepted values per parameter in
 * preallocated rings.
 */
final class Baseline {
  private static final Parameter[] PARAMETERS = Parameter.values();

  private final int size;
  private final double[][] recent;
  private final double[] values = new double[PARAMETERS.length];
  private final double[] scratch;
  private int count;
  private int next;
  private boolean set;
  private long firstPulse;
  private long lastPulse;

  Baseline(int size) {
    this.size = size;
    this.recent = new double[PARAMETERS.length][size];
    this.scratch = new double[size];
    Arrays.fill(values, Double.NaN);
  }

  /**
   * Adds an accepted estimate.
   *
   * @return true if this completed the initial baseline
   */
  boolean add(PulseEstimate e) {
    for (Parameter p : PARAMETERS) {
      recent[p.ordinal()][next] = e.value(p);
    }
    next = (next + 1) % size;
    if (count < size) {
      count++;
    }
    lastPulse = e.pulseNumber();
    if (count == 1) {
      firstPulse = e.pulseNumber();
    }
    if (!set && count == size) {
      fix();
      return true;
    }
    return false;
  }

  /** Sets the baseline from the accepted pulses held now; false when there are none. */
  boolean setNow() {
    if (count == 0) {
      return false;
    }
    fix();
    return true;
  }

  private void fix() {
    for (Parameter p : PARAMETERS) {
      values[p.ordinal()] = median(recent[p.ordinal()]);
    }
    set = true;
  }

  private double median(double[] ring) {
    int n = 0;
    for (int i = 0; i < count; i++) {
      double v = ring[i];
      if (!Double.isNaN(v)) {
        scratch[n++] = v;
      }
    }
    return Medians.inPlace(scratch, n);
  }

  boolean isSet() {
    return set;
  }

  int pulsesHeld() {
    return count;
  }

  double value(Parameter p) {
    return values[p.ordinal()];
  }

  /** The pulse numbers the current held values span, e.g. for the event text. */
  String span() {
    return count >= size
        ? "last " + size + " accepted pulses up to #" + lastPulse
        : "accepted pulses #" + firstPulse + "–#" + lastPulse;
  }
}
