package tauwatch.health;

import java.util.Locale;
import tauwatch.fit.Parameter;
import tauwatch.fit.PulseEstimate;

/**
 * Rejects an accepted pulse whose Ra, Rt or τ lies far from the robust centre of the latest
 * accepted pulses — an isolated outlier, such as a pulse a synaptic event has bent without tripping
 * the residual tests — unless the next pulses confirm the jump as a real change of the cell.
 *
 * <p>Analysis thread only. The history rings and the sort buffer are preallocated; {@link #screen}
 * allocates only when it re-marks an estimate as rejected (the copy and its reason).
 *
 * <p>Rule: with at least {@link #minHistoryPulses} accepted pulses of history (the last {@link
 * #historyPulses}), a parameter's robust spread is s = max(1.4826·MAD, the pulse's own standard
 * error, {@link #relativeFloor}·|median|) — 1.4826·MAD estimates the standard deviation of normal
 * data (Hampel's median absolute deviation, e.g. Rousseeuw &amp; Croux, JASA 88:1273, 1993 — from
 * memory). A pulse more than {@link #outlierSigmas}·s from the median is an outlier. When the
 * {@code confirmPulses − 1} accepted pulses before it were outliers too, on the same side for the
 * same parameter, the jump is confirmed: the pulse is passed on, and the history restarts from the
 * confirming pulses, so a sudden real change reaches the health rules {@code confirmPulses − 1}
 * pulses after it happened. Pulses the estimator rejected pass through untouched and neither enter
 * the history nor break a run of outliers.
 */
public final class RecentPulseScreen {
  /** 15 pulses: 7.5 s at 2 pulses/s, short against drift, enough for a stable median. */
  public static final int DEFAULT_HISTORY_PULSES = 15;

  /** 8 pulses before any screening: a median and MAD of fewer are too rough. */
  public static final int DEFAULT_MIN_HISTORY_PULSES = 8;

  /** 6 robust standard deviations: about 2e-9 two-sided for normal scatter. */
  public static final double DEFAULT_OUTLIER_SIGMAS = 6;

  /** 1 % of the median: a noise-free recording still tolerates the estimator's own bias. */
  public static final double DEFAULT_RELATIVE_FLOOR = 0.01;

  /** The jump and the two pulses after it. */
  public static final int DEFAULT_CONFIRM_PULSES = 3;

  /** σ ≈ 1.4826·MAD for normal data (1/Φ⁻¹(3/4)). */
  static final double MAD_TO_SD = 1.4826;

  private static final Parameter[] SCREENED = {
    Parameter.ACCESS_RESISTANCE, Parameter.TOTAL_RESISTANCE, Parameter.TIME_CONSTANT
  };

  private final boolean enabled;
  private final int historyPulses;
  private final int minHistoryPulses;
  private final double outlierSigmas;
  private final double relativeFloor;
  private final int confirmPulses;

  /** history[k][i]: parameter SCREENED[k] of the i-th ring slot. */
  private final double[][] history;

  private final double[] scratch;
  private int next;
  private int count;

  /** The run of outliers just before the current pulse: values and standard errors. */
  private final double[][] suspectValue;

  private final double[][] suspectSe;
  private int suspects;

  private final double[] median = new double[SCREENED.length];
  private final double[] spreadMad = new double[SCREENED.length];

  public RecentPulseScreen(
      int historyPulses,
      int minHistoryPulses,
      double outlierSigmas,
      double relativeFloor,
      int confirmPulses) {
    this(historyPulses, minHistoryPulses, outlierSigmas, relativeFloor, confirmPulses, true);
  }

  /** A screen with the lab's settings; one that is not enabled passes every pulse on as it is. */
  public RecentPulseScreen(OutlierScreening s) {
    this(
        s.historyPulses(),
        s.minHistoryPulses(),
        s.outlierSigmas(),
        s.relativeFloorPercent() / 100,
        s.confirmPulses(),
        s.enabled());
  }

  private RecentPulseScreen(
      int historyPulses,
      int minHistoryPulses,
      double outlierSigmas,
      double relativeFloor,
      int confirmPulses,
      boolean enabled) {
    if (minHistoryPulses < 3 || historyPulses < minHistoryPulses) {
      throw new IllegalArgumentException(
          "outlier history must hold at least 3 pulses and no fewer than the minimum, got "
              + historyPulses
              + " and "
              + minHistoryPulses);
    }
    if (!(outlierSigmas > 0) || !(relativeFloor >= 0) || confirmPulses < 2) {
      throw new IllegalArgumentException(
          "outlier sigmas must be positive, the floor non-negative and confirmation at least 2"
              + " pulses");
    }
    this.enabled = enabled;
    this.historyPulses = historyPulses;
    this.minHistoryPulses = minHistoryPulses;
    this.outlierSigmas = outlierSigmas;
    this.relativeFloor = relativeFloor;
    this.confirmPulses = confirmPulses;
    history = new double[SCREENED.length][historyPulses];
    scratch = new double[historyPulses];
    suspectValue = new double[confirmPulses - 1][SCREENED.length];
    suspectSe = new double[confirmPulses - 1][SCREENED.length];
  }

  /** The screen with the defaults above. */
  public static RecentPulseScreen defaults() {
    return OutlierScreening.defaults().newScreen();
  }

  /** The estimate as it goes on: {@code e} itself, or a copy rejected as an isolated outlier. */
  public PulseEstimate screen(PulseEstimate e) {
    if (!enabled || !e.accepted()) {
      return e;
    }
    if (count < minHistoryPulses) {
      suspects = 0;
      add(e);
      return e;
    }
    centre();
    int worst = -1;
    double worstZ = 0;
    for (int k = 0; k < SCREENED.length; k++) {
      double v = e.value(SCREENED[k]);
      if (Double.isNaN(median[k]) || !Double.isFinite(v)) {
        continue;
      }
      double z = (v - median[k]) / spread(k, e.standardError(SCREENED[k]));
      if (Math.abs(z) > Math.abs(worstZ)) {
        worstZ = z;
        worst = k;
      }
    }
    if (worst < 0 || Math.abs(worstZ) <= outlierSigmas) {
      suspects = 0;
      add(e);
      return e;
    }
    if (suspects == confirmPulses - 1 && suspectsConfirm(worst, Math.signum(worstZ))) {
      // A real change: the level the confirming pulses agree on becomes the reference.
      count = 0;
      next = 0;
      for (int i = 0; i < suspects; i++) {
        addValues(suspectValue[i]);
      }
      suspects = 0;
      add(e);
      return e;
    }
    if (suspects == confirmPulses - 1) {
      // Keep the latest run only.
      for (int i = 1; i < suspects; i++) {
        System.arraycopy(suspectValue[i], 0, suspectValue[i - 1], 0, SCREENED.length);
        System.arraycopy(suspectSe[i], 0, suspectSe[i - 1], 0, SCREENED.length);
      }
      suspects--;
    }
    for (int k = 0; k < SCREENED.length; k++) {
      suspectValue[suspects][k] = e.value(SCREENED[k]);
      suspectSe[suspects][k] = e.standardError(SCREENED[k]);
    }
    suspects++;
    Parameter p = SCREENED[worst];
    return e.rejected(
        String.format(
            Locale.ROOT,
            "outlier against the recent pulses (%s %.3g vs median %.3g)",
            p.symbol(),
            e.value(p),
            median[worst]));
  }

  /** Whether every pulse of the run lay beyond the limit on side {@code sign} for {@code k}. */
  private boolean suspectsConfirm(int k, double sign) {
    for (int i = 0; i < suspects; i++) {
      double v = suspectValue[i][k];
      if (!Double.isFinite(v)) {
        return false;
      }
      double z = (v - median[k]) / spread(k, suspectSe[i][k]);
      if (Math.signum(z) != sign || Math.abs(z) <= outlierSigmas) {
        return false;
      }
    }
    return true;
  }

  private double spread(int k, double standardError) {
    double s = Math.max(MAD_TO_SD * spreadMad[k], relativeFloor * Math.abs(median[k]));
    return Double.isFinite(standardError) ? Math.max(s, standardError) : s;
  }

  /** Median and MAD of each screened parameter over the history (finite values only). */
  private void centre() {
    for (int k = 0; k < SCREENED.length; k++) {
      int n = 0;
      for (int i = 0; i < count; i++) {
        double v = history[k][i];
        if (Double.isFinite(v)) {
          scratch[n++] = v;
        }
      }
      if (n < minHistoryPulses) {
        median[k] = Double.NaN;
        spreadMad[k] = Double.NaN;
        continue;
      }
      double m = medianOf(n);
      for (int i = 0; i < n; i++) {
        scratch[i] = Math.abs(scratch[i] - m);
      }
      median[k] = m;
      spreadMad[k] = medianOf(n);
    }
  }

  private double medianOf(int n) {
    return Medians.inPlace(scratch, n);
  }

  private void add(PulseEstimate e) {
    for (int k = 0; k < SCREENED.length; k++) {
      history[k][next] = e.value(SCREENED[k]);
    }
    advance();
  }

  private void addValues(double[] values) {
    for (int k = 0; k < SCREENED.length; k++) {
      history[k][next] = values[k];
    }
    advance();
  }

  private void advance() {
    next = (next + 1) % historyPulses;
    count = Math.min(count + 1, historyPulses);
  }
}
