package tauwatch.fit;

/**
 * How the estimator undoes the amplifier filter's delay when it extrapolates a transient back to
 * the step for the peak current I₀.
 *
 * <p>Immutable; safe to share.
 */
public enum FilterCompensation {
  /** Extrapolate to the onset itself, as if there were no filter (reads Ra low when filtered). */
  NONE,
  /** Evaluate the fitted exponential at onset + the filter's group delay (≈ 0.336/f_c). */
  GROUP_DELAY,
  /** Divide the fitted tail amplitude by the filter's exact gain H(−1/τ) for that exponential. */
  BESSEL_GAIN
}
