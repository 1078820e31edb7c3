package tauwatch.health;

/**
 * Detects a sustained shift of one parameter away from its baseline — a step or a trend — with a
 * two-sided CUSUM (E. S. Page, "Continuous inspection schemes", Biometrika 41:100–115, 1954, from
 * memory) and names the pulse where the change began.
 *
 * <p>Single-threaded (the analysis thread). All buffers are allocated at construction; {@link
 * #update} allocates nothing (per pulse it may take medians of small preallocated arrays).
 *
 * <p>The reference level is the median of the first {@code noiseMinPulses} accepted values (of the
 * session, or after the user sets a new baseline): longer than the baseline's few pulses, so that
 * the reference's own error (≈ 1.25σ/√n) stays well inside the allowance k. Each later accepted
 * value x gives an innovation z = (x − reference)/σ, clipped to ±{@code winsorSigma} so a single
 * outlier cannot carry the statistic far. The upper statistic is S⁺ = max(0, S⁺ + z − k) and the
 * lower S⁻ = max(0, S⁻ − z − k); a change is declared when either reaches h. The estimated change
 * point is the first pulse after the statistic's last zero (the maximum-likelihood change point of
 * a step of size 2k, Page's rule; for a ramp it lags the true start by about k/slope pulses). After
 * the alarm the statistic is capped at h, so the flag clears within about h/k pulses once the value
 * is back near the baseline.
 *
 * <p>σ is measured robustly from successive differences of the accepted values while the detector
 * is not flagged (1.4826 · MAD / √2, insensitive to slow trends and to isolated steps), over the
 * last {@code noiseWindowPulses}, and floored by the median of the estimates' own standard errors
 * (when known) and by {@code minNoisePercent} of the baseline.
 */
public final class ChangeDetector {
  /** No change flagged. */
  public static final int NONE = 0;

  /** A rise above the baseline. */
  public static final int UP = 1;

  /** A fall below the baseline. */
  public static final int DOWN = -1;

  private static final double MAD_TO_SIGMA = 1.482602218505602; // 1/Φ⁻¹(3/4), Gaussian
  private static final double SQRT2 = Math.sqrt(2);
  private static final int NOISE_REFRESH_PULSES = 16;

  private final DriftDetection settings;
  private final boolean watchUp;
  private final boolean watchDown;
  private final double[] diffs;
  private final double[] errors;
  private final double[] scratch;
  private int diffCount;
  private int diffNext;
  private int errorCount;
  private int errorNext;
  private double previous = Double.NaN;
  private double noiseSigma = Double.NaN;
  private int sinceNoise;
  private final double[] referenceValues;
  private int referenceCount;
  private double reference = Double.NaN;

  private double upper;
  private double lower;
  private long upperStartPulse;
  private double upperStartS = Double.NaN;
  private long lowerStartPulse;
  private double lowerStartS = Double.NaN;
  private int flagged = NONE;
  private long changePulse;
  private double changeS = Double.NaN;
  private long noticedPulse;

  /**
   * @param watchUp whether a rise counts as drift (some rule limits the parameter from above)
   * @param watchDown whether a fall counts as drift
   */
  public ChangeDetector(DriftDetection settings, boolean watchUp, boolean watchDown) {
    this.settings = settings;
    this.watchUp = watchUp;
    this.watchDown = watchDown;
    int w = settings.noiseWindowPulses();
    this.diffs = new double[w];
    this.errors = new double[w];
    this.scratch = new double[w];
    this.referenceValues = new double[settings.noiseMinPulses()];
  }

  /**
   * Forgets the reference, the statistic and the flag (the user set a new baseline): the reference
   * is measured again over the next {@code noiseMinPulses}; the noise measured so far is kept.
   */
  public void restart() {
    referenceCount = 0;
    reference = Double.NaN;
    upper = 0;
    lower = 0;
    flagged = NONE;
    upperStartS = Double.NaN;
    lowerStartS = Double.NaN;
    changeS = Double.NaN;
  }

  /**
   * Takes one accepted value.
   *
   * @param pulse the pulse number
   * @param timeS the pulse's stream time
   * @param x the value
   * @param standardError its standard error, or NaN
   * @param baseline the baseline, or NaN while it is being learnt
   * @return true if the flag changed (raised, cleared or turned)
   */
  public boolean update(long pulse, double timeS, double x, double standardError, double baseline) {
    if (flagged == NONE) {
      learnNoise(x, standardError);
    }
    previous = x;
    if (!settings.enabled()) {
      return false;
    }
    if (Double.isNaN(reference)) {
      referenceValues[referenceCount++] = x;
      if (referenceCount == referenceValues.length) {
        reference = median(referenceValues, referenceCount);
      }
      return false;
    }
    if (Double.isNaN(baseline) || diffCount < settings.noiseMinPulses()) {
      return false;
    }
    double sigma = scaleFor(baseline);
    double z = (x - reference) / sigma;
    double c = settings.winsorSigma();
    z = z > c ? c : (z < -c ? -c : z);
    double k = settings.allowanceSigma();
    double h = settings.thresholdSigma();
    if (upper == 0) {
      upperStartPulse = pulse;
      upperStartS = timeS;
    }
    if (lower == 0) {
      lowerStartPulse = pulse;
      lowerStartS = timeS;
    }
    upper = Math.min(h, Math.max(0, upper + z - k));
    lower = Math.min(h, Math.max(0, lower - z - k));
    int before = flagged;
    if (flagged == UP && upper == 0 || flagged == DOWN && lower == 0) {
      flagged = NONE;
    }
    if (flagged != UP && watchUp && upper >= h) {
      raise(UP, upperStartPulse, upperStartS, pulse);
    } else if (flagged != DOWN && watchDown && lower >= h) {
      raise(DOWN, lowerStartPulse, lowerStartS, pulse);
    }
    return flagged != before;
  }

  private void raise(int direction, long startPulse, double startS, long pulse) {
    flagged = direction;
    changePulse = startPulse;
    changeS = startS;
    noticedPulse = pulse;
  }

  private void learnNoise(double x, double se) {
    if (!Double.isNaN(previous) && !Double.isNaN(x)) {
      diffs[diffNext] = x - previous;
      diffNext = (diffNext + 1) % diffs.length;
      if (diffCount < diffs.length) {
        diffCount++;
      }
      // Recomputed lazily: every pulse while the window fills, then every 16th (two sorts of the
      // window per pulse would cost more than the rest of the health rules together).
      if (diffCount < diffs.length || ++sinceNoise >= NOISE_REFRESH_PULSES) {
        sinceNoise = 0;
        noiseSigma = Double.NaN;
      }
    }
    if (!Double.isNaN(se) && se > 0) {
      errors[errorNext] = se;
      errorNext = (errorNext + 1) % errors.length;
      if (errorCount < errors.length) {
        errorCount++;
      }
    }
  }

  /** The σ the innovations are divided by, for a baseline b. */
  public double scaleFor(double baseline) {
    if (Double.isNaN(noiseSigma) && diffCount > 0) {
      noiseSigma =
          Math.max(MAD_TO_SIGMA * mad(diffs, diffCount) / SQRT2, median(errors, errorCount));
    }
    double floor = settings.minNoisePercent() / 100.0 * Math.abs(baseline);
    double s = Double.isNaN(noiseSigma) ? floor : Math.max(noiseSigma, floor);
    // A baseline of exactly zero with no noise: any unit-sized floor keeps z finite.
    return s > 0 ? s : Double.MIN_NORMAL;
  }

  private double median(double[] ring, int n) {
    if (n == 0) {
      return 0;
    }
    System.arraycopy(ring, 0, scratch, 0, n);
    return Medians.inPlace(scratch, n);
  }

  private double mad(double[] ring, int n) {
    double m = median(ring, n);
    for (int i = 0; i < n; i++) {
      scratch[i] = Math.abs(ring[i] - m);
    }
    return Medians.inPlace(scratch, n);
  }

  /** {@link #UP}, {@link #DOWN} or {@link #NONE}. */
  public int flagged() {
    return flagged;
  }

  public boolean armed() {
    return settings.enabled() && !Double.isNaN(reference) && diffCount >= settings.noiseMinPulses();
  }

  /** The steady level the innovations are measured from, NaN until armed. */
  public double reference() {
    return reference;
  }

  /** The first pulse of the flagged change (after the statistic's last zero). */
  public long changePulse() {
    return changePulse;
  }

  /** Stream time of {@link #changePulse()}, NaN when nothing is flagged. */
  public double changeTimeS() {
    return flagged == NONE ? Double.NaN : changeS;
  }

  /** The pulse at which the change was declared. */
  public long noticedPulse() {
    return noticedPulse;
  }

  /** The upper statistic S⁺ in sigmas. */
  public double upper() {
    return upper;
  }

  /** The lower statistic S⁻ in sigmas. */
  public double lower() {
    return lower;
  }
}
