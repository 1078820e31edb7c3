package tauwatch.sim;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;
import tauwatch.stream.ClampMode;

/**
 * Scenario files in current clamp and with synaptic currents or spikes: the keys read into the
 * scenario, and one-line errors that name the file and the key.
 */
class ScenarioLoaderModesTest {
  private static final String CC =
      """
      name = "cc"
      [protocol]
      mode = "current-clamp"
      holding_pa = 10.0
      step_pa = -50.0
      step_width_ms = 100.0
      period_ms = 1000.0
      [amplifier]
      noise_rms_mv = 0.2
      adc_range_mv = 400.0
      bridge_balance_mohm = 12.0
      [cell]
      access_mohm = 15.0
      membrane_mohm = 300.0
      capacitance_pf = 30.0
      """;

  private static final String VC =
      """
      name = "vc"
      [protocol]
      holding_mv = -70.0
      step_mv = -5.0
      step_width_ms = 10.0
      period_ms = 500.0
      [cell]
      access_mohm = 10.0
      membrane_mohm = 300.0
      capacitance_pf = 30.0
      """;

  private static ScenarioException fails(String text) {
    return assertThrows(ScenarioException.class, () -> ScenarioLoader.parse("m.toml", "m", text));
  }

  private static void assertOneLine(ScenarioException e, String start) {
    assertTrue(e.getMessage().startsWith(start), e.getMessage());
    assertFalse(e.getMessage().contains("\n"), e.getMessage());
  }

  @Test
  void currentClampKeysReadInTheResponsesUnit() {
    Scenario s = ScenarioLoader.parse("m.toml", "m", CC);
    assertEquals(ClampMode.CURRENT_CLAMP, s.protocol().mode());
    assertEquals(10.0, s.protocol().holdingLevel());
    assertEquals(-50.0, s.protocol().stepLevel());
    // In current clamp the amplifier's noise and range are in mV (the response's unit).
    assertEquals(0.2, s.amplifier().noiseRmsPa());
    assertEquals(400.0, s.amplifier().adcRangePa());
    assertEquals(12.0, s.amplifier().bridgeBalanceMOhm());
  }

  @Test
  void keysOfTheOtherModeAreNamedWithTheOneToUse() {
    assertOneLine(
        fails(CC.replace("step_pa = -50.0", "step_mv = -5.0")),
        "m.toml: protocol.step_mv: does not belong to a current-clamp protocol (use step_pa)");
    assertOneLine(
        fails(CC.replace("noise_rms_mv", "noise_rms_pa")),
        "m.toml: amplifier.noise_rms_pa: does not belong to a current-clamp recording"
            + " (use noise_rms_mv)");
    assertOneLine(
        fails(VC + "[amplifier]\nbridge_balance_mohm = 5.0\n"),
        "m.toml: amplifier.bridge_balance_mohm: applies to current clamp only");
    assertOneLine(
        fails(CC.replace("\"current-clamp\"", "\"whole-cell\"")),
        "m.toml: protocol.mode: must be \"voltage-clamp\" or \"current-clamp\"");
    assertOneLine(
        fails(CC.replace("step_pa = -50.0", "step_pa = 0.0")), "m.toml: protocol.step_pa");
  }

  @Test
  void synapticKeysReadIntoTheActivityAndBadOnesAreNamed() {
    Scenario s =
        ScenarioLoader.parse(
            "m.toml",
            "m",
            VC
                + "[synaptic]\nrate_hz = 3.0\namplitude_pa = 30.0\namplitude_spread = 0.67\n"
                + "rise_ms = 0.3\ndecay_ms = 3.0\n");
    SynapticActivity a = s.synaptic();
    assertTrue(a.active());
    assertEquals(3.0, a.rateHz());
    assertEquals(30.0, a.amplitudePa());
    assertEquals(0.67, a.amplitudeSpread());
    assertEquals(0.3, a.riseMs());
    assertEquals(3.0, a.decayMs());
    assertFalse(ScenarioLoader.parse("m.toml", "m", VC).synaptic().active());
    assertOneLine(
        fails(
            VC + "[synaptic]\nrate_hz = 3.0\namplitude_pa = 30.0\nrise_ms = 4.0\ndecay_ms = 3.0\n"),
        "m.toml: synaptic.decay_ms: must be longer than rise_ms");
    assertOneLine(
        fails(VC + "[synaptic]\nrate_hz = 3.0\namplitude_pa = 30.0\ndecay = 3.0\n"),
        "m.toml: synaptic.decay: unknown key");
    assertOneLine(
        fails(VC + "[synaptic]\namplitude_pa = 30.0\n"), "m.toml: synaptic.rate_hz: is required");
    assertOneLine(
        fails(VC + "[synaptic]\nrate_hz = 3.0\namplitude_pa = 30.0\namplitude_spread = 2.0\n"),
        "m.toml: synaptic.amplitude_spread: must be in");
  }

  @Test
  void spikeKeysReadInCurrentClampOnlyAndBadOnesAreNamed() {
    Scenario s =
        ScenarioLoader.parse(
            "m.toml",
            "m",
            CC
                + "[spikes]\nthreshold_mv = -50.0\namplitude_mv = 80.0\nwidth_ms = 1.5\n"
                + "refractory_ms = 4.0\n");
    SpikeWaveform w = s.spikes();
    assertEquals(-50.0, w.thresholdMv());
    assertEquals(80.0, w.amplitudeMv());
    assertEquals(1.5, w.widthMs());
    assertEquals(4.0, w.refractoryMs());
    assertOneLine(
        fails(VC + "[spikes]\nthreshold_mv = -50.0\n"),
        "m.toml: spikes: applies to current clamp only");
    assertOneLine(
        fails(CC + "[spikes]\nwidth_ms = 1.0\n"), "m.toml: spikes.threshold_mv: is required");
    assertOneLine(
        fails(CC + "[spikes]\nthreshold_mv = -50.0\nheight_mv = 80.0\n"),
        "m.toml: spikes.height_mv: unknown key");
    assertOneLine(
        fails(CC + "[spikes]\nthreshold_mv = -50.0\nwidth_ms = 0.0\n"),
        "m.toml: spikes.width_ms: must be in");
  }
}
