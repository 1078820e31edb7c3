package tauwatch.pulse;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import tauwatch.event.EventKind;
import tauwatch.event.MonitorEvent;
import tauwatch.stream.ClampMode;
import tauwatch.stream.SampleBlock;
import tauwatch.stream.StreamFormat;

class PulseSegmenterTest {
  private static final double RATE = 50_000;
  private static final StreamFormat VC = new StreamFormat(RATE, ClampMode.VOLTAGE_CLAMP, 0, 0, "t");

  /** A copy of what the segmenter handed out, since its window is reused. */
  record Cut(
      long pulse,
      long first,
      int onset,
      int offset,
      int length,
      double holding,
      double step,
      boolean gap,
      long sweep,
      double sweepT,
      double[] response) {}

  private final List<Cut> cuts = new ArrayList<>();
  private final List<MonitorEvent> events = new ArrayList<>();

  private PulseSegmenter segmenter(SegmenterOptions o) {
    return new PulseSegmenter(
        VC,
        o,
        w ->
            cuts.add(
                new Cut(
                    w.pulseNumber,
                    w.firstSampleIndex,
                    w.onsetIndex,
                    w.offsetIndex,
                    w.length,
                    w.holdingLevel,
                    w.stepLevel,
                    w.spansGap,
                    w.sweepNumber,
                    w.sweepTimeS,
                    java.util.Arrays.copyOf(w.response, w.length))),
        events::add);
  }

  /** Command: −70 mV holding, −75 mV steps of {@code width} samples every {@code period}. */
  private static double command(long i, long first, long period, long width) {
    long local = i - first;
    return local >= 0 && local % period < width ? -75.0 : -70.0;
  }

  private static void feed(
      PulseSegmenter s, long from, long to, java.util.function.LongToDoubleFunction cmd) {
    SampleBlock b = new SampleBlock(256);
    long i = from;
    while (i < to) {
      b.clear();
      b.firstSampleIndex = i;
      int n = (int) Math.min(256, to - i);
      for (int k = 0; k < n; k++, i++) {
        b.command[k] = cmd.applyAsDouble(i);
        b.response[k] = i; // the sample index, so the cut can be checked exactly
      }
      b.length = n;
      s.onBlock(b, 0, true);
    }
  }

  @Test
  void cutsOneWindowPerStepWithMeasuredLevelsAndExactOnset() {
    PulseSegmenter s = segmenter(SegmenterOptions.defaults());
    // 10 ms steps every 100 ms from 50 ms on, for 1 s: 10 pulses.
    feed(s, 0, 50_000, i -> command(i, 2500, 5000, 500));
    assertEquals(10, cuts.size());
    int baseline = (int) Math.round(SegmenterOptions.DEFAULT_BASELINE_MS * 1e-3 * RATE);
    int off = (int) Math.round(SegmenterOptions.DEFAULT_OFF_WINDOW_MS * 1e-3 * RATE);
    for (int k = 0; k < cuts.size(); k++) {
      Cut c = cuts.get(k);
      long onsetIndex = 2500 + 5000L * k;
      assertEquals(k + 1, c.pulse());
      assertEquals(baseline, c.onset(), "baseline samples before the onset");
      // The onset row is the first that shows the step command (interchange timing contract).
      assertEquals(onsetIndex, c.first() + c.onset());
      assertEquals(onsetIndex, (long) c.response()[c.onset()]);
      assertEquals(500, c.offset() - c.onset(), "step width in samples");
      assertEquals(c.offset() + off, c.length(), "off window");
      assertEquals(-70.0, c.holding(), 1e-12);
      assertEquals(-75.0, c.step(), 1e-12);
      assertFalse(c.gap());
      assertEquals(-1, c.sweep());
      for (int i = 0; i < c.length(); i++) {
        assertEquals(c.first() + i, (long) c.response()[i], "samples are contiguous");
      }
    }
  }

  @Test
  void measuresTheStepAmplitudeFromANoisyCommandChannel() {
    PulseSegmenter s = segmenter(SegmenterOptions.defaults());
    java.util.Random rnd = new java.util.Random(7);
    double[] noise = new double[50_000];
    for (int i = 0; i < noise.length; i++) {
      noise[i] = 0.05 * rnd.nextGaussian();
    }
    feed(s, 0, 50_000, i -> command(i, 2500, 5000, 500) + noise[(int) i]);
    assertEquals(10, cuts.size());
    for (Cut c : cuts) {
      assertEquals(-5.0, c.step() - c.holding(), 0.02);
    }
  }

  @Test
  void followsADriftingHoldingLevelThroughCommandNoiseNearTheEdgeThreshold() {
    // Holding creeps by 3 mV over the second (six edge thresholds), and the command carries
    // uniform noise up to 0.35 mV: past the band where quiet runs are taken whole, short of the
    // 0.5 mV threshold, so both the bulk and the sample-by-sample ways of following it are used.
    PulseSegmenter s = segmenter(SegmenterOptions.defaults());
    java.util.Random rnd = new java.util.Random(11);
    double[] noise = new double[50_000];
    for (int i = 0; i < noise.length; i++) {
      noise[i] = 0.35 * (2 * rnd.nextDouble() - 1);
    }
    feed(s, 0, 50_000, i -> command(i, 2500, 5000, 500) + 3.0 * i / 50_000 + noise[(int) i]);
    assertEquals(10, cuts.size(), "one window per step, no edge from noise or drift");
    for (int k = 0; k < cuts.size(); k++) {
      Cut c = cuts.get(k);
      long onsetIndex = 2500 + 5000L * k;
      assertEquals(onsetIndex, c.first() + c.onset(), "onset of pulse " + (k + 1));
      double drift = 3.0 * onsetIndex / 50_000;
      assertEquals(-70.0 + drift, c.holding(), 0.05, "holding measured under pulse " + (k + 1));
      assertEquals(500, c.offset() - c.onset());
    }
  }

  @Test
  void ignoresStepsLongerThanATestPulseAndFollowsANewHoldingLevel() {
    PulseSegmenter s = segmenter(SegmenterOptions.defaults());
    // Holding changes from −70 to −60 mV at 0.2 s; test pulses of −5 mV continue around it.
    feed(
        s,
        0,
        100_000,
        i -> {
          double hold = i < 10_000 ? -70 : -60;
          long local = i - 2500;
          return hold + (local >= 0 && local % 5000 < 500 ? -5 : 0);
        });
    assertEquals(1, s.ignoredSteps());
    assertEquals(EventKind.STEP_IGNORED, events.get(0).kind());
    Cut last = cuts.get(cuts.size() - 1);
    assertEquals(-60.0, last.holding(), 1e-9);
    assertEquals(-65.0, last.step(), 1e-9);
    assertTrue(cuts.size() >= 15, "pulses resume at the new holding level: " + cuts.size());
  }

  @Test
  void marksAWindowThatSpansLostSamples() {
    PulseSegmenter s = segmenter(SegmenterOptions.defaults());
    feed(s, 0, 2600, i -> command(i, 2500, 5000, 500));
    SampleBlock b = new SampleBlock(256);
    b.firstSampleIndex = 2700; // 100 samples lost inside the step
    b.lostBeforeSamples = 100;
    b.length = 0;
    s.onBlock(b, 0, true);
    feed(s, 2700, 10_000, i -> command(i, 2500, 5000, 500));
    assertTrue(cuts.get(0).gap());
    assertFalse(cuts.get(1).gap());
  }

  @Test
  void usesTheScheduleWhenNoCommandIsRecorded() {
    PulseSegmenter s =
        segmenter(SegmenterOptions.defaults().withSchedule(new PulseSchedule(50, 100, 10, -5)));
    feed(s, 0, 50_000, i -> Double.NaN);
    assertEquals(10, cuts.size());
    assertEquals(2500, cuts.get(0).first() + cuts.get(0).onset());
    assertEquals(-5.0, cuts.get(0).step() - cuts.get(0).holding(), 1e-12);
  }

  @Test
  void numbersPulsesBySweepWhenTheStreamCarriesATrigger() {
    PulseSegmenter s = segmenter(SegmenterOptions.defaults());
    SampleBlock b = new SampleBlock(256);
    long i = 0;
    while (i < 50_000) {
      b.clear();
      b.firstSampleIndex = i;
      for (int k = 0; k < 256 && i < 50_000; k++, i++) {
        b.command[k] = command(i, 2500, 5000, 500);
        b.response[k] = 0;
        b.sweepStart[k] = (byte) (i % 20_000 == 1000 ? 1 : 0); // sweeps start at 20 ms, 420 ms...
        b.length = k + 1;
      }
      s.onBlock(b, 0, true);
    }
    assertEquals(1, cuts.get(0).sweep());
    assertEquals((2500 - 1000) / RATE, cuts.get(0).sweepT(), 1e-12);
    assertEquals(2, cuts.get(4).sweep()); // onset 22 500, sweep 2 began at 21 000
    assertEquals((22_500 - 21_000) / RATE, cuts.get(4).sweepT(), 1e-12);
  }
}
