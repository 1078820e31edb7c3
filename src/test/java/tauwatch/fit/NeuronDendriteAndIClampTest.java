package tauwatch.fit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.InputStream;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import tauwatch.pulse.PulseWindow;

/**
 * Two outside references from NEURON 8.2.2: a soma with a passive dendrite cable under SEClamp
 * ({@code src/test/python/neuron/passive_seclamp_dendrite.py}; cable parameters, nseg and λ in the
 * sidecar) and a passive soma under IClamp with the electrode's I·Ra added ({@code
 * passive_iclamp.py}).
 *
 * <p>Tolerances from issue 5: on cells with a dendrite Ra within 10 %, Cm within 10 % of the
 * capacitance the clamp charges (NEURON's Σ C_seg·ΔV_seg over the soma's ΔV), model "bi"; in
 * current clamp Rin, τ, Cm within 3 % and Ra within 10 % (median over pulses).
 */
class NeuronDendriteAndIClampTest {
  private static final ObjectMapper JSON = new ObjectMapper();

  private static JsonNode meta(String stem) throws Exception {
    try (InputStream in =
        NeuronDendriteAndIClampTest.class.getResourceAsStream(
            "/fixtures/neuron/" + stem + ".json")) {
      return JSON.readTree(in);
    }
  }

  @ParameterizedTest(name = "{0}")
  @CsvSource({"dend_clean", "dend_filtered_noisy"})
  void aSomaWithADendriteIsFitWithTwoExponentialsAndTheChargedCapacitance(String stem)
      throws Exception {
    JsonNode m = meta(stem);
    InterchangeTrace trace = InterchangeTrace.load("/fixtures/neuron/" + stem + ".csv");
    VoltageClampEstimator est = new VoltageClampEstimator();
    List<PulseEstimate> es = new ArrayList<>();
    for (PulseWindow w : trace.pulses(m.get("filter_cutoff_hz").asDouble())) {
      PulseEstimate e = est.estimate(w);
      assertTrue(e.accepted(), e.toString());
      assertEquals("bi", e.model(), e.toString());
      es.add(e);
    }
    CurrentClampEstimatorTest.assertWithin(
        es, Parameter.ACCESS_RESISTANCE, m.get("ra_mohm").asDouble(), 0.10);
    CurrentClampEstimatorTest.assertWithin(
        es, Parameter.MEMBRANE_CAPACITANCE, m.get("cm_charged_pf").asDouble(), 0.10);
    // Rin: no tolerance in the issue; a cable has more than two modes, and the two-exponential
    // steady state reads it within 10 %.
    CurrentClampEstimatorTest.assertWithin(
        es, Parameter.INPUT_RESISTANCE, m.get("rin_mohm").asDouble(), 0.10);
    PulseEstimate first = es.get(0);
    System.out.printf(
        "%s: Ra %.3f Cm %.3f (charged %.3f, total %.3f) Rin %.1f tau1 %.3f tau2 %.3f%n",
        stem,
        first.value(Parameter.ACCESS_RESISTANCE),
        first.value(Parameter.MEMBRANE_CAPACITANCE),
        m.get("cm_charged_pf").asDouble(),
        m.get("cm_total_pf").asDouble(),
        first.value(Parameter.INPUT_RESISTANCE),
        first.value(Parameter.FAST_TIME_CONSTANT),
        first.value(Parameter.SLOW_TIME_CONSTANT));
  }

  @ParameterizedTest(name = "{0}")
  @CsvSource({"soma25_cc_clean, 0.01", "soma25_cc_filtered_noisy, 0.03"})
  void aPassiveSomaUnderIClampGivesRinTauCmAndTheBridgeError(String stem, double tol)
      throws Exception {
    JsonNode m = meta(stem);
    InterchangeTrace trace = InterchangeTrace.load("/fixtures/neuron/" + stem + ".csv");
    CurrentClampEstimator est = new CurrentClampEstimator();
    List<PulseEstimate> es = new ArrayList<>();
    for (PulseWindow w : trace.pulses(m.get("filter_cutoff_hz").asDouble())) {
      PulseEstimate e = est.estimate(w);
      assertTrue(e.accepted(), e.toString());
      es.add(e);
    }
    CurrentClampEstimatorTest.assertWithin(
        es, Parameter.INPUT_RESISTANCE, m.get("rin_mohm").asDouble(), tol);
    CurrentClampEstimatorTest.assertWithin(
        es, Parameter.TIME_CONSTANT, m.get("tau_ms").asDouble(), tol);
    CurrentClampEstimatorTest.assertWithin(
        es, Parameter.MEMBRANE_CAPACITANCE, m.get("cm_pf").asDouble(), tol);
    CurrentClampEstimatorTest.assertWithin(
        es, Parameter.ACCESS_RESISTANCE, m.get("ra_mohm").asDouble(), 0.10);
    for (PulseEstimate e : es) {
      // The baseline is the pas mechanism's reversal; 0.2 mV noise over 60 rows, 1 mV is ample.
      assertEquals(m.get("vrest_mv").asDouble(), e.value(Parameter.RESTING_POTENTIAL), 0.2);
    }
  }
}
