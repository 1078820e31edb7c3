package tauwatch.sim;

/**
 * The recording side of the simulated rig: sampling, the amplifier's output filter, noise, mains
 * hum and the digitiser.
 *
 * <p>Immutable and validated on construction. Noise, hum and the digitiser's range are in the
 * response's unit: pA in voltage clamp, mV in current clamp (the names keep the voltage-clamp
 * unit).
 *
 * @param sampleRateHz samples per second
 * @param filterCutoffHz −3 dB cutoff of the 4-pole low-pass Bessel output filter; 0 for no filter
 * @param noiseRmsPa rms of the Gaussian current noise at the output (after the filter), pA
 * @param humAmplitudePa peak amplitude of the mains hum added at the output, pA (0 for none)
 * @param humFrequencyHz frequency of the mains hum
 * @param adcBits digitiser resolution; 0 for no quantisation
 * @param adcRangePa digitiser full scale, ± pA
 * @param bridgeBalanceMOhm current clamp only: the bridge balance the amplifier subtracts (I·R from
 *     the recorded voltage), MΩ; 0 = not balanced
 */
public record AmplifierSettings(
    double sampleRateHz,
    double filterCutoffHz,
    double noiseRmsPa,
    double humAmplitudePa,
    double humFrequencyHz,
    int adcBits,
    double adcRangePa,
    double bridgeBalanceMOhm) {

  /** Settings without a bridge balance. */
  public AmplifierSettings(
      double sampleRateHz,
      double filterCutoffHz,
      double noiseRmsPa,
      double humAmplitudePa,
      double humFrequencyHz,
      int adcBits,
      double adcRangePa) {
    this(
        sampleRateHz,
        filterCutoffHz,
        noiseRmsPa,
        humAmplitudePa,
        humFrequencyHz,
        adcBits,
        adcRangePa,
        0);
  }

  public AmplifierSettings {
    if (!(sampleRateHz > 0) || Double.isInfinite(sampleRateHz)) {
      throw new IllegalArgumentException("sample rate (Hz) must be > 0, got " + sampleRateHz);
    }
    if (!(filterCutoffHz >= 0) || Double.isInfinite(filterCutoffHz)) {
      throw new IllegalArgumentException(
          "filter cutoff (Hz) must be >= 0 (0 = no filter), got " + filterCutoffHz);
    }
    if (!(noiseRmsPa >= 0) || Double.isInfinite(noiseRmsPa)) {
      throw new IllegalArgumentException("noise rms (pA) must be >= 0, got " + noiseRmsPa);
    }
    if (!(humAmplitudePa >= 0) || Double.isInfinite(humAmplitudePa)) {
      throw new IllegalArgumentException("hum amplitude (pA) must be >= 0, got " + humAmplitudePa);
    }
    if (!(humFrequencyHz >= 0) || !(humFrequencyHz < sampleRateHz / 2)) {
      throw new IllegalArgumentException(
          "hum frequency (Hz) must be >= 0 and below half the sample rate, got " + humFrequencyHz);
    }
    if (adcBits != 0 && (adcBits < 2 || adcBits > 32)) {
      throw new IllegalArgumentException(
          "ADC bits must be 0 (no quantisation) or 2..32, got " + adcBits);
    }
    if (!(bridgeBalanceMOhm >= 0) || Double.isInfinite(bridgeBalanceMOhm)) {
      throw new IllegalArgumentException(
          "bridge balance (MΩ) must be >= 0, got " + bridgeBalanceMOhm);
    }
    if (adcBits != 0 && (!(adcRangePa > 0) || Double.isInfinite(adcRangePa))) {
      throw new IllegalArgumentException("ADC range (pA) must be > 0, got " + adcRangePa);
    }
  }

  /** An ideal recording: no filter, no noise, no hum, no quantisation. */
  public static AmplifierSettings ideal(double sampleRateHz) {
    return new AmplifierSettings(sampleRateHz, 0, 0, 0, 0, 0, 0);
  }

  public boolean hasFilter() {
    return filterCutoffHz > 0;
  }

  /** The least significant bit of the digitiser in pA, or 0 without quantisation. */
  public double adcLsbPa() {
    return adcBits == 0 ? 0 : 2 * adcRangePa / Math.pow(2, adcBits);
  }
}
