package tauwatch.sim;

/**
 * A stereotyped action potential added to the recorded voltage in current clamp whenever the soma
 * potential crosses a threshold upward.
 *
 * <p>Immutable and validated on construction. Deliberately simple: the cell stays passive (the
 * spike is added to the amplifier's input, it does not act on the membrane), and its shape is the
 * difference of exponentials with a 0.1·width rise and a 0.3·width decay, scaled to its peak. After
 * a spike the threshold must be crossed downward, and the refractory time must pass, before the
 * next one.
 *
 * @param thresholdMv soma potential that fires a spike, mV (NaN = never)
 * @param amplitudeMv peak of the spike above the potential at threshold, mV
 * @param widthMs the waveform's characteristic width, ms
 * @param refractoryMs shortest interval between spikes, ms
 */
public record SpikeWaveform(
    double thresholdMv, double amplitudeMv, double widthMs, double refractoryMs) {

  /** No spikes. */
  public static final SpikeWaveform NONE = new SpikeWaveform(Double.NaN, 0, 1, 5);

  public SpikeWaveform {
    if (!(amplitudeMv >= 0) || Double.isInfinite(amplitudeMv)) {
      throw new IllegalArgumentException("spike amplitude (mV) must be >= 0, got " + amplitudeMv);
    }
    if (!(widthMs > 0) || Double.isInfinite(widthMs)) {
      throw new IllegalArgumentException("spike width (ms) must be > 0, got " + widthMs);
    }
    if (!(refractoryMs >= 0) || Double.isInfinite(refractoryMs)) {
      throw new IllegalArgumentException("refractory time (ms) must be >= 0, got " + refractoryMs);
    }
  }

  public boolean active() {
    return !Double.isNaN(thresholdMv) && amplitudeMv > 0;
  }

  double riseMs() {
    return 0.1 * widthMs;
  }

  double decayMs() {
    return 0.3 * widthMs;
  }

  /** 1 / the peak of the unit difference of exponentials (see {@link SynapticActivity}). */
  double peakNormalisation() {
    return new SynapticActivity(1, 1, 0, riseMs(), decayMs()).peakNormalisation();
  }
}
