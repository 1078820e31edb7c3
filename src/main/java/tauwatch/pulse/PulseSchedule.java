package tauwatch.pulse;

/**
 * The test-pulse protocol as configured, for streams that do not record the command channel.
 *
 * <p>Immutable. The step amplitude cannot be measured without a command channel, so it is taken
 * from here.
 *
 * @param firstOnsetMs stream time of the first onset
 * @param periodMs time between onsets
 * @param widthMs step duration
 * @param stepAmplitude step size in the command unit (mV in VC, pA in CC)
 */
public record PulseSchedule(
    double firstOnsetMs, double periodMs, double widthMs, double stepAmplitude) {

  public PulseSchedule {
    if (!(firstOnsetMs >= 0)) {
      throw new IllegalArgumentException("schedule first_onset_ms must be >= 0");
    }
    if (!(periodMs > 0) || !(widthMs > 0) || widthMs >= periodMs) {
      throw new IllegalArgumentException(
          "schedule needs 0 < width_ms < period_ms, got width " + widthMs + ", period " + periodMs);
    }
    if (stepAmplitude == 0 || Double.isNaN(stepAmplitude)) {
      throw new IllegalArgumentException("schedule step must be non-zero");
    }
  }
}
