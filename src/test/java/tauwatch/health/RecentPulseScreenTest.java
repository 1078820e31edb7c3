package tauwatch.health;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;
import tauwatch.bench.SimulatedPulseTrain;
import tauwatch.fit.Parameter;
import tauwatch.fit.PulseEstimate;
import tauwatch.fit.VoltageClampEstimator;
import tauwatch.pulse.PulseWindow;
import tauwatch.sim.ScenarioLoader;

/**
 * The screen against the recent accepted pulses: robust median and MAD (1.4826·MAD ≈ σ for normal
 * data; Rousseeuw &amp; Croux 1993 — from memory), 6 robust SDs, a jump confirmed by the next
 * pulses passed on.
 */
class RecentPulseScreenTest {
  /**
   * A synaptic current (0.3 ms rise, 3 ms decay, 10 pA peak, inward: the synaptic-cell scenario's
   * shape) starting 2 ms into one pulse's step bends its steady current without tripping the
   * estimator's residual tests; against the 14 clean pulses before it, its Rt is far out and the
   * screen rejects it, while every clean pulse of the steady cell passes.
   */
  @Test
  void anIsolatedPulseBentByASynapticEventIsRejectedAsAnOutlier() {
    SimulatedPulseTrain train =
        new SimulatedPulseTrain(ScenarioLoader.load("steady-cell"), 3, 3, 20);
    VoltageClampEstimator est = new VoltageClampEstimator();
    RecentPulseScreen screen = RecentPulseScreen.defaults();
    int contaminated = 14;
    for (int i = 0; i < 30; i++) {
      PulseWindow w = train.next();
      if (i == contaminated) {
        addSynapticEvent(w, 2.0, 10);
      }
      PulseEstimate e = est.estimate(w);
      assertTrue(e.accepted(), "pulse " + i + " passes the estimator: " + e);
      PulseEstimate s = screen.screen(e);
      if (i == contaminated) {
        assertFalse(s.accepted(), "the contaminated pulse is caught: " + s);
        assertTrue(
            s.rejectReason().startsWith("outlier against the recent pulses (Rt "),
            s.rejectReason());
        System.out.println("synaptic outlier: " + s.rejectReason());
      } else {
        assertSame(e, s, "clean pulse " + i + " passes unchanged");
      }
    }
  }

  /** An inward synaptic current, peak {@code peakPa}, from {@code startMs} after the onset. */
  private static void addSynapticEvent(PulseWindow w, double startMs, double peakPa) {
    double dtMs = w.sampleIntervalS * 1e3;
    // Difference of exponentials (rise 0.3 ms, decay 3 ms) peaks at ≈ 0.70 of its unit amplitude.
    for (int i = 0; i < w.length; i++) {
      double s = (i - w.onsetIndex) * dtMs - startMs;
      if (s > 0) {
        w.response[i] -= peakPa * (Math.exp(-s / 3) - Math.exp(-s / 0.3)) / 0.70;
      }
    }
  }

  private static PulseEstimate pulse(long n, double raMOhm) {
    return PulseEstimate.builder()
        .pulseNumber(n)
        .onsetTimeS(0.5 * n)
        .value(Parameter.ACCESS_RESISTANCE, raMOhm, 0.05)
        .value(Parameter.TOTAL_RESISTANCE, 300 + raMOhm, 1)
        .value(Parameter.TIME_CONSTANT, 0.3, 0.002)
        .build();
  }

  @Test
  void aJumpTheNextTwoPulsesConfirmIsPassedOnAndBecomesTheNewReference() {
    RecentPulseScreen screen = RecentPulseScreen.defaults();
    long n = 0;
    for (int i = 0; i < 15; i++) {
      // Scatter ±0.1 MΩ around 12 MΩ.
      assertTrue(screen.screen(pulse(++n, 12 + 0.1 * Math.sin(i))).accepted());
    }
    assertFalse(screen.screen(pulse(++n, 30)).accepted(), "the jump alone is suspect");
    assertFalse(screen.screen(pulse(++n, 40)).accepted(), "one confirmation is not enough");
    assertTrue(screen.screen(pulse(++n, 40.1)).accepted(), "the second confirms the change");
    for (int i = 0; i < 10; i++) {
      assertTrue(screen.screen(pulse(++n, 40 + 0.1 * Math.sin(i))).accepted(), "new level " + i);
    }
  }

  @Test
  void outliersOnOppositeSidesDoNotConfirmEachOtherAndRejectedPulsesPassUntouched() {
    RecentPulseScreen screen = RecentPulseScreen.defaults();
    long n = 0;
    for (int i = 0; i < 15; i++) {
      screen.screen(pulse(++n, 12 + 0.1 * Math.sin(i)));
    }
    PulseEstimate refused = pulse(++n, 90).rejected("on-transient: no capacitive transient");
    assertSame(refused, screen.screen(refused));
    assertFalse(screen.screen(pulse(++n, 20)).accepted());
    assertFalse(screen.screen(pulse(++n, 5)).accepted());
    assertFalse(screen.screen(pulse(++n, 20)).accepted(), "high, low, high is no level");
    PulseEstimate back = pulse(++n, 12.05);
    assertSame(back, screen.screen(back));
    assertEquals(
        "outlier against the recent pulses (Ra 20.0 vs median 12.0)",
        screen.screen(pulse(++n, 20)).rejectReason());
  }

  @Test
  void aScreenSwitchedOffPassesEveryPulseAndTighterSettingsCatchSmallerJumps() {
    OutlierScreening d = OutlierScreening.defaults();
    RecentPulseScreen off =
        new OutlierScreening(
                false,
                d.historyPulses(),
                d.minHistoryPulses(),
                d.outlierSigmas(),
                d.relativeFloorPercent(),
                d.confirmPulses())
            .newScreen();
    RecentPulseScreen tight = new OutlierScreening(true, 15, 8, 6, 0.1, 3).newScreen();
    RecentPulseScreen usual = RecentPulseScreen.defaults();
    long n = 0;
    for (int i = 0; i < 15; i++) {
      PulseEstimate e = pulse(++n, 12 + 0.01 * Math.sin(i));
      off.screen(e);
      tight.screen(e);
      usual.screen(e);
    }
    PulseEstimate jump = pulse(++n, 12.5); // 4 %: inside 6 × the default 1 % floor, not 0.1 %
    assertSame(jump, off.screen(jump));
    assertSame(jump, usual.screen(jump));
    assertFalse(tight.screen(jump).accepted());
    PulseEstimate wild = pulse(++n, 90);
    assertSame(wild, off.screen(wild), "off means off, however far the pulse");
  }
}
