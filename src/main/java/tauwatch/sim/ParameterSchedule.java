package tauwatch.sim;

import java.util.Arrays;

/**
 * How the cell's parameters change over a recording: each {@link CellQuantity} follows its own
 * piecewise-linear function of stream time, held constant before its first knot and after its last.
 *
 * <p>Immutable and thread-safe. {@link #valuesAt(double, double[])} allocates nothing. A segment
 * whose end is infinite (a perfect seal) holds its left value until the next knot instead of
 * interpolating. Whether the cell has a dendrite is fixed for the whole schedule.
 */
public final class ParameterSchedule {
  private final double[][] timesS;
  private final double[][] values;
  private final boolean dendrite;

  private ParameterSchedule(double[][] timesS, double[][] values) {
    this.timesS = timesS;
    this.values = values;
    this.dendrite = values[CellQuantity.DENDRITE_CAPACITANCE_PF.ordinal()][0] > 0;
  }

  /** A cell that does not change. */
  public static ParameterSchedule constant(CellParameters cell) {
    return new Builder(cell).build();
  }

  public static Builder builder(CellParameters start) {
    return new Builder(start);
  }

  public boolean hasDendrite() {
    return dendrite;
  }

  /** True when some quantity has more than one knot. */
  public boolean changesOverTime() {
    for (double[] t : timesS) {
      if (t.length > 1) {
        return true;
      }
    }
    return false;
  }

  /** The knot times of a quantity, seconds (a copy). */
  public double[] knotTimesS(CellQuantity q) {
    return timesS[q.ordinal()].clone();
  }

  /** The knot values of a quantity (a copy). */
  public double[] knotValues(CellQuantity q) {
    return values[q.ordinal()].clone();
  }

  /** Writes every quantity's value at {@code tS} into {@code out}, indexed by ordinal. */
  public void valuesAt(double tS, double[] out) {
    for (int q = 0; q < timesS.length; q++) {
      out[q] = interpolate(timesS[q], values[q], tS);
    }
  }

  public double valueAt(CellQuantity q, double tS) {
    return interpolate(timesS[q.ordinal()], values[q.ordinal()], tS);
  }

  public CellParameters at(double tS) {
    double[] v = new double[CellQuantity.COUNT];
    valuesAt(tS, v);
    return CellParameters.of(v);
  }

  private static double interpolate(double[] t, double[] v, double tS) {
    int last = t.length - 1;
    if (tS <= t[0]) {
      return v[0];
    }
    if (tS >= t[last]) {
      return v[last];
    }
    int i = 0;
    while (t[i + 1] < tS) {
      i++;
    }
    double v0 = v[i];
    double v1 = v[i + 1];
    if (Double.isInfinite(v0) || Double.isInfinite(v1)) {
      return v0;
    }
    double f = (tS - t[i]) / (t[i + 1] - t[i]);
    return v0 + f * (v1 - v0);
  }

  /**
   * Collects the knots of a schedule and validates it once.
   *
   * <p>Not thread-safe; used once at set-up.
   */
  public static final class Builder {
    private final double[][] timesS = new double[CellQuantity.COUNT][];
    private final double[][] values = new double[CellQuantity.COUNT][];

    private Builder(CellParameters start) {
      for (CellQuantity q : CellQuantity.values()) {
        timesS[q.ordinal()] = new double[] {0};
        values[q.ordinal()] = new double[] {start.get(q)};
      }
    }

    /** Replaces the schedule of one quantity by knots ({@code timesS[i]}, {@code values[i]}). */
    public Builder knots(CellQuantity q, double[] knotTimesS, double[] knotValues) {
      if (knotTimesS.length == 0 || knotTimesS.length != knotValues.length) {
        throw new IllegalArgumentException(
            q.key() + ": needs at least one knot and as many times as values");
      }
      for (int i = 0; i < knotTimesS.length; i++) {
        if (!(knotTimesS[i] >= 0) || Double.isInfinite(knotTimesS[i])) {
          throw new IllegalArgumentException(
              q.key() + ": knot time must be >= 0 s, got " + knotTimesS[i]);
        }
        if (i > 0 && !(knotTimesS[i] > knotTimesS[i - 1])) {
          throw new IllegalArgumentException(
              q.key()
                  + ": knot times must increase, got "
                  + knotTimesS[i - 1]
                  + " then "
                  + knotTimesS[i]);
        }
      }
      timesS[q.ordinal()] = knotTimesS.clone();
      values[q.ordinal()] = knotValues.clone();
      return this;
    }

    /** Checks that the cell is valid at every knot (piecewise-linear in between keeps it so). */
    public ParameterSchedule build() {
      ParameterSchedule s = new ParameterSchedule(deepCopy(timesS), deepCopy(values));
      double[] all =
          Arrays.stream(timesS).flatMapToDouble(Arrays::stream).sorted().distinct().toArray();
      for (double t : all) {
        CellParameters cell = s.at(t);
        if (cell.hasDendrite() != s.dendrite) {
          throw new IllegalArgumentException(
              CellQuantity.DENDRITE_CAPACITANCE_PF.key()
                  + ": a dendrite cannot appear or vanish during a recording (at "
                  + t
                  + " s)");
        }
      }
      return s;
    }

    private static double[][] deepCopy(double[][] a) {
      double[][] c = new double[a.length][];
      for (int i = 0; i < a.length; i++) {
        c[i] = a[i].clone();
      }
      return c;
    }
  }
}
