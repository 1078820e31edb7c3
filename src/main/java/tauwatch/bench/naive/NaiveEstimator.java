package tauwatch.bench.naive;

import java.util.List;
import org.apache.commons.math3.fitting.leastsquares.LeastSquaresBuilder;
import org.apache.commons.math3.fitting.leastsquares.LeastSquaresOptimizer;
import org.apache.commons.math3.fitting.leastsquares.LevenbergMarquardtOptimizer;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.ArrayRealVector;
import org.apache.commons.math3.linear.RealMatrix;
import org.apache.commons.math3.linear.RealVector;
import org.apache.commons.math3.util.Pair;

/**
 * Estimates Ra, Rin, Cm, τ and the holding current from one voltage-clamp pulse the way a first
 * version does: a Commons Math Levenberg–Marquardt fit of I(t) = I_ss + A·e^(−t/τ) over every row
 * of the on- and the off-transient, each started from the same fixed guess (τ = {@value
 * #START_TAU_MS} ms, I_ss and A read off the first and last rows), then the mean of the two sides.
 *
 * <p>The model and its derived quantities are the product's (Gillis 1995 in Sakmann &amp; Neher,
 * from memory; CHECKS.md): I₀ = ΔV/Ra, I_∞ = ΔV/(Ra + Rm), τ = Ra·Rm·Cm/(Ra + Rm). The amplifier
 * filter is undone by evaluating the exponential at onset + the 4-pole Bessel's group delay
 * (0.336/f_c, a filter handbook value, from memory), and the fit starts two group delays after the
 * peak. Single-threaded; allocates freely (it is the baseline).
 */
public final class NaiveEstimator {
  /** The fixed generic start for τ: a typical whole-cell time constant. */
  static final double START_TAU_MS = 1.0;

  private static final double BESSEL4_DELAY_TIMES_FC = 0.336;

  private final double filterCutoffHz;

  public NaiveEstimator(double filterCutoffHz) {
    this.filterCutoffHz = filterCutoffHz;
  }

  /**
   * @param window the pulse's samples: baseline, step, off-transient
   * @param onset index of the first row showing the step
   * @param offset index of the first row back at holding
   */
  public NaiveEstimate estimate(
      long pulse, List<Sample> window, int onset, int offset, double sampleIntervalS) {
    double dtMs = sampleIntervalS * 1e3;
    double hold = 0;
    for (int i = 0; i <= onset; i++) {
      hold += window.get(i).responsePa();
    }
    hold /= onset + 1;
    double holdCmd = 0;
    for (int i = 0; i < onset; i++) {
      holdCmd += window.get(i).commandMv();
    }
    holdCmd /= onset;
    double stepCmd = 0;
    for (int i = onset; i < offset; i++) {
      stepCmd += window.get(i).commandMv();
    }
    stepCmd /= offset - onset;
    double stepMv = stepCmd - holdCmd;
    double delayMs = filterCutoffHz > 0 ? BESSEL4_DELAY_TIMES_FC / filterCutoffHz * 1e3 : 0;

    double[] on = fitSide(window, onset, offset - 1, dtMs, delayMs);
    double[] off = fitSide(window, offset, window.size() - 1, dtMs, delayMs);
    double onsetS = window.get(onset).index() * sampleIntervalS;
    long endNanos = window.get(window.size() - 1).receivedNanos();
    if (on == null || off == null) {
      return new NaiveEstimate(
          pulse,
          onsetS,
          Double.NaN,
          Double.NaN,
          Double.NaN,
          Double.NaN,
          Double.NaN,
          hold,
          false,
          endNanos);
    }
    // On side: relative to holding; off side: relative to the step's steady state, step reversed.
    double raOn = 1000 * stepMv / (on[0] + on[1] - hold);
    double rtOn = 1000 * stepMv / (on[0] - hold);
    double raOff = 1000 * -stepMv / (off[0] + off[1] - on[0]);
    double rtOff = 1000 * -stepMv / (off[0] - on[0]);
    double ra = 0.5 * (raOn + raOff);
    double rt = 0.5 * (rtOn + rtOff);
    double tau = 0.5 * (on[2] + off[2]);
    double rin = rt - ra;
    double cmPf = tau * (ra + rin) / (ra * rin) * 1000;
    boolean ok = ra > 0 && rin > 0 && tau > 0 && Double.isFinite(cmPf);
    return new NaiveEstimate(pulse, onsetS, ra, rin, rt, cmPf, tau, hold, ok, endNanos);
  }

  /** {I_ss, A at the (delay-corrected) edge, τ} of rows after {@code edge}, or null. */
  private double[] fitSide(List<Sample> w, int edge, int last, double dtMs, double delayMs) {
    double ref = w.get(edge).responsePa();
    int peak = edge + 1;
    double best = -1;
    for (int i = edge + 1; i <= last; i++) {
      double d = Math.abs(w.get(i).responsePa() - ref);
      if (d > best) {
        best = d;
        peak = i;
      }
    }
    int start = Math.max(peak + 1, edge + (int) Math.ceil(2 * delayMs / dtMs) + 1);
    int n = last - start + 1;
    if (n < 10) {
      return null;
    }
    double[] t = new double[n];
    double[] y = new double[n];
    for (int k = 0; k < n; k++) {
      t[k] = (start + k - edge) * dtMs - delayMs;
      y[k] = w.get(start + k).responsePa();
    }
    double iss0 = y[n - 1];
    double a0 = (y[0] - iss0) * Math.exp(t[0] / START_TAU_MS);
    LeastSquaresOptimizer.Optimum opt;
    try {
      opt =
          new LevenbergMarquardtOptimizer()
              .optimize(
                  new LeastSquaresBuilder()
                      .start(new double[] {iss0, a0, START_TAU_MS})
                      .model(p -> mono(p, t))
                      .target(y)
                      .maxEvaluations(1000)
                      .maxIterations(1000)
                      .build());
    } catch (RuntimeException e) {
      return null;
    }
    double[] p = opt.getPoint().toArray();
    return p[2] > 0 ? p : null;
  }

  private static Pair<RealVector, RealMatrix> mono(RealVector p, double[] t) {
    double iss = p.getEntry(0);
    double a = p.getEntry(1);
    double tau = p.getEntry(2);
    double[] f = new double[t.length];
    double[][] j = new double[t.length][3];
    for (int k = 0; k < t.length; k++) {
      double e = Math.exp(-t[k] / tau);
      f[k] = iss + a * e;
      j[k][0] = 1;
      j[k][1] = e;
      j[k][2] = a * e * t[k] / (tau * tau);
    }
    return new Pair<>(new ArrayRealVector(f, false), new Array2DRowRealMatrix(j, false));
  }
}
