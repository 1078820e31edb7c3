package tauwatch.health;

/**
 * A stretch of a recording during which every judged parameter met the criteria.
 *
 * <p>Immutable. Start and end are the onsets of the first and last good pulses of the span.
 *
 * @param firstSweep the sweep of the first pulse, −1 without sweeps
 * @param lastSweep the sweep of the last pulse, −1 without sweeps
 */
public record UsableSpan(
    long firstPulse,
    long lastPulse,
    double startS,
    double endS,
    String startIso,
    String endIso,
    int pulses,
    String endReason,
    long firstSweep,
    long lastSweep) {

  public double durationS() {
    return endS - startS;
  }
}
