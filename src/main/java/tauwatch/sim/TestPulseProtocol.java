package tauwatch.sim;

/**
 * The voltage-clamp command: a holding potential with a periodic rectangular test pulse.
 *
 * <p>Immutable and validated on construction. Times are rounded to whole samples by the simulator.
 *
 * @param holdingMv holding potential, mV
 * @param stepMv step amplitude relative to holding, mV (non-zero; negative steps hyperpolarise)
 * @param stepWidthMs duration of each step, ms
 * @param periodMs onset-to-onset interval of the pulses, ms
 * @param firstOnsetMs stream time of the first step onset, ms
 */
public record TestPulseProtocol(
    double holdingMv, double stepMv, double stepWidthMs, double periodMs, double firstOnsetMs) {

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
    if (!(firstOnsetMs >= 0) || Double.isInfinite(firstOnsetMs)) {
      throw new IllegalArgumentException("first onset (ms) must be >= 0, got " + firstOnsetMs);
    }
  }
}
