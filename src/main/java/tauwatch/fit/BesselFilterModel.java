package tauwatch.fit;

/**
 * The amplifier's analog 4-pole low-pass Bessel filter, as far as the transient fit needs it: its
 * low-frequency group delay, the settling time of its own modes, and its exact gain for a decaying
 * exponential.
 *
 * <p>Immutable and thread-safe; allocates nothing after construction.
 *
 * <p>Bessel filter theory (e.g. any filter handbook; from memory): the delay-normalised 4-pole
 * Bessel is H(s) = 105 / (s⁴ + 10 s³ + 45 s² + 105 s + 105) with a group delay of 1 at DC. Scaled
 * to a −3 dB cutoff f_c its DC group delay is ω₃/(2π f_c) ≈ 0.336/f_c, where ω₃ ≈ 2.114 is the −3
 * dB frequency of the delay-normalised form (solved here, not typed in).
 */
public final class BesselFilterModel {
  /** −3 dB angular frequency of the delay-normalised 4-pole Bessel (rad per unit delay). */
  static final double OMEGA_3DB = solveOmega3dB();

  /**
   * Slowest decay rate of the delay-normalised filter's own modes: the real part of its pole pair
   * nearest the imaginary axis, −2.1038 ± 2.6574j (Bessel filter theory, from memory; checked
   * against the polynomial in the tests).
   */
  static final double SLOWEST_POLE_RATE = 2.1038;

  private final double cutoffHz;
  private final double groupDelayS;

  public BesselFilterModel(double cutoffHz) {
    this.cutoffHz = cutoffHz;
    this.groupDelayS = cutoffHz > 0 ? OMEGA_3DB / (2 * Math.PI * cutoffHz) : 0;
  }

  public double cutoffHz() {
    return cutoffHz;
  }

  /** DC group delay in seconds (≈ 0.336/f_c); 0 without a filter. */
  public double groupDelayS() {
    return groupDelayS;
  }

  /** Time constant in seconds of the filter's slowest own mode (≈ 0.16/f_c); 0 without a filter. */
  public double slowestModeS() {
    return groupDelayS / SLOWEST_POLE_RATE;
  }

  /**
   * The factor that turns the amplitude of a filtered exponential tail back into the amplitude of
   * the exponential that entered the filter: 1/H(−1/τ). A causal exponential A·e^(−t/τ) leaves the
   * filter, once the filter's own modes have settled, as A·H(−1/τ)·e^(−t/τ).
   */
  public double tailCorrection(double tauS) {
    if (groupDelayS == 0) {
      return 1;
    }
    double x = -groupDelayS / tauS;
    return denominator(x) / 105.0;
  }

  /** d/dτ of {@link #tailCorrection(double)}, for error propagation. */
  public double tailCorrectionDerivative(double tauS) {
    if (groupDelayS == 0) {
      return 0;
    }
    double x = -groupDelayS / tauS;
    double dxdTau = groupDelayS / (tauS * tauS);
    return denominatorDerivative(x) * dxdTau / 105.0;
  }

  /**
   * The variance inflation of this filter's output noise sampled every {@code sampleIntervalS}: Σ_k
   * ρ(k·dt) over all lags, for white noise at the filter's input. By Poisson summation it is
   * fs·|H(0)|²/(2·B) with B the one-sided noise bandwidth ∫₀^∞|H(j2πf)|² df, up to aliasing terms
   * that vanish for fs well above f_c (signal theory; from memory); never below 1. 1 without a
   * filter.
   */
  public double noiseVarianceInflation(double sampleIntervalS) {
    if (groupDelayS == 0) {
      return 1;
    }
    double bandwidthHz = NORMALISED_NOISE_BANDWIDTH / (2 * Math.PI * groupDelayS);
    return Math.max(1, 1 / (sampleIntervalS * 2 * bandwidthHz));
  }

  /** ∫₀^∞ |H(jΩ)|² dΩ of the delay-normalised filter, by Simpson's rule (|H|² falls as Ω⁻⁸). */
  static final double NORMALISED_NOISE_BANDWIDTH = integrateGainSquared();

  private static double integrateGainSquared() {
    int n = 20_000;
    double hi = 60;
    double h = hi / n;
    double sum = 0;
    for (int i = 0; i <= n; i++) {
      double w = i * h;
      double w2 = w * w;
      double re = w2 * w2 - 45 * w2 + 105;
      double im = -10 * w2 * w + 105 * w;
      double g2 = 105.0 * 105.0 / (re * re + im * im);
      sum += (i == 0 || i == n ? 1 : i % 2 == 1 ? 4 : 2) * g2;
    }
    return sum * h / 3;
  }

  /** The delay-normalised Bessel denominator s⁴ + 10 s³ + 45 s² + 105 s + 105 at a real s. */
  static double denominator(double s) {
    return (((s + 10) * s + 45) * s + 105) * s + 105;
  }

  private static double denominatorDerivative(double s) {
    return ((4 * s + 30) * s + 90) * s + 105;
  }

  /** |H(jω)|² = 1/2 solved by bisection; |H| falls monotonically for a Bessel low-pass. */
  private static double solveOmega3dB() {
    double lo = 0.5;
    double hi = 10;
    for (int i = 0; i < 100; i++) {
      double w = 0.5 * (lo + hi);
      double w2 = w * w;
      double re = w2 * w2 - 45 * w2 + 105;
      double im = -10 * w2 * w + 105 * w;
      double gain2 = 105.0 * 105.0 / (re * re + im * im);
      if (gain2 > 0.5) {
        lo = w;
      } else {
        hi = w;
      }
    }
    return 0.5 * (lo + hi);
  }
}
