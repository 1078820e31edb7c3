package tauwatch.fit;

import tauwatch.pulse.PulseWindow;
import tauwatch.stream.ClampMode;

/**
 * Estimates Ra, Rt, Rin, Cm (from τ and from the transient's charge), τ and the holding current of
 * a whole-cell recording from one voltage-clamp test pulse, by fitting the on- and off-transients
 * with the single-compartment RC model.
 *
 * <p>Not thread-safe: one instance per analysis thread. Each call allocates the fit's arrays and
 * the returned estimate (per pulse, off the sample path); it never throws for bad data.
 *
 * <p>Model (Gillis 1995 in Sakmann &amp; Neher, Single-Channel Recording; from memory; CHECKS.md):
 * after a step ΔV, I(t) = I_∞ + (I₀ − I_∞)·e^(−t/τ), I₀ = ΔV/Ra, I_∞ = ΔV/(Ra + Rm), τ =
 * Ra·Rm·Cm/(Ra + Rm). The fit starts once the filter's own modes have settled, and I₀ comes from
 * the fitted exponential carried back to the onset through the filter (see {@link
 * FilterCompensation}). On and off transients are combined by inverse-variance weights per
 * parameter (Ra, Rt, τ); a disagreement beyond {@link EstimatorOptions#onOffTolerance()} that is
 * also statistically significant rejects the pulse.
 */
public final class VoltageClampEstimator implements PulseEstimator {
  /** mV / pA = GΩ; ×1000 gives MΩ. */
  private static final double MOHM_PER_MV_PER_PA = 1000;

  private final EstimatorOptions options;
  private BesselFilterModel filter = new BesselFilterModel(0);

  public VoltageClampEstimator(EstimatorOptions options) {
    this.options = options;
  }

  public VoltageClampEstimator() {
    this(EstimatorOptions.defaults());
  }

  public EstimatorOptions options() {
    return options;
  }

  @Override
  public PulseEstimate estimate(PulseWindow w) {
    PulseEstimate.Builder b =
        PulseEstimate.builder()
            .pulseNumber(w.pulseNumber)
            .onsetTimeS(w.onsetTimeS())
            .mode(w.mode)
            .stepAmplitude(w.stepAmplitude())
            .sweep(w.sweepNumber, w.sweepTimeS)
            .pulseEndReceivedNanos(w.lastSampleReceivedNanos)
            .model("mono");
    String problem = fill(w, b);
    if (problem != null) {
      b.reject(problem);
    }
    return b.build();
  }

  /** Fills {@code b} and returns why the pulse must be rejected, or null. */
  private String fill(PulseWindow w, PulseEstimate.Builder b) {
    if (w.mode != ClampMode.VOLTAGE_CLAMP) {
      return "not a voltage-clamp pulse";
    }
    if (w.spansGap) {
      return "window spans a gap in the stream";
    }
    double stepMv = w.stepAmplitude();
    if (!Double.isFinite(stepMv) || Math.abs(stepMv) < options.minStepMv()) {
      return "step of " + fmt(stepMv) + " mV is below " + fmt(options.minStepMv()) + " mV";
    }
    int onset = w.onsetIndex;
    int offset = w.offsetIndex;
    int end = w.length - 1;
    if (onset + 1 < options.minBaselineSamples() || end >= w.capacity() || offset <= onset) {
      return "window too short for a baseline";
    }
    if (!(w.sampleIntervalS > 0)) {
      return "sample interval is not positive";
    }
    for (int i = 0; i <= end; i++) {
      if (!Double.isFinite(w.response[i])) {
        return "response has a non-finite sample at row " + i;
      }
    }
    double dtMs = w.sampleIntervalS * 1e3;

    // Baseline: the latest rows up to and including the onset row, which is still sampled before
    // the step acts (interchange timing contract).
    int nPre = onset + 1;
    int nb =
        Math.min(
            nPre,
            Math.max(options.minBaselineSamples(), (int) (options.baselineFraction() * nPre)));
    double sum = 0;
    for (int i = nPre - nb; i <= onset; i++) {
      sum += w.response[i];
    }
    double holdPa = sum / nb;
    double ss = 0;
    for (int i = nPre - nb; i <= onset; i++) {
      double d = w.response[i] - holdPa;
      ss += d * d;
    }
    double noisePa = Math.sqrt(ss / (nb - 1));
    double holdVar = noisePa * noisePa / nb;
    b.value(Parameter.HOLDING_CURRENT, holdPa, Math.sqrt(holdVar));

    double cutoffHz =
        options.filterCutoffHz() > 0
            ? options.filterCutoffHz()
            : options.filterCutoffHz() < 0 ? 0 : Math.max(0, w.filterCutoffHz);
    if (filter.cutoffHz() != cutoffHz) {
      filter = new BesselFilterModel(cutoffHz);
    }

    Side on = new Side();
    String why = fitSide(w, onset, offset, holdPa, holdVar, stepMv, noisePa, dtMs, on);
    if (on.curve != null) {
      b.fitted(on.curve);
    }
    if (why != null) {
      return "on-transient: " + why;
    }
    if (on.tauMs * options.minDecayTaus() > (offset - onset) * dtMs) {
      return "transient not decayed within the step (tau " + fmt(on.tauMs) + " ms)";
    }

    Side off = null;
    int offStart = startRow(w, offset, end);
    boolean offLongEnough =
        end - offStart + 1 >= options.minFitSamples()
            && (end - offset) * dtMs >= options.minDecayTaus() * on.tauMs;
    if (offLongEnough) {
      off = new Side();
      double refVar = on.fit.covariance[0][0];
      why = fitSide(w, offset, end, on.steadyPa, refVar, -stepMv, noisePa, dtMs, off);
      if (off.curve != null) {
        b.fitted(off.curve);
      }
      if (why != null) {
        return "off-transient: " + why;
      }
    }

    // Combine (Ra, Rt, τ) by inverse-variance weights; a fixed-weight linear combination of two
    // independent estimates has covariance W·C_on·W + (I − W)·C_off·(I − W).
    double[] x = new double[3];
    double[][] c = new double[3][3];
    if (off == null) {
      System.arraycopy(on.x, 0, x, 0, 3);
      for (int i = 0; i < 3; i++) {
        System.arraycopy(on.cx[i], 0, c[i], 0, 3);
      }
    } else {
      double[] wt = new double[3];
      for (int i = 0; i < 3; i++) {
        double floor = 1e-18 * on.x[i] * on.x[i];
        double vOn = Math.max(on.cx[i][i], floor);
        double vOff = Math.max(off.cx[i][i], floor);
        wt[i] = vOff / (vOn + vOff);
        x[i] = wt[i] * on.x[i] + (1 - wt[i]) * off.x[i];
        double diff = Math.abs(on.x[i] - off.x[i]);
        if (diff > options.onOffTolerance() * Math.abs(x[i])
            && diff > options.onOffSigmas() * Math.sqrt(vOn + vOff)) {
          return "on/off transients disagree on "
              + SIDE_NAMES[i]
              + " ("
              + fmt(on.x[i])
              + " vs "
              + fmt(off.x[i])
              + ")";
        }
      }
      for (int i = 0; i < 3; i++) {
        for (int j = 0; j < 3; j++) {
          c[i][j] = wt[i] * wt[j] * on.cx[i][j] + (1 - wt[i]) * (1 - wt[j]) * off.cx[i][j];
        }
      }
    }

    double ra = x[0];
    double rt = x[1];
    double tauMs = x[2];
    double rin = rt - ra;
    double cm = 1000 * tauMs * rt / (ra * rin); // ms/MΩ = nF → ×1000 pF
    double[] gRin = {-1, 1, 0};
    double[] gCm = {-cm * (rt - 2 * ra) / (ra * rin), -cm * ra / (rt * rin), cm / tauMs};
    b.value(Parameter.ACCESS_RESISTANCE, ra, Math.sqrt(c[0][0]));
    b.value(Parameter.TOTAL_RESISTANCE, rt, Math.sqrt(c[1][1]));
    b.value(Parameter.INPUT_RESISTANCE, rin, Math.sqrt(quad(gRin, c)));
    b.value(Parameter.TIME_CONSTANT, tauMs, Math.sqrt(c[2][2]));
    b.value(Parameter.MEMBRANE_CAPACITANCE, cm, Math.sqrt(quad(gCm, c)));

    // Q = Cm·ΔV·(Rm/(Ra + Rm))² (CHECKS.md), so Cm(Q) = Q/ΔV·(Rt/Rin)²; pA·ms/mV = pF.
    double ratio = rt / rin;
    double cmq = on.chargePaMs / stepMv * ratio * ratio;
    if (off != null) {
      cmq = 0.5 * (cmq + off.chargePaMs / -stepMv * ratio * ratio);
    }
    b.value(Parameter.CHARGE_CAPACITANCE, cmq);

    double rss = on.fit.rssPa2 + (off == null ? 0 : off.fit.rssPa2);
    int n = on.fit.samples + (off == null ? 0 : off.fit.samples);
    b.rmsResidual(Math.sqrt(rss / n));

    if (!Double.isFinite(ra) || !Double.isFinite(rt) || !Double.isFinite(cm)) {
      return "fit gave non-finite values";
    }
    if (ra < options.minRaMOhm() || ra > options.maxRaMOhm()) {
      return "Ra "
          + fmt(ra)
          + " MΩ outside "
          + fmt(options.minRaMOhm())
          + "–"
          + fmt(options.maxRaMOhm());
    }
    if (rin < options.minRinMOhm() || rin > options.maxRinMOhm()) {
      return "Rin "
          + fmt(rin)
          + " MΩ outside "
          + fmt(options.minRinMOhm())
          + "–"
          + fmt(options.maxRinMOhm());
    }
    if (cm < options.minCmPf() || cm > options.maxCmPf()) {
      return "Cm "
          + fmt(cm)
          + " pF outside "
          + fmt(options.minCmPf())
          + "–"
          + fmt(options.maxCmPf());
    }
    return null;
  }

  private static final String[] SIDE_NAMES = {"Ra", "Rt", "tau"};

  /** One fitted transient: (Ra, Rt, τ) with their covariance, and the charge it carried. */
  private static final class Side {
    TransientFit.Result fit;
    double steadyPa;
    final double[] x = new double[3];
    final double[][] cx = new double[3][3];
    double tauMs;
    double chargePaMs;
    FittedTransient curve;
  }

  /**
   * The first row of a transient fit after a command edge at {@code edge}: past the raw peak (plus
   * {@code skipAfterPeakSamples}) and, with a filter, past onset + group delay + {@code
   * filterSettleModes} time constants of its slowest own mode, when the filtered trace has become
   * the exponential tail A·H(−1/τ)·e^(−t/τ) plus a constant.
   */
  private int startRow(PulseWindow w, int edge, int last) {
    int peak = edge + 1;
    double hold = w.response[edge];
    double best = -1;
    for (int i = edge + 1; i <= last; i++) {
      double d = Math.abs(w.response[i] - hold);
      if (d > best) {
        best = d;
        peak = i;
      }
    }
    int start = peak + options.skipAfterPeakSamples();
    if (filter.groupDelayS() > 0) {
      double settleS = filter.groupDelayS() + options.filterSettleModes() * filter.slowestModeS();
      start = Math.max(start, edge + (int) Math.ceil(settleS / w.sampleIntervalS));
    }
    return Math.max(start, edge + 1);
  }

  /** Fits the transient after the command edge at row {@code edge} up to row {@code last}. */
  private String fitSide(
      PulseWindow w,
      int edge,
      int last,
      double refPa,
      double refVar,
      double stepMv,
      double noisePa,
      double dtMs,
      Side s) {
    int start = startRow(w, edge, last);
    if (last - start + 1 < options.minFitSamples()) {
      return "too few samples after the filter settles";
    }
    TransientFit.Result r =
        TransientFit.fit(w.response, start, last, edge, dtMs, options.maxIterations());
    s.fit = r;
    if (r.failure != null) {
      return r.failure;
    }
    double tauMs = r.tauMs;
    double amp = r.amplitudePa;
    double ampAtStart = amp * Math.exp(-(start - edge) * dtMs / tauMs);
    double limit =
        options.maxResidualToNoise() * noisePa
            + options.residualFloorFraction() * Math.abs(ampAtStart);
    if (r.rmsPa() > limit) {
      return "residual "
          + fmt(r.rmsPa())
          + " pA far above the baseline noise "
          + fmt(noisePa)
          + " pA";
    }

    // Back through the filter: the true amplitude is the tail's amplitude times g(τ).
    double g;
    double dg;
    double delayMs = filter.groupDelayS() * 1e3;
    switch (options.filterCompensation()) {
      case GROUP_DELAY -> {
        g = Math.exp(-delayMs / tauMs);
        dg = g * delayMs / (tauMs * tauMs);
      }
      case BESSEL_GAIN -> {
        g = filter.tailCorrection(tauMs * 1e-3);
        dg = filter.tailCorrectionDerivative(tauMs * 1e-3) * 1e-3;
      }
      default -> {
        g = 1;
        dg = 0;
      }
    }
    double dI0 = amp * g + (r.steadyPa - refPa);
    s.curve =
        FittedTransient.mono(
            (edge - w.onsetIndex) * dtMs,
            (start - w.onsetIndex) * dtMs,
            (last - w.onsetIndex) * dtMs,
            r.steadyPa,
            amp,
            tauMs,
            refPa + dI0);
    double dIss = r.steadyPa - refPa;
    double ra = MOHM_PER_MV_PER_PA * stepMv / dI0;
    double rt = MOHM_PER_MV_PER_PA * stepMv / dIss;
    s.steadyPa = r.steadyPa;
    s.tauMs = tauMs;
    s.x[0] = ra;
    s.x[1] = rt;
    s.x[2] = tauMs;
    // Gradients over u = (I_ss, A, τ, I_ref); I_ref is independent of the fit.
    double[][] grad = {
      {-ra / dI0, -ra / dI0 * g, -ra / dI0 * amp * dg, ra / dI0},
      {-rt / dIss, 0, 0, rt / dIss},
      {0, 0, 1, 0}
    };
    double[][] cu = new double[4][4];
    for (int i = 0; i < 3; i++) {
      System.arraycopy(r.covariance[i], 0, cu[i], 0, 3);
    }
    cu[3][3] = refVar;
    for (int i = 0; i < 3; i++) {
      for (int j = 0; j < 3; j++) {
        double v = 0;
        for (int k = 0; k < 4; k++) {
          for (int l = 0; l < 4; l++) {
            v += grad[i][k] * cu[k][l] * grad[j][l];
          }
        }
        s.cx[i][j] = v;
      }
    }
    s.chargePaMs = charge(w.response, edge, last, r, dtMs, delayMs, dIss);
    return null;
  }

  /**
   * The transient's charge ∫(I − I_ss)dt from the edge, in pA·ms. The raw samples carry it where
   * the filter distorts the start (a low-pass filter preserves area, but delays the steady-state
   * step, which takes −ΔI_ss·delay away: added back); the fitted exponential carries the part past
   * the window. Without a filter the jump at the edge falls between rows 0 and 1, so that first
   * interval comes from the fit too.
   */
  private static double charge(
      double[] y,
      int edge,
      int last,
      TransientFit.Result r,
      double dtMs,
      double delayMs,
      double dIss) {
    double iss = r.steadyPa;
    double tau = r.tauMs;
    double q = 0;
    int first = edge;
    if (delayMs == 0) {
      q += r.amplitudePa * tau * (-Math.expm1(-dtMs / tau));
      first = edge + 1;
    }
    for (int i = first + 1; i <= last; i++) {
      q += 0.5 * ((y[i - 1] - iss) + (y[i] - iss)) * dtMs;
    }
    q += r.amplitudePa * tau * Math.exp(-(last - edge) * dtMs / tau);
    q += dIss * delayMs;
    return q;
  }

  private static double quad(double[] g, double[][] c) {
    double v = 0;
    for (int i = 0; i < g.length; i++) {
      for (int j = 0; j < g.length; j++) {
        v += g[i] * c[i][j] * g[j];
      }
    }
    return v;
  }

  private static String fmt(double v) {
    return String.format(java.util.Locale.ROOT, "%.3g", v);
  }
}
