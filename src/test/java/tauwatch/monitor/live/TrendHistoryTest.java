package tauwatch.monitor.live;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.EnumMap;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;
import tauwatch.fit.Parameter;
import tauwatch.fit.PulseEstimate;
import tauwatch.health.HealthSnapshot;
import tauwatch.health.HealthState;
import tauwatch.health.ParameterLimits;
import tauwatch.health.ParameterStatus;
import tauwatch.health.RuleReading;

/** The trend store and its per-pixel reduction, checked against a brute-force scan of the rows. */
class TrendHistoryTest {
  private static final Parameter RA = Parameter.ACCESS_RESISTANCE;

  static PulseEstimate estimate(long n, double tS, double ra, boolean accepted) {
    PulseEstimate.Builder b =
        PulseEstimate.builder()
            .pulseNumber(n)
            .onsetTimeS(tS)
            .value(RA, ra, 0.1)
            .value(Parameter.INPUT_RESISTANCE, 300, 2)
            .value(Parameter.MEMBRANE_CAPACITANCE, 30, 0.1)
            .value(Parameter.TIME_CONSTANT, 0.3, 0.001)
            .value(Parameter.HOLDING_CURRENT, -20, 0.2);
    if (!accepted) {
      b.reject("scripted rejection");
    }
    return b.build();
  }

  static HealthSnapshot health(long n, double tS, HealthState raState, double raBaseline) {
    Map<Parameter, ParameterStatus> m = new EnumMap<>(Parameter.class);
    m.put(
        RA,
        new ParameterStatus(
            RA,
            raState,
            10,
            raBaseline,
            0,
            RuleReading.none(
                new ParameterLimits(RA, Double.NaN, Double.NaN, Double.NaN, Double.NaN)),
            false));
    return new HealthSnapshot(n, tS, raState, m, !Double.isNaN(raBaseline), 20);
  }

  @Test
  void rowsReadBackAsWrittenAndTheRingKeepsTheNewest() {
    TrendHistory h = new TrendHistory(2 * TrendHistory.CHUNK_ROWS);
    int cap = h.capacity();
    assertEquals(2 * TrendHistory.CHUNK_ROWS, cap);
    int n = cap + 1000;
    for (int i = 0; i < n; i++) {
      h.append(
          estimate(i, 0.5 * i, 10 + i * 1e-3, i % 7 != 0),
          health(i, 0.5 * i, HealthState.STEADY, 10));
    }
    assertEquals(n, h.rowCount());
    long oldest = h.oldestReadableRow(n);
    assertEquals(n - cap + TrendHistory.READ_SLACK_ROWS, oldest);
    for (long r = oldest; r < n; r++) {
      assertEquals(0.5 * r, h.timeS(r), 1e-12);
      assertEquals((float) (10 + r * 1e-3), h.value(r, RA));
      assertEquals(r % 7 != 0, h.accepted(r));
      assertEquals(10f, h.baseline(r, RA));
    }
    assertEquals(oldest + 10, h.firstRowAtOrAfter(0.5 * (oldest + 10), oldest, n));
    assertEquals(oldest + 11, h.firstRowAtOrAfter(0.5 * (oldest + 10) + 0.1, oldest, n));
  }

  @Test
  void reductionGivesEachColumnTheMinAndMaxOfItsAcceptedRowsAndItsWorstState() {
    TrendHistory h = new TrendHistory(4 * TrendHistory.CHUNK_ROWS);
    Random rng = new Random(7);
    int rows = 7200; // one hour at 2 pulses/s
    double[] ra = new double[rows];
    boolean[] ok = new boolean[rows];
    HealthState[] st = new HealthState[rows];
    for (int i = 0; i < rows; i++) {
      ra[i] = 10 + rng.nextGaussian();
      ok[i] = rng.nextInt(10) != 0;
      st[i] = HealthState.values()[rng.nextInt(50) == 0 ? 2 : rng.nextInt(2)];
      h.append(estimate(i, 0.5 * i, ra[i], ok[i]), health(i, 0.5 * i, st[i], 10));
    }
    TrendReduction red = new TrendReduction();
    double t0 = 600;
    double t1 = 3000;
    int cols = 317;
    red.reduce(h, RA, t0, t1, cols);
    // Brute force: every row in range, assigned to its column by the same floor rule.
    float[] mn = new float[cols];
    float[] mx = new float[cols];
    int[] rej = new int[cols];
    HealthState[] worst = new HealthState[cols];
    java.util.Arrays.fill(mn, Float.NaN);
    java.util.Arrays.fill(mx, Float.NaN);
    java.util.Arrays.fill(worst, HealthState.STEADY);
    long read = 0;
    for (int i = 0; i < rows; i++) {
      double t = 0.5 * i;
      if (t < t0 || t >= t1) {
        continue;
      }
      read++;
      int c = (int) ((t - t0) * (cols / (t1 - t0)));
      worst[c] = HealthState.worse(worst[c], st[i]);
      if (!ok[i]) {
        rej[c]++;
        continue;
      }
      float v = (float) ra[i];
      mn[c] = Float.isNaN(mn[c]) ? v : Math.min(mn[c], v);
      mx[c] = Float.isNaN(mx[c]) ? v : Math.max(mx[c], v);
    }
    assertEquals(read, red.rowsRead());
    for (int c = 0; c < cols; c++) {
      assertEquals(mn[c], red.min(c), "min, column " + c);
      assertEquals(mx[c], red.max(c), "max, column " + c);
      assertEquals(rej[c], red.rejected(c), "rejected, column " + c);
      assertEquals(worst[c], red.worstState(c), "state, column " + c);
      assertTrue(red.hasPulses(c));
      assertEquals(10f, red.baseline(c));
    }
  }

  @Test
  void reductionOverAWrappedRingMatchesReadingRowByRow() {
    // The reduction walks the storage chunk by chunk; the brute force below reads each row through
    // the public accessors, across chunk ends and the ring's wrap.
    TrendHistory h = new TrendHistory(2 * TrendHistory.CHUNK_ROWS);
    Random rng = new Random(11);
    int n = (int) (3.3 * TrendHistory.CHUNK_ROWS);
    for (int i = 0; i < n; i++) {
      HealthState s = HealthState.values()[rng.nextInt(HealthState.values().length)];
      h.append(
          estimate(i, 0.5 * i, 10 + rng.nextGaussian(), rng.nextInt(8) != 0),
          health(i, 0.5 * i, s, 10 + i * 1e-3));
    }
    long count = h.rowCount();
    long oldest = h.oldestReadableRow(count);
    double t0 = h.timeS(oldest);
    double t1 = h.timeS(count - 1) + 0.5;
    int cols = 499;
    TrendReduction red = new TrendReduction();
    red.reduce(h, RA, t0, t1, cols);
    float[] mn = new float[cols];
    float[] mx = new float[cols];
    float[] base = new float[cols];
    int[] rej = new int[cols];
    HealthState[] worst = new HealthState[cols];
    java.util.Arrays.fill(mn, Float.NaN);
    java.util.Arrays.fill(mx, Float.NaN);
    java.util.Arrays.fill(worst, HealthState.STEADY);
    for (long r = oldest; r < count; r++) {
      int c = (int) ((h.timeS(r) - t0) * (cols / (t1 - t0)));
      worst[c] = HealthState.worse(worst[c], HealthState.values()[h.stateOrdinal(r, RA)]);
      base[c] = h.baseline(r, RA);
      if (!h.accepted(r)) {
        rej[c]++;
        continue;
      }
      float v = h.value(r, RA);
      mn[c] = Float.isNaN(mn[c]) ? v : Math.min(mn[c], v);
      mx[c] = Float.isNaN(mx[c]) ? v : Math.max(mx[c], v);
    }
    assertEquals(count - oldest, red.rowsRead());
    for (int c = 0; c < cols; c++) {
      assertEquals(mn[c], red.min(c), "min, column " + c);
      assertEquals(mx[c], red.max(c), "max, column " + c);
      assertEquals(rej[c], red.rejected(c), "rejected, column " + c);
      assertEquals(worst[c], red.worstState(c), "state, column " + c);
      assertEquals(base[c], red.baseline(c), "baseline, column " + c);
    }
  }

  @Test
  void anEmptyHistoryReducesToEmptyColumns() {
    TrendReduction red = new TrendReduction();
    assertEquals(0, red.reduce(new TrendHistory(), RA, 0, 60, 100));
    assertFalse(red.hasPulses(0));
    assertTrue(Double.isNaN(red.dataMin()));
  }
}
