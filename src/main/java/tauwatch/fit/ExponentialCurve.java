package tauwatch.fit;

/**
 * A fitted curve offset + Σ a_k·e^(−t/τ_k) (no, one or two components) walked row by row over
 * evenly spaced rows, each e^(−t/τ) by the recurrence e_(k+1) = e_k·e^(−Δt/τ): one exp per
 * component per walk instead of one per row (the relative error grows by about one rounding per
 * row, ~10⁻¹³ over a pulse).
 *
 * <p>A small mutable cursor, one per walk; not thread-safe.
 */
final class ExponentialCurve {
  private final double offset;
  private final double a1;
  private final double a2;
  private final double q1;
  private final double q2;
  private double e1;
  private double e2;

  /**
   * The curve at time {@code t0}, stepping {@code dt} per {@link #advance()}; {@code amps} and
   * {@code taus} have the same length, at most 2.
   */
  ExponentialCurve(double offset, double[] amps, double[] taus, double t0, double dt) {
    if (amps.length > 2 || taus.length != amps.length) {
      throw new IllegalArgumentException("at most two components, amplitudes matching taus");
    }
    this.offset = offset;
    this.a1 = amps.length > 0 ? amps[0] : 0;
    this.a2 = amps.length > 1 ? amps[1] : 0;
    this.q1 = amps.length > 0 ? Math.exp(-dt / taus[0]) : 0;
    this.q2 = amps.length > 1 ? Math.exp(-dt / taus[1]) : 0;
    this.e1 = amps.length > 0 ? Math.exp(-t0 / taus[0]) : 0;
    this.e2 = amps.length > 1 ? Math.exp(-t0 / taus[1]) : 0;
  }

  /** The curve's value at the current row. */
  double value() {
    return offset + a1 * e1 + a2 * e2;
  }

  /** Moves to the next row. */
  void advance() {
    e1 *= q1;
    e2 *= q2;
  }
}
