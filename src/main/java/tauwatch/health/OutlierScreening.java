package tauwatch.health;

/**
 * The lab's settings for the screen of isolated outlier pulses ({@link RecentPulseScreen}): whether
 * it runs, the history it judges against, how far is too far, and how many pulses confirm a jump.
 *
 * <p>Immutable; checked at construction, so a bad value in the configuration is refused with the
 * rule it breaks.
 *
 * @param enabled whether pulses are screened at all (off: every pulse the estimator accepts reaches
 *     the health rules)
 * @param historyPulses accepted pulses whose median and MAD the next one is judged against
 * @param minHistoryPulses accepted pulses needed before any pulse is screened
 * @param outlierSigmas distance from the median, in robust standard deviations, beyond which a
 *     pulse is an outlier
 * @param relativeFloorPercent the robust spread is never taken below this % of the median
 * @param confirmPulses outliers in a row, on the same side, that make a jump a real change
 */
public record OutlierScreening(
    boolean enabled,
    int historyPulses,
    int minHistoryPulses,
    double outlierSigmas,
    double relativeFloorPercent,
    int confirmPulses) {

  public OutlierScreening {
    if (minHistoryPulses < 3 || historyPulses < minHistoryPulses) {
      throw new IllegalArgumentException(
          "history_pulses ("
              + historyPulses
              + ") must be >= min_history_pulses ("
              + minHistoryPulses
              + "), which must be >= 3");
    }
    if (!(outlierSigmas > 0)) {
      throw new IllegalArgumentException("outlier_sigmas must be positive, got " + outlierSigmas);
    }
    if (!(relativeFloorPercent >= 0)) {
      throw new IllegalArgumentException(
          "relative_floor_percent must be >= 0, got " + relativeFloorPercent);
    }
    if (confirmPulses < 2) {
      throw new IllegalArgumentException("confirm_pulses must be >= 2, got " + confirmPulses);
    }
  }

  /** The screen's built-in settings (see {@link RecentPulseScreen}'s defaults for why). */
  public static OutlierScreening defaults() {
    return new OutlierScreening(
        true,
        RecentPulseScreen.DEFAULT_HISTORY_PULSES,
        RecentPulseScreen.DEFAULT_MIN_HISTORY_PULSES,
        RecentPulseScreen.DEFAULT_OUTLIER_SIGMAS,
        100 * RecentPulseScreen.DEFAULT_RELATIVE_FLOOR,
        RecentPulseScreen.DEFAULT_CONFIRM_PULSES);
  }

  /** A fresh screen with these settings, for one session. */
  public RecentPulseScreen newScreen() {
    return new RecentPulseScreen(this);
  }
}
