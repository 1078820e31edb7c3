package tauwatch.fit;

import java.util.Arrays;

/**
 * The exponential model an estimator fitted to one transient of a test pulse, kept so that the
 * fitted curve can be drawn over the response.
 *
 * <p>Immutable and safe to share across threads; one or two are made per pulse. Times are in ms
 * from the pulse's step onset; levels are in the response unit (pA in voltage clamp, mV in current
 * clamp). The curve is {@code steadyLevel + Σ amplitude(k)·e^(−(t − edgeMs)/timeConstantMs(k))} for
 * {@code t ≥ edgeMs}: the fitted tail as it appears in the (filtered) response. A model with more
 * exponentials (a soma with a dendrite) adds components; nothing else changes.
 */
public final class FittedTransient {
  private final double edgeMs;
  private final double fitStartMs;
  private final double fitEndMs;
  private final double steadyLevel;
  private final double[] amplitudes;
  private final double[] timeConstantsMs;
  private final double edgeLevel;

  /**
   * @param edgeMs the command edge the transient follows: 0 for the on-transient, the step width
   *     for the off-transient
   * @param fitStartMs first sample time the fit used
   * @param fitEndMs last sample time the fit used
   * @param steadyLevel the level the transient settles to
   * @param amplitudes each exponential's amplitude at the edge, as fitted to the tail
   * @param timeConstantsMs each exponential's time constant, same order
   * @param edgeLevel the level the estimate extrapolated to at the edge (after undoing the
   *     amplifier filter): the point the access resistance comes from in voltage clamp
   */
  public FittedTransient(
      double edgeMs,
      double fitStartMs,
      double fitEndMs,
      double steadyLevel,
      double[] amplitudes,
      double[] timeConstantsMs,
      double edgeLevel) {
    if (amplitudes.length != timeConstantsMs.length || amplitudes.length == 0) {
      throw new IllegalArgumentException(
          "need one time constant per amplitude, got "
              + amplitudes.length
              + " and "
              + timeConstantsMs.length);
    }
    this.edgeMs = edgeMs;
    this.fitStartMs = fitStartMs;
    this.fitEndMs = fitEndMs;
    this.steadyLevel = steadyLevel;
    this.amplitudes = amplitudes.clone();
    this.timeConstantsMs = timeConstantsMs.clone();
    this.edgeLevel = edgeLevel;
  }

  /** A single exponential. */
  public static FittedTransient mono(
      double edgeMs,
      double fitStartMs,
      double fitEndMs,
      double steadyLevel,
      double amplitude,
      double timeConstantMs,
      double edgeLevel) {
    return new FittedTransient(
        edgeMs,
        fitStartMs,
        fitEndMs,
        steadyLevel,
        new double[] {amplitude},
        new double[] {timeConstantMs},
        edgeLevel);
  }

  public double edgeMs() {
    return edgeMs;
  }

  public double fitStartMs() {
    return fitStartMs;
  }

  public double fitEndMs() {
    return fitEndMs;
  }

  public double steadyLevel() {
    return steadyLevel;
  }

  /** Number of exponential components. */
  public int components() {
    return amplitudes.length;
  }

  public double amplitude(int k) {
    return amplitudes[k];
  }

  public double timeConstantMs(int k) {
    return timeConstantsMs[k];
  }

  public double edgeLevel() {
    return edgeLevel;
  }

  /** The fitted curve at {@code tMs} from the onset (meaningful for t ≥ {@link #edgeMs()}). */
  public double levelAt(double tMs) {
    double v = steadyLevel;
    double dt = tMs - edgeMs;
    for (int k = 0; k < amplitudes.length; k++) {
      v += amplitudes[k] * Math.exp(-dt / timeConstantsMs[k]);
    }
    return v;
  }

  @Override
  public String toString() {
    return "FittedTransient[edge "
        + edgeMs
        + " ms, fit "
        + fitStartMs
        + "–"
        + fitEndMs
        + " ms, steady "
        + steadyLevel
        + ", A "
        + Arrays.toString(amplitudes)
        + ", tau "
        + Arrays.toString(timeConstantsMs)
        + " ms]";
  }
}
