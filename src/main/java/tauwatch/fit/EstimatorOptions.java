package tauwatch.fit;

/**
 * The voltage-clamp estimator's settings, with their defaults and validation in one place.
 *
 * <p>Immutable and thread-safe. Invalid values are refused at construction with an {@link
 * IllegalArgumentException} naming the option, so a bad configuration fails at start-up rather than
 * per pulse.
 *
 * @param filterCutoffHz the amplifier filter's −3 dB cutoff; 0 takes the window's {@code
 *     filterCutoffHz}, a negative value means "no filter" whatever the window says
 * @param filterCompensation how the filter delay is undone when extrapolating to the onset
 * @param baselineFraction fraction of the samples before the onset used for the holding current and
 *     the baseline noise (the latest ones, away from a previous pulse's tail)
 * @param minBaselineSamples fewest baseline samples accepted
 * @param filterSettleModes the fit starts this many slowest-filter-mode time constants after the
 *     onset plus the group delay (e^−6 ≈ 0.25 % of the filter's own ringing is left)
 * @param skipAfterPeakSamples samples skipped after the raw peak (never fewer than the filter rule)
 * @param minFitSamples fewest samples in a transient fit
 * @param minStepMv smallest |step| accepted, mV
 * @param minRaMOhm lower plausibility limit of Ra
 * @param maxRaMOhm upper plausibility limit of Ra
 * @param minRinMOhm lower plausibility limit of Rin
 * @param maxRinMOhm upper plausibility limit of Rin
 * @param minCmPf lower plausibility limit of Cm
 * @param maxCmPf upper plausibility limit of Cm
 * @param minDecayTaus the step must last at least this many τ (the transient decayed within it)
 * @param maxResidualToNoise reject when the fit's rms residual exceeds this multiple of the
 *     baseline rms noise (plus {@code residualFloorFraction} of the transient amplitude)
 * @param residualFloorFraction residual allowance as a fraction of the transient's amplitude, so a
 *     noise-free trace is not judged against zero noise
 * @param onOffTolerance largest relative on/off disagreement of Ra, Rt or τ accepted ...
 * @param onOffSigmas ... when it is also more than this many combined standard errors
 * @param minTransientSigmas the fitted transient amplitude must exceed this many of its standard
 *     errors (otherwise there is no capacitive transient to read)
 * @param maxIterations iteration limit of the Levenberg–Marquardt fit
 * @param minStepPa current clamp: smallest |step| accepted, pA
 * @param bridgeBalancedMOhm current clamp: an I·Ra jump worth less than this (and within 3 standard
 *     errors of zero) means the bridge is balanced, and Ra is not reported
 * @param modelSelectionAlpha the two-exponential model replaces the one-exponential model when the
 *     F-test of their residuals rejects the simpler one at this significance level
 * @param maxExcursionSigmas a pulse whose residual, averaged over {@code excursionWindowMs}, strays
 *     further than this many standard deviations of that average (from the baseline noise) carries
 *     something else (a synaptic event, a spike, hum, an artefact) and is rejected
 * @param excursionWindowMs the running-average width of the residual-excursion test, ms
 */
public record EstimatorOptions(
    double filterCutoffHz,
    FilterCompensation filterCompensation,
    double baselineFraction,
    int minBaselineSamples,
    double filterSettleModes,
    int skipAfterPeakSamples,
    int minFitSamples,
    double minStepMv,
    double minRaMOhm,
    double maxRaMOhm,
    double minRinMOhm,
    double maxRinMOhm,
    double minCmPf,
    double maxCmPf,
    double minDecayTaus,
    double maxResidualToNoise,
    double residualFloorFraction,
    double onOffTolerance,
    double onOffSigmas,
    double minTransientSigmas,
    int maxIterations,
    double minStepPa,
    double bridgeBalancedMOhm,
    double modelSelectionAlpha,
    double maxExcursionSigmas,
    double excursionWindowMs) {

  public EstimatorOptions {
    require(Double.isFinite(filterCutoffHz), "filterCutoffHz", "must be a number");
    require(filterCompensation != null, "filterCompensation", "must be set");
    require(baselineFraction > 0 && baselineFraction <= 1, "baselineFraction", "must be in (0, 1]");
    require(minBaselineSamples >= 2, "minBaselineSamples", "must be at least 2");
    require(filterSettleModes >= 0, "filterSettleModes", "must not be negative");
    require(skipAfterPeakSamples >= 0, "skipAfterPeakSamples", "must not be negative");
    require(minFitSamples >= 5, "minFitSamples", "must be at least 5");
    require(minStepMv > 0, "minStepMv", "must be positive");
    require(minRaMOhm > 0 && maxRaMOhm > minRaMOhm, "minRaMOhm/maxRaMOhm", "need 0 < min < max");
    require(
        minRinMOhm > 0 && maxRinMOhm > minRinMOhm, "minRinMOhm/maxRinMOhm", "need 0 < min < max");
    require(minCmPf > 0 && maxCmPf > minCmPf, "minCmPf/maxCmPf", "need 0 < min < max");
    require(minDecayTaus >= 1, "minDecayTaus", "must be at least 1");
    require(maxResidualToNoise >= 1, "maxResidualToNoise", "must be at least 1");
    require(residualFloorFraction >= 0, "residualFloorFraction", "must not be negative");
    require(onOffTolerance > 0, "onOffTolerance", "must be positive");
    require(onOffSigmas > 0, "onOffSigmas", "must be positive");
    require(minTransientSigmas >= 0, "minTransientSigmas", "must not be negative");
    require(maxIterations >= 5, "maxIterations", "must be at least 5");
    require(minStepPa > 0, "minStepPa", "must be positive");
    require(bridgeBalancedMOhm >= 0, "bridgeBalancedMOhm", "must not be negative");
    require(
        modelSelectionAlpha > 0 && modelSelectionAlpha < 0.5,
        "modelSelectionAlpha",
        "must be in (0, 0.5)");
    require(maxExcursionSigmas > 1, "maxExcursionSigmas", "must be above 1");
    require(excursionWindowMs > 0, "excursionWindowMs", "must be positive");
  }

  /**
   * Defaults: plausibility limits span the cells of common practice (Ra 5–25 MΩ usable, Rin 50 MΩ–2
   * GΩ, Cm 5–200 pF; CHECKS.md) with a wide margin, so that only nonsense is refused here and the
   * health rules judge the rest.
   */
  public static EstimatorOptions defaults() {
    return new EstimatorOptions(
        0,
        FilterCompensation.BESSEL_GAIN,
        0.8,
        5,
        6,
        0,
        8,
        0.5,
        0.5,
        200,
        5,
        100_000,
        0.5,
        1000,
        5,
        3,
        0.003,
        0.10,
        4,
        5,
        50,
        5.0,
        1.0,
        1e-3,
        6.0,
        0.5);
  }

  /** A copy with another filter cutoff (0 = the window's). */
  public EstimatorOptions withFilterCutoffHz(double hz) {
    return toBuilder().filterCutoffHz(hz).build();
  }

  /** A copy with another filter compensation. */
  public EstimatorOptions withFilterCompensation(FilterCompensation c) {
    return toBuilder().filterCompensation(c).build();
  }

  /** A builder starting from these options, for changing a few of them. */
  public Builder toBuilder() {
    return new Builder(this);
  }

  /** Changes some options of a copy; validation happens in {@link #build()}. Not thread-safe. */
  public static final class Builder {
    private double filterCutoffHz;
    private FilterCompensation filterCompensation;
    private double baselineFraction;
    private int minBaselineSamples;
    private double filterSettleModes;
    private int skipAfterPeakSamples;
    private int minFitSamples;
    private double minStepMv;
    private double minRaMOhm;
    private double maxRaMOhm;
    private double minRinMOhm;
    private double maxRinMOhm;
    private double minCmPf;
    private double maxCmPf;
    private double minDecayTaus;
    private double maxResidualToNoise;
    private double residualFloorFraction;
    private double onOffTolerance;
    private double onOffSigmas;
    private double minTransientSigmas;
    private int maxIterations;
    private double minStepPa;
    private double bridgeBalancedMOhm;
    private double modelSelectionAlpha;
    private double maxExcursionSigmas;
    private double excursionWindowMs;

    private Builder(EstimatorOptions o) {
      filterCutoffHz = o.filterCutoffHz;
      filterCompensation = o.filterCompensation;
      baselineFraction = o.baselineFraction;
      minBaselineSamples = o.minBaselineSamples;
      filterSettleModes = o.filterSettleModes;
      skipAfterPeakSamples = o.skipAfterPeakSamples;
      minFitSamples = o.minFitSamples;
      minStepMv = o.minStepMv;
      minRaMOhm = o.minRaMOhm;
      maxRaMOhm = o.maxRaMOhm;
      minRinMOhm = o.minRinMOhm;
      maxRinMOhm = o.maxRinMOhm;
      minCmPf = o.minCmPf;
      maxCmPf = o.maxCmPf;
      minDecayTaus = o.minDecayTaus;
      maxResidualToNoise = o.maxResidualToNoise;
      residualFloorFraction = o.residualFloorFraction;
      onOffTolerance = o.onOffTolerance;
      onOffSigmas = o.onOffSigmas;
      minTransientSigmas = o.minTransientSigmas;
      maxIterations = o.maxIterations;
      minStepPa = o.minStepPa;
      bridgeBalancedMOhm = o.bridgeBalancedMOhm;
      modelSelectionAlpha = o.modelSelectionAlpha;
      maxExcursionSigmas = o.maxExcursionSigmas;
      excursionWindowMs = o.excursionWindowMs;
    }

    public Builder filterCutoffHz(double v) {
      filterCutoffHz = v;
      return this;
    }

    public Builder filterCompensation(FilterCompensation v) {
      filterCompensation = v;
      return this;
    }

    public Builder baselineFraction(double v) {
      baselineFraction = v;
      return this;
    }

    public Builder minBaselineSamples(int v) {
      minBaselineSamples = v;
      return this;
    }

    public Builder filterSettleModes(double v) {
      filterSettleModes = v;
      return this;
    }

    public Builder skipAfterPeakSamples(int v) {
      skipAfterPeakSamples = v;
      return this;
    }

    public Builder minFitSamples(int v) {
      minFitSamples = v;
      return this;
    }

    public Builder minStepMv(double v) {
      minStepMv = v;
      return this;
    }

    public Builder minRaMOhm(double v) {
      minRaMOhm = v;
      return this;
    }

    public Builder maxRaMOhm(double v) {
      maxRaMOhm = v;
      return this;
    }

    public Builder minRinMOhm(double v) {
      minRinMOhm = v;
      return this;
    }

    public Builder maxRinMOhm(double v) {
      maxRinMOhm = v;
      return this;
    }

    public Builder minCmPf(double v) {
      minCmPf = v;
      return this;
    }

    public Builder maxCmPf(double v) {
      maxCmPf = v;
      return this;
    }

    public Builder minDecayTaus(double v) {
      minDecayTaus = v;
      return this;
    }

    public Builder maxResidualToNoise(double v) {
      maxResidualToNoise = v;
      return this;
    }

    public Builder residualFloorFraction(double v) {
      residualFloorFraction = v;
      return this;
    }

    public Builder onOffTolerance(double v) {
      onOffTolerance = v;
      return this;
    }

    public Builder onOffSigmas(double v) {
      onOffSigmas = v;
      return this;
    }

    public Builder minTransientSigmas(double v) {
      minTransientSigmas = v;
      return this;
    }

    public Builder maxIterations(int v) {
      maxIterations = v;
      return this;
    }

    public Builder minStepPa(double v) {
      minStepPa = v;
      return this;
    }

    public Builder bridgeBalancedMOhm(double v) {
      bridgeBalancedMOhm = v;
      return this;
    }

    public Builder modelSelectionAlpha(double v) {
      modelSelectionAlpha = v;
      return this;
    }

    public Builder maxExcursionSigmas(double v) {
      maxExcursionSigmas = v;
      return this;
    }

    public Builder excursionWindowMs(double v) {
      excursionWindowMs = v;
      return this;
    }

    public EstimatorOptions build() {
      return new EstimatorOptions(
          filterCutoffHz,
          filterCompensation,
          baselineFraction,
          minBaselineSamples,
          filterSettleModes,
          skipAfterPeakSamples,
          minFitSamples,
          minStepMv,
          minRaMOhm,
          maxRaMOhm,
          minRinMOhm,
          maxRinMOhm,
          minCmPf,
          maxCmPf,
          minDecayTaus,
          maxResidualToNoise,
          residualFloorFraction,
          onOffTolerance,
          onOffSigmas,
          minTransientSigmas,
          maxIterations,
          minStepPa,
          bridgeBalancedMOhm,
          modelSelectionAlpha,
          maxExcursionSigmas,
          excursionWindowMs);
    }
  }

  private static void require(boolean ok, String key, String what) {
    if (!ok) {
      throw new IllegalArgumentException("estimator option " + key + " " + what);
    }
  }
}
