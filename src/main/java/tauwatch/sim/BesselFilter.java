package tauwatch.sim;

import org.apache.commons.math3.analysis.solvers.LaguerreSolver;
import org.apache.commons.math3.complex.Complex;

/**
 * The amplifier's 4-pole low-pass Bessel output filter as a continuous-time state-space system,
 * normalised so that its magnitude is −3 dB at the cutoff (the "mag" normalisation of analog filter
 * design).
 *
 * <p>Immutable; all work happens in the constructor. Time unit of the matrices: ms.
 *
 * <p>Design: the transfer function is θ(0)/θ(s) with θ the reverse Bessel polynomial of order 4,
 * θ(s) = Σ a_k s^k, a_k = (2n−k)! / (2^(n−k) k! (n−k)!) (Bessel filter theory, e.g. Thomson, Proc.
 * IEE 96:487, 1949 — from memory), whose DC group delay is 1 s. The −3 dB frequency ω3 of that
 * delay-normalised prototype is found by bisection; the poles are then scaled by ωc/ω3. The filter
 * is realised as a cascade of two second-order sections x1' = ω0 x2, x2' = −ω0 x1 − b x2 + ω0 u, y
 * = x1 (each with unit DC gain), a well-conditioned form for the matrix exponential.
 */
public final class BesselFilter {
  /** Number of poles and of continuous states. */
  public static final int ORDER = 4;

  private final double cutoffHz;
  private final double prototypeCutoffRadPerS;
  private final double[] a = new double[ORDER * ORDER];
  private final double[] b = new double[ORDER];
  private final double[] c = new double[ORDER];

  public BesselFilter(double cutoffHz) {
    if (!(cutoffHz > 0) || Double.isInfinite(cutoffHz)) {
      throw new IllegalArgumentException("filter cutoff (Hz) must be > 0, got " + cutoffHz);
    }
    this.cutoffHz = cutoffHz;
    double[] theta = reverseBesselPolynomial(ORDER);
    this.prototypeCutoffRadPerS = minus3dbFrequency(theta);
    double scaleRadPerMs = 2 * Math.PI * cutoffHz / 1000.0 / prototypeCutoffRadPerS;
    Complex[] roots = new LaguerreSolver(1e-15, 1e-15).solveAllComplex(theta, -1.0);
    int section = 0;
    for (Complex p : roots) {
      if (p.getImaginary() <= 0) {
        continue; // one of each conjugate pair; θ of even order has no real root
      }
      double sigma = p.getReal() * scaleRadPerMs;
      double omega0 = p.abs() * scaleRadPerMs;
      int r = 2 * section;
      // Section states (x1, x2) at rows r, r+1.
      a[r * ORDER + r + 1] = omega0;
      a[(r + 1) * ORDER + r] = -omega0;
      a[(r + 1) * ORDER + r + 1] = 2 * sigma; // −b with b = −2σ
      if (section == 0) {
        b[r + 1] = omega0;
      } else {
        // Input of the second section is the first section's output x1 (row 0).
        a[(r + 1) * ORDER] = omega0;
      }
      section++;
    }
    if (section != ORDER / 2) {
      throw new IllegalStateException("Bessel pole search found " + section + " pole pairs");
    }
    c[ORDER - 2] = 1.0; // output is x1 of the second section
  }

  public double cutoffHz() {
    return cutoffHz;
  }

  /**
   * The −3 dB frequency of the delay-normalised prototype in rad/s; also the filter's DC group
   * delay in units of 1/ωc, so the delay is {@code prototypeCutoff / (2π fc)} (≈ 0.336/fc for 4
   * poles).
   */
  public double prototypeCutoffRadPerS() {
    return prototypeCutoffRadPerS;
  }

  /** DC group delay in seconds. */
  public double groupDelayS() {
    return prototypeCutoffRadPerS / (2 * Math.PI * cutoffHz);
  }

  /** Copies the state matrix (4×4, row-major, per ms) into {@code out} at the given block. */
  public void copyA(double[] out, int lda, int row0, int col0) {
    for (int r = 0; r < ORDER; r++) {
      for (int k = 0; k < ORDER; k++) {
        out[(row0 + r) * lda + col0 + k] = a[r * ORDER + k];
      }
    }
  }

  /** Input vector: the filter's input enters state {@code i} with gain {@code inputGain(i)}. */
  public double inputGain(int state) {
    return b[state];
  }

  /** Output vector: y = Σ outputGain(i)·x_i. */
  public double outputGain(int state) {
    return c[state];
  }

  /** Coefficients a_0..a_n (increasing powers) of the reverse Bessel polynomial of order n. */
  static double[] reverseBesselPolynomial(int n) {
    double[] a = new double[n + 1];
    for (int k = 0; k <= n; k++) {
      a[k] = factorial(2 * n - k) / (Math.pow(2, n - k) * factorial(k) * factorial(n - k));
    }
    return a;
  }

  private static double minus3dbFrequency(double[] theta) {
    double lo = 0;
    double hi = 1;
    while (gainSquared(theta, hi) > 0.5) {
      hi *= 2;
    }
    for (int i = 0; i < 200 && hi - lo > 1e-15 * hi; i++) {
      double mid = 0.5 * (lo + hi);
      if (gainSquared(theta, mid) > 0.5) {
        lo = mid;
      } else {
        hi = mid;
      }
    }
    return 0.5 * (lo + hi);
  }

  /** |θ(0)/θ(jω)|². */
  private static double gainSquared(double[] theta, double omega) {
    double re = 0;
    double im = 0;
    double pr = 1; // (jω)^k, real and imaginary parts
    double pi = 0;
    for (double coeff : theta) {
      re += coeff * pr;
      im += coeff * pi;
      double nr = -pi * omega;
      double ni = pr * omega;
      pr = nr;
      pi = ni;
    }
    return theta[0] * theta[0] / (re * re + im * im);
  }

  private static double factorial(int k) {
    double f = 1;
    for (int i = 2; i <= k; i++) {
      f *= i;
    }
    return f;
  }
}
