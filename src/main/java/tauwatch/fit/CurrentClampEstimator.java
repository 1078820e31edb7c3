package tauwatch.fit;

import java.util.Locale;
import tauwatch.pulse.PulseWindow;
import tauwatch.stream.ClampMode;

/**
 * Estimates Rin, τ, Cm, the resting potential and (from the bridge error) Ra of a whole-cell
 * recording from one current-clamp test pulse.
 *
 * <p>Not thread-safe: one instance per analysis thread. Each call allocates the fit's arrays and
 * the returned estimate (per pulse, off the sample path); it never throws for bad data.
 *
 * <p>Model (RC step response, e.g. Johnston &amp; Wu 1995, from memory; CHECKS.md): after a current
 * step ΔI the recorded voltage is V(t) = V_rest + ΔI·Ra + ΔI·Rin·(1 − e^(−t/τ)), τ = Rm·Cm — an
 * instantaneous jump ΔI·Ra through the electrode (the bridge error, less any bridge balance the
 * amplifier subtracts) and an exponential approach. The fit of V_ss + A·e^(−t/τ) starts once the
 * output filter has settled, so the filter's smoothing of the jump does not matter: V_ss − V_rest =
 * ΔI·Rt gives Rt, the exponential's amplitude carried back through the filter gives Rin =
 * −A·g(τ)/ΔI, and Ra = Rt − Rin; Cm = τ/Rin. The resting potential is the baseline's mean. On- and
 * off-transients are combined by inverse-variance weights as in {@link VoltageClampEstimator}.
 *
 * <p>Ra is reported as the bridge error: when the jump is below {@link
 * EstimatorOptions#bridgeBalancedMOhm()} or within three standard errors of zero, the bridge is
 * balanced, Ra is left out (NaN) and the estimate's note says so — the pulse is not rejected for
 * it.
 */
public final class CurrentClampEstimator implements PulseEstimator {
  /** mV / pA = GΩ; ×1000 gives MΩ. */
  private static final double MOHM_PER_MV_PER_PA = 1000;

  private static final String[] NAMES = {"Rt", "Rin", "tau"};

  private final EstimatorOptions options;
  private BesselFilterModel filter = new BesselFilterModel(0);

  public CurrentClampEstimator(EstimatorOptions options) {
    this.options = options;
  }

  public CurrentClampEstimator() {
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

  private String fill(PulseWindow w, PulseEstimate.Builder b) {
    if (w.mode != ClampMode.CURRENT_CLAMP) {
      return "not a current-clamp pulse";
    }
    if (w.spansGap) {
      return "window spans a gap in the stream";
    }
    double stepPa = w.stepAmplitude();
    if (!Double.isFinite(stepPa) || Math.abs(stepPa) < options.minStepPa()) {
      return "step of " + fmt(stepPa) + " pA is below " + fmt(options.minStepPa()) + " pA";
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
    int window = Math.max(1, (int) Math.round(options.excursionWindowMs() / dtMs));

    int nPre = onset + 1;
    int nb =
        Math.min(
            nPre,
            Math.max(options.minBaselineSamples(), (int) (options.baselineFraction() * nPre)));
    double cutoffHz =
        options.filterCutoffHz() > 0
            ? options.filterCutoffHz()
            : options.filterCutoffHz() < 0 ? 0 : Math.max(0, w.filterCutoffHz);
    if (filter.cutoffHz() != cutoffHz) {
      filter = new BesselFilterModel(cutoffHz);
    }
    BaselineNoise noise =
        BaselineNoise.of(w.response, nPre - nb, onset)
            .atLeast(filter.noiseVarianceInflation(w.sampleIntervalS));
    double vrest = noise.mean();
    double vrestSe = noise.meanStandardError();
    b.value(Parameter.RESTING_POTENTIAL, vrest, vrestSe);
    double baseExcursion =
        ResidualExcursion.sigmas(
            w.response, nPre - nb, onset, onset, dtMs, vrest, NONE, NONE, noise, window, 0);
    if (baseExcursion > options.maxExcursionSigmas()) {
      return "baseline carries an event (" + fmt(baseExcursion) + " sd)";
    }

    Side on = new Side();
    String why =
        fitSide(w, onset, offset, vrest, vrestSe * vrestSe, stepPa, noise, dtMs, window, on);
    if (why != null) {
      return "on-transient: " + why;
    }
    if (on.tauMs * options.minDecayTaus() > (offset - onset) * dtMs) {
      return "response not settled within the step (tau " + fmt(on.tauMs) + " ms)";
    }
    Side off = null;
    if ((end - offset) * dtMs >= options.minDecayTaus() * on.tauMs
        && end - startRow(w, offset) + 1 >= options.minFitSamples()) {
      off = new Side();
      why = fitSide(w, offset, end, on.steady, on.cu[0][0], -stepPa, noise, dtMs, window, off);
      if (why != null) {
        return "off-transient: " + why;
      }
    }
    double[] x = new double[3];
    double[][] c = new double[3][3];
    if (off == null) {
      System.arraycopy(on.x, 0, x, 0, 3);
      for (int i = 0; i < 3; i++) {
        System.arraycopy(on.cx[i], 0, c[i], 0, 3);
      }
    } else {
      // The off-response is measured from the on-response's steady level (u index 0).
      double[][] cross = OnOffCombination.cross(on.jac, on.cu, 0, off.jac, 3);
      int bad =
          OnOffCombination.combine(
              on.x,
              on.cx,
              off.x,
              off.cx,
              cross,
              options.onOffTolerance(),
              options.onOffSigmas(),
              x,
              c);
      if (bad >= 0) {
        return "on/off responses disagree on "
            + NAMES[bad]
            + " ("
            + fmt(on.x[bad])
            + " vs "
            + fmt(off.x[bad])
            + ")";
      }
    }
    double rt = x[0];
    double rin = x[1];
    double tauMs = x[2];
    double ra = rt - rin;
    double cm = 1000 * tauMs / rin; // ms/MΩ = nF
    double raSe = Math.sqrt(OnOffCombination.quad(new double[] {1, -1, 0}, c));
    double cmSe = Math.sqrt(OnOffCombination.quad(new double[] {0, -cm / rin, cm / tauMs}, c));
    b.value(Parameter.TOTAL_RESISTANCE, rt, Math.sqrt(c[0][0]));
    b.value(Parameter.INPUT_RESISTANCE, rin, Math.sqrt(c[1][1]));
    b.value(Parameter.TIME_CONSTANT, tauMs, Math.sqrt(c[2][2]));
    b.value(Parameter.MEMBRANE_CAPACITANCE, cm, cmSe);
    if (Math.abs(ra) < Math.max(options.bridgeBalancedMOhm(), 3 * raSe)) {
      b.note(
          "bridge balanced: no I·Ra jump, Ra not measured ("
              + fmt(ra)
              + " ± "
              + fmt(raSe)
              + " MΩ)");
    } else if (ra < 0) {
      b.note("bridge over-balanced by " + fmt(-ra) + " MΩ: Ra not measured");
    } else {
      b.value(Parameter.ACCESS_RESISTANCE, ra, raSe);
      b.note("unbalanced bridge: Ra from the I·Ra jump");
    }
    double rss = on.fit.rssPa2 + (off == null ? 0 : off.fit.rssPa2);
    int n = on.fit.samples + (off == null ? 0 : off.fit.samples);
    b.rmsResidual(Math.sqrt(rss / n));

    if (!Double.isFinite(rin) || !Double.isFinite(cm)) {
      return "fit gave non-finite values";
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

  private static final double[] NONE = new double[0];

  /** The excursion allowance is this many times the rms allowance (a maximum, not an rms). */
  static final double EXCURSION_FLOOR_FACTOR = 3;

  /** One fitted response: (Rt, Rin, τ) and their covariance. */
  private static final class Side {
    TransientFit.Result fit;
    double steady;
    double tauMs;
    final double[] x = new double[3];
    final double[][] cx = new double[3][3];

    /** Jacobian of x over u = (V_ss, A, τ, V_ref), and u's covariance. */
    double[][] jac;

    double[][] cu;
  }

  /** The first row after the command edge at {@code edge} where the filtered jump has settled. */
  private int startRow(PulseWindow w, int edge) {
    int start = edge + 1 + options.skipAfterPeakSamples();
    if (filter.groupDelayS() > 0) {
      double settleS = filter.groupDelayS() + options.filterSettleModes() * filter.slowestModeS();
      start = Math.max(start, edge + (int) Math.ceil(settleS / w.sampleIntervalS));
    }
    return start;
  }

  private String fitSide(
      PulseWindow w,
      int edge,
      int last,
      double refMv,
      double refVar,
      double stepPa,
      BaselineNoise noise,
      double dtMs,
      int window,
      Side s) {
    int start = startRow(w, edge);
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
    double inflation = noise.varianceInflation();
    if (!(Math.abs(amp)
        > options.minTransientSigmas() * Math.sqrt(inflation * r.covariance[1][1]))) {
      return "no charging response above the noise";
    }
    double ampAtStart = amp * Math.exp(-(start - edge) * dtMs / tauMs);
    double excursion =
        ResidualExcursion.sigmas(
            w.response,
            start,
            last,
            edge,
            dtMs,
            r.steadyPa,
            new double[] {amp},
            new double[] {tauMs},
            noise,
            window,
            EXCURSION_FLOOR_FACTOR * options.residualFloorFraction() * Math.abs(ampAtStart));
    if (excursion > options.maxExcursionSigmas()) {
      return "residual excursion of "
          + fmt(excursion)
          + " sd (an event, a spike or an artefact rides on the response)";
    }
    double limit =
        options.maxResidualToNoise() * noise.sd()
            + options.residualFloorFraction() * Math.abs(ampAtStart);
    if (r.transientRmsPa > limit) {
      return "residual "
          + fmt(r.transientRmsPa)
          + " mV far above the baseline noise "
          + fmt(noise.sd())
          + " mV";
    }
    double[] gain = VoltageClampEstimator.filterGain(options, filter, tauMs);
    double g = gain[0];
    double dg = gain[1];
    double k = MOHM_PER_MV_PER_PA / stepPa;
    double rt = k * (r.steadyPa - refMv);
    double rin = -k * amp * g;
    s.steady = r.steadyPa;
    s.tauMs = tauMs;
    s.x[0] = rt;
    s.x[1] = rin;
    s.x[2] = tauMs;
    // Gradients over u = (V_ss, A, τ, V_ref); the fit's covariance is widened by the noise's
    // correlation (BaselineNoise); V_ref is independent of the fit.
    double[][] grad = {{k, 0, 0, -k}, {0, -k * g, -k * amp * dg, 0}, {0, 0, 1, 0}};
    double[][] cu = new double[4][4];
    for (int i = 0; i < 3; i++) {
      for (int j = 0; j < 3; j++) {
        cu[i][j] = r.covariance[i][j] * inflation;
      }
    }
    cu[3][3] = refVar;
    s.jac = grad;
    s.cu = cu;
    double[][] cx = OnOffCombination.propagate(grad, cu);
    for (int i = 0; i < 3; i++) {
      System.arraycopy(cx[i], 0, s.cx[i], 0, 3);
    }
    return null;
  }

  private static String fmt(double v) {
    return String.format(Locale.ROOT, "%.3g", v);
  }
}
