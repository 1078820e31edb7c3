package tauwatch.sim;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import org.junit.jupiter.api.Test;

/**
 * Piecewise-linear schedules, and the simulator following them (Ohm's law for the holding current).
 */
class ScheduleAndDriftTest {

  @Test
  void raCreepInterpolatesLinearlyBetweenKnotsAndHoldsOutside() {
    ParameterSchedule s = ScenarioLoader.loadBuiltIn("ra-creep").schedule();
    assertEquals(10, s.valueAt(CellQuantity.ACCESS_MOHM, 0), 1e-12);
    assertEquals(10, s.valueAt(CellQuantity.ACCESS_MOHM, 120), 1e-12);
    assertEquals(15, s.valueAt(CellQuantity.ACCESS_MOHM, 300), 1e-12);
    assertEquals(20, s.valueAt(CellQuantity.ACCESS_MOHM, 480), 1e-12);
    assertEquals(20, s.valueAt(CellQuantity.ACCESS_MOHM, 600), 1e-12);
    assertEquals(300, s.valueAt(CellQuantity.MEMBRANE_MOHM, 300), 0);
  }

  @Test
  void aSegmentEndingInAPerfectSealHoldsItsLeftValue() {
    ParameterSchedule s =
        ParameterSchedule.builder(CellParameters.soma(10, 300, 30, -65))
            .knots(
                CellQuantity.SEAL_GOHM,
                new double[] {0, 10},
                new double[] {5, Double.POSITIVE_INFINITY})
            .build();
    assertEquals(5, s.valueAt(CellQuantity.SEAL_GOHM, 9.9), 0);
    assertEquals(Double.POSITIVE_INFINITY, s.valueAt(CellQuantity.SEAL_GOHM, 10), 0);
  }

  @Test
  void knotTimesMustIncrease() {
    ParameterSchedule.Builder b = ParameterSchedule.builder(CellParameters.soma(10, 300, 30, -65));
    assertThrows(
        IllegalArgumentException.class,
        () -> b.knots(CellQuantity.ACCESS_MOHM, new double[] {1, 1}, new double[] {10, 20}));
  }

  @Test
  void simulatedHoldingCurrentFollowsAFailingSeal() {
    // Seal 20 → 0.3 GΩ over 0.1–0.5 s. Holding current = (Vh − E_L)/(Ra + Rm) + Vh/Rseal (Ohm's
    // law).
    ParameterSchedule s =
        ParameterSchedule.builder(new CellParameters(10, 300, 30, -65, 20, 0, 0, 0))
            .knots(CellQuantity.SEAL_GOHM, new double[] {0.1, 0.5}, new double[] {20, 0.3})
            .build();
    TestPulseProtocol p = new TestPulseProtocol(-70, -5, 10, 2000, 1500); // pulses after 1.5 s
    Scenario sc = new Scenario("seal", "", 1, 1, p, AmplifierSettings.ideal(50_000), s);
    SimulatedRecording rec = new SimulatedRecording(sc, 1);
    int n = 50_000;
    double[] cmd = new double[n];
    double[] im = new double[n];
    rec.fill(cmd, im, 0, n);
    double expected = (-70 + 65) / 0.310 + -70 / 0.3;
    assertEquals(expected, im[n - 1], 1e-9);
    assertEquals(rec.truthAt(0.9).holdingPa(), im[n - 1], 1e-9);
    // Mid-ramp the staircase (10 ms steps at mid-interval values) tracks the truth closely.
    double mid = im[15_000]; // t = 0.3 s
    double truthMid = rec.truthAt(0.3).holdingPa();
    assertEquals(truthMid, mid, 0.01 * Math.abs(truthMid));
  }
}
