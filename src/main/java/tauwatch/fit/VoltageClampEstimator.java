package tauwatch.fit;

import org.apache.commons.math3.distribution.FDistribution;
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
  private final PulsePreamble preamble;

  /** The amplifier filter of the pulse being fitted (from the preamble). */
  private BesselFilterModel filter = new BesselFilterModel(0);

  public VoltageClampEstimator(EstimatorOptions options) {
    this.options = options;
    this.preamble = new PulsePreamble(options);
  }

  public VoltageClampEstimator() {
    this(EstimatorOptions.defaults());
  }

  public EstimatorOptions options() {
    return options;
  }

  @Override
  public PulseEstimate estimate(PulseWindow w) {
    PulseEstimate.Builder b = PulseEstimate.builderFor(w).model("mono");
    String problem = fill(w, b);
    if (problem != null) {
      b.reject(problem);
    }
    return b.build();
  }

  /** Fills {@code b} and returns why the pulse must be rejected, or null. */
  private String fill(PulseWindow w, PulseEstimate.Builder b) {
    String unusable = preamble.prepare(w, ClampMode.VOLTAGE_CLAMP, options.minStepMv(), "mV");
    if (unusable != null) {
      return unusable;
    }
    filter = preamble.filter();
    double stepMv = w.stepAmplitude();
    int onset = w.onsetIndex;
    int offset = w.offsetIndex;
    int end = w.length - 1;
    double dtMs = preamble.dtMs;
    int window = preamble.excursionWindow;
    int baselineFrom = preamble.baselineFrom;
    BaselineNoise noise = preamble.noise;
    double holdPa = noise.mean();
    double holdSe = noise.meanStandardError();
    double holdVar = holdSe * holdSe;
    b.value(Parameter.HOLDING_CURRENT, holdPa, holdSe);
    double baseExcursion =
        ResidualExcursion.sigmas(
            w.response, baselineFrom, onset, onset, dtMs, holdPa, NONE, NONE, noise, window, 0);
    if (baseExcursion > options.maxExcursionSigmas()) {
      return "baseline carries an event (" + fmt(baseExcursion) + " sd)";
    }

    Side on = new Side();
    String why = fitSide(w, onset, offset, holdPa, holdVar, stepMv, noise, dtMs, window, null, on);
    if (on.curve != null) {
      b.fitted(on.curve);
    }
    if (why != null) {
      return "on-transient: " + why;
    }
    if (on.slowestTauMs * options.minDecayTaus() > (offset - onset) * dtMs) {
      return "transient not decayed within the step (tau " + fmt(on.slowestTauMs) + " ms)";
    }

    Side off = null;
    int offStart = startRow(w, offset, end);
    boolean offLongEnough =
        end - offStart + 1 >= options.minFitSamples()
            && (end - offset) * dtMs >= options.minDecayTaus() * on.slowestTauMs;
    if (offLongEnough) {
      off = new Side();
      why =
          fitSide(w, offset, end, on.steadyPa, on.steadyVar, -stepMv, noise, dtMs, window, on, off);
      if (off.curve != null) {
        b.fitted(off.curve);
      }
      if (why != null) {
        return "off-transient: " + why;
      }
    }

    int k = on.x.length;
    double[] x = new double[k];
    double[][] c = new double[k][k];
    if (off == null) {
      System.arraycopy(on.x, 0, x, 0, k);
      for (int i = 0; i < k; i++) {
        System.arraycopy(on.cx[i], 0, c[i], 0, k);
      }
    } else {
      // The off-transient is measured from the on-transient's steady current (u index 0), which
      // enters its Jacobian in the last column (the reference level).
      double[][] cross = OnOffCombination.cross(on.jac, on.cu, 0, off.jac, off.cu.length - 1);
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
        String[] names = on.bi ? BI_NAMES : SIDE_NAMES;
        return "on/off transients disagree on "
            + names[bad]
            + " ("
            + fmt(on.x[bad])
            + " vs "
            + fmt(off.x[bad])
            + ")";
      }
    }

    double ra = x[0];
    double rt = x[1];
    double tauMs = x[2];
    double rin = rt - ra;
    double[] gRin = new double[k];
    gRin[0] = -1;
    gRin[1] = 1;
    b.value(Parameter.ACCESS_RESISTANCE, ra, Math.sqrt(c[0][0]));
    b.value(Parameter.TOTAL_RESISTANCE, rt, Math.sqrt(c[1][1]));
    b.value(Parameter.INPUT_RESISTANCE, rin, Math.sqrt(OnOffCombination.quad(gRin, c)));
    b.value(Parameter.TIME_CONSTANT, tauMs, Math.sqrt(c[2][2]));
    double cm;
    if (on.bi) {
      // The capacitance the clamp charges (Q/ΔV·(Rt/Rin)², CHECKS.md): on a cell that is not
      // electrotonically compact this is less than the whole membrane's.
      cm = x[3];
      b.model("bi");
      b.value(Parameter.MEMBRANE_CAPACITANCE, cm, Math.sqrt(c[3][3]));
      b.value(Parameter.CHARGE_CAPACITANCE, cm, Math.sqrt(c[3][3]));
      b.value(Parameter.FAST_TIME_CONSTANT, x[4], Math.sqrt(c[4][4]));
      b.value(Parameter.SLOW_TIME_CONSTANT, x[5], Math.sqrt(c[5][5]));
      b.value(Parameter.FAST_AMPLITUDE, x[6], Math.sqrt(c[6][6]));
      b.value(Parameter.SLOW_AMPLITUDE, x[7], Math.sqrt(c[7][7]));
      b.note("two-exponential transient: Cm is the capacitance the clamp charges");
    } else {
      cm = 1000 * tauMs * rt / (ra * rin); // ms/MΩ = nF → ×1000 pF
      double[] gCm = {-cm * (rt - 2 * ra) / (ra * rin), -cm * ra / (rt * rin), cm / tauMs};
      b.value(Parameter.MEMBRANE_CAPACITANCE, cm, Math.sqrt(OnOffCombination.quad(gCm, c)));
      // Q = Cm·ΔV·(Rm/(Ra + Rm))² (CHECKS.md), so Cm(Q) = Q/ΔV·(Rt/Rin)²; pA·ms/mV = pF.
      double ratio = rt / rin;
      double cmq = on.chargePaMs / stepMv * ratio * ratio;
      if (off != null) {
        cmq = 0.5 * (cmq + off.chargePaMs / -stepMv * ratio * ratio);
      }
      b.value(Parameter.CHARGE_CAPACITANCE, cmq);
    }

    double rss = on.rssPa2 + (off == null ? 0 : off.rssPa2);
    int n = on.samples + (off == null ? 0 : off.samples);
    b.rmsResidual(Math.sqrt(rss / n));

    // The holding current's standard error from the noise of the baseline and both fits' residuals
    // (ResidualNoise): the baseline's own few rows estimate their noise too roughly for a 95 %
    // interval to cover 95 %.
    ResidualNoise pool = new ResidualNoise();
    pool.add(w.response, baselineFrom, onset, onset, dtMs, holdPa, NONE, NONE, 1);
    on.addResidualTo(pool, w.response, dtMs);
    if (off != null) {
      off.addResidualTo(pool, w.response, dtMs);
    }
    double poolInflation =
        Math.max(pool.varianceInflation(), filter.noiseVarianceInflation(w.sampleIntervalS));
    double pooledHoldSe = pool.sd() * Math.sqrt(poolInflation / (onset + 1 - baselineFrom));
    if (Double.isFinite(pooledHoldSe)) {
      b.value(Parameter.HOLDING_CURRENT, holdPa, pooledHoldSe);
    }

    if (!Double.isFinite(ra) || !Double.isFinite(rt) || !Double.isFinite(cm)) {
      return "fit gave non-finite values";
    }
    String implausible =
        PulsePreamble.outside("Ra", ra, "MΩ", options.minRaMOhm(), options.maxRaMOhm());
    if (implausible == null) {
      implausible =
          PulsePreamble.outside("Rin", rin, "MΩ", options.minRinMOhm(), options.maxRinMOhm());
    }
    if (implausible == null) {
      implausible = PulsePreamble.outside("Cm", cm, "pF", options.minCmPf(), options.maxCmPf());
    }
    if (implausible != null) {
      return implausible;
    }
    return null;
  }

  private static final double[] NONE = new double[0];
  private static final String[] SIDE_NAMES = {"Ra", "Rt", "tau"};
  private static final String[] BI_NAMES = {
    "Ra", "Rt", "tau", "Cm", "tau_fast", "tau_slow", "amp_fast", "amp_slow"
  };

  /**
   * One fitted transient: (Ra, Rt, τ) — or, two-exponential, (Ra, Rt, τ, Cm, τ₁, τ₂, A₁, A₂) — with
   * their covariance, and the charge it carried.
   */
  private static final class Side {
    boolean bi;
    double steadyPa;
    double steadyVar;
    double[] x;
    double[][] cx;

    /** Jacobian of x over u = (I_ss, fit parameters…, I_ref), and u's covariance. */
    double[][] jac;

    double[][] cu;
    double slowestTauMs;
    double chargePaMs;
    double rssPa2;
    int samples;
    FittedTransient curve;

    /** The fitted model over rows fitFrom..fitTo, times from the edge row. */
    int edge;

    int fitFrom;
    int fitTo;
    double fitOffset;
    double[] fitAmps;
    double[] fitTaus;

    void addResidualTo(ResidualNoise pool, double[] y, double dtMs) {
      pool.add(y, fitFrom, fitTo, edge, dtMs, fitOffset, fitAmps, fitTaus, 1 + 2 * fitAmps.length);
    }
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

  /**
   * The filter gain correction g(τ) = 1/H(−1/τ) (or its group-delay approximation) and dg/dτ, for a
   * tail of time constant {@code tauMs}: {g, dg/dτ (per ms)}.
   */
  static double[] filterGain(EstimatorOptions options, BesselFilterModel filter, double tauMs) {
    double delayMs = filter.groupDelayS() * 1e3;
    return switch (options.filterCompensation()) {
      case GROUP_DELAY -> {
        double g = Math.exp(-delayMs / tauMs);
        yield new double[] {g, g * delayMs / (tauMs * tauMs)};
      }
      case BESSEL_GAIN ->
          new double[] {
            filter.tailCorrection(tauMs * 1e-3),
            filter.tailCorrectionDerivative(tauMs * 1e-3) * 1e-3
          };
      default -> new double[] {1, 0};
    };
  }

  /**
   * Fits the transient after the command edge at row {@code edge} up to row {@code last}. The
   * on-transient ({@code model == null}) chooses between one and two exponentials; the
   * off-transient follows its choice.
   */
  private String fitSide(
      PulseWindow w,
      int edge,
      int last,
      double refPa,
      double refVar,
      double stepMv,
      BaselineNoise noise,
      double dtMs,
      int window,
      Side model,
      Side s) {
    int start = startRow(w, edge, last);
    if (last - start + 1 < options.minFitSamples()) {
      return "too few samples after the filter settles";
    }
    double inflation = noise.varianceInflation();
    double noisePa = noise.sd();
    TransientFit.Result r =
        TransientFit.fit(w.response, start, last, edge, dtMs, options.maxIterations());
    if (r.failure != null) {
      return r.failure;
    }
    double amp = r.amplitudePa;
    if (!(Math.abs(amp)
        > options.minTransientSigmas() * Math.sqrt(inflation * r.covariance[1][1]))) {
      return "no capacitive transient above the noise";
    }
    BiExponentialFit.Result bi = null;
    if (model == null && monoShowsStructure(w, start, last, edge, dtMs, r, noise, window)) {
      bi = chooseTwoExponentials(w.response, start, last, edge, dtMs, r, inflation);
    } else if (model != null && model.bi) {
      // The off-transient decays with the on-transient's time constants: start from them.
      bi =
          BiExponentialFit.fit(
              w.response,
              start,
              last,
              edge,
              dtMs,
              options.maxIterations(),
              model.fitTaus[0],
              model.fitTaus[1]);
      if (bi.failure != null) {
        return bi.failure;
      }
    }
    s.bi = bi != null;
    if (bi == null) {
      return monoSide(w, edge, last, start, refPa, refVar, stepMv, noise, dtMs, window, r, s);
    }
    double[] p = bi.p;
    double excursion =
        ResidualExcursion.sigmas(
            w.response,
            start,
            last,
            edge,
            dtMs,
            p[BiExponentialFit.ISS],
            new double[] {p[BiExponentialFit.A1], p[BiExponentialFit.A2]},
            new double[] {p[BiExponentialFit.T1], p[BiExponentialFit.T2]},
            noise,
            window,
            CurrentClampEstimator.EXCURSION_FLOOR_FACTOR
                * options.residualFloorFraction()
                * Math.abs(
                    p[BiExponentialFit.A1]
                            * Math.exp(-(start - edge) * dtMs / p[BiExponentialFit.T1])
                        + p[BiExponentialFit.A2]
                            * Math.exp(-(start - edge) * dtMs / p[BiExponentialFit.T2])));
    if (excursion > options.maxExcursionSigmas()) {
      return excursionText(excursion);
    }
    double rms = Math.sqrt(bi.rssPa2 / bi.samples);
    double biAtStart =
        Math.abs(
            p[BiExponentialFit.A1] * Math.exp(-(start - edge) * dtMs / p[BiExponentialFit.T1])
                + p[BiExponentialFit.A2]
                    * Math.exp(-(start - edge) * dtMs / p[BiExponentialFit.T2]));
    if (rms
        > options.maxResidualToNoise() * noisePa + options.residualFloorFraction() * biAtStart) {
      return "residual " + fmt(rms) + " pA far above the baseline noise " + fmt(noisePa) + " pA";
    }
    String unresolved =
        chargeMismatch(
            w.response,
            edge,
            start,
            dtMs,
            refPa,
            new double[] {p[0], p[1], p[2], p[3], p[4]},
            scaled(bi.covariance, BiExponentialFit.P, inflation),
            noise);
    if (unresolved != null) {
      return unresolved;
    }
    // u = (I_ss, A₁, τ₁, A₂, τ₂, I_ref); the fit's part widened by the noise's correlation.
    double[] u = {
      p[0], p[1], p[2], p[3], p[4], refPa,
    };
    double[][] cu = new double[6][6];
    for (int i = 0; i < 5; i++) {
      for (int j = 0; j < 5; j++) {
        cu[i][j] = bi.covariance[i][j] * inflation;
      }
    }
    cu[5][5] = refVar;
    double[] x = biDerived(u, stepMv);
    s.curve =
        new FittedTransient(
            (edge - w.onsetIndex) * dtMs,
            (start - w.onsetIndex) * dtMs,
            (last - w.onsetIndex) * dtMs,
            p[BiExponentialFit.ISS],
            new double[] {p[BiExponentialFit.A1], p[BiExponentialFit.A2]},
            new double[] {p[BiExponentialFit.T1], p[BiExponentialFit.T2]},
            refPa + MOHM_PER_MV_PER_PA * stepMv / x[0]);
    // Delta method with a central-difference Jacobian of the derived values.
    double[][] jac = new double[x.length][6];
    for (int j = 0; j < 6; j++) {
      double h = 1e-6 * Math.max(Math.abs(u[j]), j == 2 || j == 4 ? 1e-3 : 1e-3);
      double[] up = u.clone();
      double[] dn = u.clone();
      up[j] += h;
      dn[j] -= h;
      double[] xp = biDerived(up, stepMv);
      double[] xd = biDerived(dn, stepMv);
      for (int i = 0; i < x.length; i++) {
        jac[i][j] = (xp[i] - xd[i]) / (2 * h);
      }
    }
    s.x = x;
    s.jac = jac;
    s.cu = cu;
    s.cx = OnOffCombination.propagate(jac, cu);
    s.steadyPa = p[0];
    s.steadyVar = bi.covariance[0][0] * inflation;
    s.slowestTauMs = p[BiExponentialFit.T2];
    s.rssPa2 = bi.rssPa2;
    s.samples = bi.samples;
    s.edge = edge;
    s.fitFrom = start;
    s.fitTo = last;
    s.fitOffset = p[BiExponentialFit.ISS];
    s.fitAmps = new double[] {p[BiExponentialFit.A1], p[BiExponentialFit.A2]};
    s.fitTaus = new double[] {p[BiExponentialFit.T1], p[BiExponentialFit.T2]};
    return null;
  }

  /**
   * Whether the one-exponential residual has structure worth a second exponential: its running
   * average strays beyond {@link #PRESCREEN_SIGMAS} standard deviations (past the model-error
   * allowance), or its rms exceeds the baseline noise by a tenth. Only then is the two-exponential
   * model fitted and put to the F-test, which keeps a compact cell's pulse at one fit per side.
   */
  private boolean monoShowsStructure(
      PulseWindow w,
      int start,
      int last,
      int edge,
      double dtMs,
      TransientFit.Result r,
      BaselineNoise noise,
      int window) {
    double ampAtStart = r.amplitudePa * Math.exp(-(start - edge) * dtMs / r.tauMs);
    double floor = options.residualFloorFraction() * Math.abs(ampAtStart);
    if (r.transientRmsPa > 1.1 * noise.sd() + floor) {
      return true;
    }
    double sd =
        ResidualExcursion.sigmas(
            w.response,
            start,
            last,
            edge,
            dtMs,
            r.steadyPa,
            new double[] {r.amplitudePa},
            new double[] {r.tauMs},
            noise,
            window,
            CurrentClampEstimator.EXCURSION_FLOOR_FACTOR * floor);
    return sd > PRESCREEN_SIGMAS;
  }

  /** See {@link #monoShowsStructure}. */
  static final double PRESCREEN_SIGMAS = 3;

  /**
   * The two-exponential fit when it explains the transient significantly better, else null.
   *
   * <p>Criterion: the extra-sum-of-squares F-test, F = ((RSS₁ − RSS₂)/2)/(RSS₂/(n − 5)), compared
   * with the F(2, n − 5) quantile at 1 − {@link EstimatorOptions#modelSelectionAlpha()} (nested
   * least-squares models; e.g. Bates &amp; Watts, Nonlinear Regression Analysis, 1988 — from
   * memory). F is first divided by the noise's variance inflation, since correlated noise puts that
   * much more power into the smooth directions the extra exponential can follow. The two components
   * must also be distinct (τ₂ ≥ 1.5·τ₁) and each amplitude at least 3 standard errors, with the
   * sign of the one-exponential amplitude (soma and dendrite charge the same way).
   */
  private BiExponentialFit.Result chooseTwoExponentials(
      double[] y,
      int start,
      int last,
      int edge,
      double dtMs,
      TransientFit.Result mono,
      double infl) {
    int n = last - start + 1;
    if (n < 4 * options.minFitSamples()) {
      return null;
    }
    BiExponentialFit.Result bi =
        BiExponentialFit.fit(y, start, last, edge, dtMs, options.maxIterations(), mono.tauMs);
    if (bi.failure != null || !(bi.rssPa2 < mono.rssPa2)) {
      return null;
    }
    double f = ((mono.rssPa2 - bi.rssPa2) / 2) / (bi.rssPa2 / (n - BiExponentialFit.P)) / infl;
    double critical =
        new FDistribution(2, n - BiExponentialFit.P)
            .inverseCumulativeProbability(1 - options.modelSelectionAlpha());
    if (!(f > critical)) {
      return null;
    }
    double[] p = bi.p;
    double sign = Math.signum(mono.amplitudePa);
    boolean distinct = p[BiExponentialFit.T2] >= 1.5 * p[BiExponentialFit.T1];
    boolean a1 =
        Math.signum(p[BiExponentialFit.A1]) == sign
            && Math.abs(p[BiExponentialFit.A1])
                > 3 * Math.sqrt(infl * bi.covariance[BiExponentialFit.A1][BiExponentialFit.A1]);
    boolean a2 =
        Math.signum(p[BiExponentialFit.A2]) == sign
            && Math.abs(p[BiExponentialFit.A2])
                > 3 * Math.sqrt(infl * bi.covariance[BiExponentialFit.A2][BiExponentialFit.A2]);
    return distinct && a1 && a2 ? bi : null;
  }

  /**
   * (Ra, Rt, τ, Cm, τ₁, τ₂, A₁, A₂) from u = (I_ss, A₁, τ₁, A₂, τ₂, I_ref) of a two-exponential
   * transient. Onset amplitudes are carried back through the filter; I₀ = ΣA_k·g_k + ΔI_ss gives
   * Ra, ΔI_ss gives Rt, and τ = ΣA_k·g_k·τ_k / ΣA_k·g_k is the transient's area over its initial
   * amplitude.
   *
   * <p>The charged capacitance: the fitted transient is the step response of the cell's admittance
   * Y(s) = 1/Rt + Σ a_k·s/(s + 1/τ_k), a_k = A_k·g_k/ΔV. When the membrane has one time constant
   * τ_m everywhere (uniform specific membrane resistance, as in Rall's model), every membrane
   * admittance is C·(s + 1/τ_m), so the cell's impedance has a pole, and Y a zero, at s = −1/τ_m
   * however the dendrite is wired; Y's zero nearest the origin gives τ_m. At steady state every
   * compartment's leak current is C_k·ΔV_k/τ_m, so the stored charge is I_∞·τ_m and the charged
   * capacitance Σ C_k·ΔV_k / ΔV_soma = τ_m/Rin. For one compartment this reduces to τ·Rt/(Ra·Rin),
   * the one-exponential formula (derived here from the circuit; CHECKS.md's definitions).
   */
  private double[] biDerived(double[] u, double stepMv) {
    double g1 = filterGain(options, filter, u[2])[0];
    double g2 = filterGain(options, filter, u[4])[0];
    double a1 = u[1] * g1;
    double a2 = u[3] * g2;
    double dIss = u[0] - u[5];
    double dI0 = a1 + a2 + dIss;
    double ra = MOHM_PER_MV_PER_PA * stepMv / dI0;
    double rt = MOHM_PER_MV_PER_PA * stepMv / dIss;
    double tau = (a1 * u[2] + a2 * u[4]) / (a1 + a2);
    double rin = rt - ra;
    // Zeros of Y(s)(s + λ₁)(s + λ₂) = G(s + λ₁)(s + λ₂) + a₁s(s + λ₂) + a₂s(s + λ₁), per mV.
    double gInf = dIss / stepMv;
    double c1 = a1 / stepMv;
    double c2 = a2 / stepMv;
    double l1 = 1 / u[2];
    double l2 = 1 / u[4];
    double qa = gInf + c1 + c2;
    double qb = gInf * (l1 + l2) + c1 * l2 + c2 * l1;
    double qc = gInf * l1 * l2;
    double disc = Math.sqrt(Math.max(0, qb * qb - 4 * qa * qc));
    // The root nearest zero, written to avoid cancellation: 2c/(−b − √Δ).
    double zero = 2 * qc / (-qb - disc);
    double tauM = -1 / zero;
    double cm = 1000 * tauM / rin; // ms/MΩ = nF
    // Amplitudes signed by the step, so the on- and off-transients agree.
    double sign = Math.signum(stepMv);
    return new double[] {ra, rt, tau, cm, u[2], u[4], sign * a1, sign * a2};
  }

  private static String excursionText(double sd) {
    return "residual excursion of "
        + fmt(sd)
        + " sd (an event, a spike or an artefact rides on the transient)";
  }

  /** The one-exponential side: residual tests, then (Ra, Rt, τ) with analytic gradients. */
  private String monoSide(
      PulseWindow w,
      int edge,
      int last,
      int start,
      double refPa,
      double refVar,
      double stepMv,
      BaselineNoise noise,
      double dtMs,
      int window,
      TransientFit.Result r,
      Side s) {
    double tauMs = r.tauMs;
    double amp = r.amplitudePa;
    double noisePa = noise.sd();
    double inflation = noise.varianceInflation();
    double ampAtStart = amp * Math.exp(-(start - edge) * dtMs / tauMs);
    double limit =
        options.maxResidualToNoise() * noisePa
            + options.residualFloorFraction() * Math.abs(ampAtStart);
    if (r.transientRmsPa > limit) {
      return "residual "
          + fmt(r.transientRmsPa)
          + " pA far above the baseline noise "
          + fmt(noisePa)
          + " pA";
    }
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
            CurrentClampEstimator.EXCURSION_FLOOR_FACTOR
                * options.residualFloorFraction()
                * Math.abs(ampAtStart));
    if (excursion > options.maxExcursionSigmas()) {
      return excursionText(excursion);
    }
    String unresolved =
        chargeMismatch(
            w.response,
            edge,
            start,
            dtMs,
            refPa,
            new double[] {r.steadyPa, amp, tauMs},
            scaled(r.covariance, 3, inflation),
            noise);
    if (unresolved != null) {
      return unresolved;
    }

    // Back through the filter: the true amplitude is the tail's amplitude times g(τ).
    double[] gain = filterGain(options, filter, tauMs);
    double g = gain[0];
    double dg = gain[1];
    double delayMs = filter.groupDelayS() * 1e3;
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
    s.steadyVar = r.covariance[0][0] * inflation;
    s.slowestTauMs = tauMs;
    s.x = new double[] {ra, rt, tauMs};
    // Gradients over u = (I_ss, A, τ, I_ref); I_ref is independent of the fit, and the fit's
    // covariance is widened by the noise's correlation (BaselineNoise).
    double[][] grad = {
      {-ra / dI0, -ra / dI0 * g, -ra / dI0 * amp * dg, ra / dI0},
      {-rt / dIss, 0, 0, rt / dIss},
      {0, 0, 1, 0}
    };
    double[][] cu = new double[4][4];
    for (int i = 0; i < 3; i++) {
      for (int j = 0; j < 3; j++) {
        cu[i][j] = r.covariance[i][j] * inflation;
      }
    }
    cu[3][3] = refVar;
    s.jac = grad;
    s.cu = cu;
    s.cx = OnOffCombination.propagate(grad, cu);
    s.chargePaMs = charge(w.response, edge, last, r, dtMs, delayMs, dIss);
    s.rssPa2 = r.rssPa2;
    s.samples = r.samples;
    s.edge = edge;
    s.fitFrom = start;
    s.fitTo = last;
    s.fitOffset = r.steadyPa;
    s.fitAmps = new double[] {amp};
    s.fitTaus = new double[] {tauMs};
    return null;
  }

  /**
   * Why the fitted exponentials do not carry the charge the raw trace shows before the fit starts,
   * or null when they do.
   *
   * <p>A causal low-pass filter with unit DC gain preserves a transient's area and delays a step by
   * its group delay d (Bessel filter theory), so over the rows between the edge and the fit's first
   * row t_s the raw trace carries Q_raw = ∫(y − I_ss)dt, while the model predicts Q_model = Σ
   * a_k·τ_k − ΔI_ss·d − Σ A_k·τ_k·e^(−t_s/τ_k), with a_k = A_k/H(−1/τ_k) the component's amplitude
   * before the filter (its whole area) less the fitted tail past t_s. A component faster than the
   * filter resolves has settled before t_s: the fit cannot see it and extrapolates the slower one
   * back, so its charge is missing from Q_model (on a 5 MΩ, 5 pF soma with a dendrite behind 10
   * kHz, about half the transient's). The pulse is rejected when |Q_raw − Q_model| exceeds {@link
   * #CHARGE_MISMATCH_SIGMAS} standard deviations — Q_raw's noise (the baseline's
   * sd·dt·√(n·inflation) over its n rows) and Q_model's from the fit's covariance (delta method),
   * independent as they come from different rows — plus {@link #CHARGE_MISMATCH_FRACTION} of the
   * model's whole transient charge Σ a_k·τ_k (the filter's own modes not quite settled at t_s,
   * model error).
   *
   * @param u (I_ss, A₁, τ₁[, A₂, τ₂]) of the fit, amplitudes of the filtered tail at the edge
   * @param cu u's covariance, already widened by the noise's variance inflation
   */
  private String chargeMismatch(
      double[] y,
      int edge,
      int start,
      double dtMs,
      double refPa,
      double[] u,
      double[][] cu,
      BaselineNoise noise) {
    double delayMs = filter.groupDelayS() * 1e3;
    // Without a filter the jump falls between the edge row and the next: start the sum there.
    int first = delayMs > 0 ? edge : edge + 1;
    if (start - first < 1) {
      return null;
    }
    double[] q = chargeBeforeFit(y, edge, first, start, dtMs, delayMs, refPa, u);
    double diff = q[0] - q[1];
    double[] grad = new double[u.length];
    for (int j = 0; j < u.length; j++) {
      double h = 1e-6 * Math.max(Math.abs(u[j]), 1e-3);
      double[] up = u.clone();
      double[] dn = u.clone();
      up[j] += h;
      dn[j] -= h;
      double[] qp = chargeBeforeFit(y, edge, first, start, dtMs, delayMs, refPa, up);
      double[] qd = chargeBeforeFit(y, edge, first, start, dtMs, delayMs, refPa, dn);
      grad[j] = ((qp[0] - qp[1]) - (qd[0] - qd[1])) / (2 * h);
    }
    int n = start - first + 1;
    double rawSd = noise.sd() * dtMs * Math.sqrt(n * noise.varianceInflation());
    double sd = Math.sqrt(rawSd * rawSd + OnOffCombination.quad(grad, cu));
    double allowed = CHARGE_MISMATCH_SIGMAS * sd + CHARGE_MISMATCH_FRACTION * Math.abs(q[2]);
    if (!(Math.abs(diff) <= allowed)) {
      return "transient faster than the filter resolves (charge before the fit "
          + fmt(q[0])
          + " pA·ms, the fitted model's "
          + fmt(q[1])
          + " ± "
          + fmt(sd)
          + ")";
    }
    return null;
  }

  /** {Q_raw, Q_model, Σ a_k·τ_k} of {@link #chargeMismatch}, in pA·ms. */
  private double[] chargeBeforeFit(
      double[] y,
      int edge,
      int first,
      int start,
      double dtMs,
      double delayMs,
      double refPa,
      double[] u) {
    double iss = u[0];
    double qRaw = 0;
    for (int i = first + 1; i <= start; i++) {
      qRaw += 0.5 * ((y[i - 1] - iss) + (y[i] - iss)) * dtMs;
    }
    double t1 = (first - edge) * dtMs;
    double ts = (start - edge) * dtMs;
    double qWhole = 0;
    double qModel = -(iss - refPa) * delayMs;
    for (int k = 1; k + 1 < u.length; k += 2) {
      double amp = u[k];
      double tau = u[k + 1];
      double a = amp * filter.tailCorrection(tau * 1e-3);
      qWhole += a * tau;
      // Filtered: the whole area from the edge; unfiltered: from the first interval's end.
      qModel += (delayMs > 0 ? a * tau : amp * tau * Math.exp(-t1 / tau));
      qModel -= amp * tau * Math.exp(-ts / tau);
    }
    return new double[] {qRaw, qModel, qWhole};
  }

  /** See {@link #chargeMismatch}. */
  static final double CHARGE_MISMATCH_SIGMAS = 6;

  /** See {@link #chargeMismatch}. */
  static final double CHARGE_MISMATCH_FRACTION = 0.08;

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

  /** The leading {@code k}×{@code k} block of {@code c} times {@code factor}. */
  private static double[][] scaled(double[][] c, int k, double factor) {
    double[][] out = new double[k][k];
    for (int i = 0; i < k; i++) {
      for (int j = 0; j < k; j++) {
        out[i][j] = c[i][j] * factor;
      }
    }
    return out;
  }

  private static String fmt(double v) {
    return PulsePreamble.fmt(v);
  }
}
