package tauwatch.sim;

import tauwatch.stream.ClampMode;

/**
 * The clamp command: a holding level with a periodic rectangular test pulse.
 *
 * <p>Immutable and validated on construction. Times are rounded to whole samples by the simulator.
 * In current clamp the two levels are currents: {@code holdingMv} and {@code stepMv} then hold pA
 * (use {@link #holdingLevel()} and {@link #stepLevel()}, which say so).
 *
 * @param holdingMv holding potential, mV (holding current, pA, in current clamp)
 * @param stepMv step amplitude relative to holding, mV (non-zero; negative steps hyperpolarise); pA
 *     in current clamp
 * @param stepWidthMs duration of each step, ms
 * @param periodMs onset-to-onset interval of the pulses, ms
 * @param firstOnsetMs stream time of the first step onset, ms
 * @param mode voltage clamp or current clamp
 */
public record TestPulseProtocol(
    double holdingMv,
    double stepMv,
    double stepWidthMs,
    double periodMs,
    double firstOnsetMs,
    ClampMode mode) {

  /** A voltage-clamp protocol. */
  public TestPulseProtocol(
      double holdingMv, double stepMv, double stepWidthMs, double periodMs, double firstOnsetMs) {
    this(holdingMv, stepMv, stepWidthMs, periodMs, firstOnsetMs, ClampMode.VOLTAGE_CLAMP);
  }

  /** A current-clamp protocol: holding current and step in pA. */
  public static TestPulseProtocol currentClamp(
      double holdingPa, double stepPa, double stepWidthMs, double periodMs, double firstOnsetMs) {
    return new TestPulseProtocol(
        holdingPa, stepPa, stepWidthMs, periodMs, firstOnsetMs, ClampMode.CURRENT_CLAMP);
  }

  /** The holding command in the mode's command unit (mV in VC, pA in CC). */
  public double holdingLevel() {
    return holdingMv;
  }

  /** The step in the mode's command unit (mV in VC, pA in CC). */
  public double stepLevel() {
    return stepMv;
  }

  public TestPulseProtocol {
    if (!Double.isFinite(holdingMv)) {
      throw new IllegalArgumentException("holding potential (mV) must be finite, got " + holdingMv);
    }
    if (!Double.isFinite(stepMv) || stepMv == 0) {
      throw new IllegalArgumentException("step (mV) must be finite and non-zero, got " + stepMv);
    }
    if (!(stepWidthMs > 0) || Double.isInfinite(stepWidthMs)) {
      throw new IllegalArgumentException("step width (ms) must be > 0, got " + stepWidthMs);
    }
    if (!(periodMs > stepWidthMs) || Double.isInfinite(periodMs)) {
      throw new IllegalArgumentException(
          "period (ms) must be longer than the step width " + stepWidthMs + ", got " + periodMs);
    }
    if (mode == null) {
      throw new IllegalArgumentException("clamp mode must be set");
    }
    if (!(firstOnsetMs >= 0) || Double.isInfinite(firstOnsetMs)) {
      throw new IllegalArgumentException("first onset (ms) must be >= 0, got " + firstOnsetMs);
    }
  }
}
