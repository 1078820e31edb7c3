package tauwatch.monitor.live;

import tauwatch.fit.Parameter;
import tauwatch.health.HealthState;

/**
 * One parameter's trend reduced to screen columns: per column the smallest and largest accepted
 * value, the baseline in force, the count of rejected pulses and the worst health state, so that
 * hours of pulses draw as at most two points per pixel.
 *
 * <p>Owned by one reader (the view thread); its arrays are reused and grow only when the panel gets
 * wider, so a steady redraw allocates nothing. Reads a {@link TrendHistory} concurrently with its
 * writer under that class's contract.
 */
public final class TrendReduction {
  private static final HealthState[] STATES = HealthState.values();

  /** Each state's {@link HealthState#severity()}, by ordinal. */
  private static final int[] SEVERITY = new int[STATES.length];

  static {
    for (HealthState s : STATES) {
      SEVERITY[s.ordinal()] = s.severity();
    }
  }

  private int columns;
  private float[] min = new float[0];
  private float[] max = new float[0];
  private float[] baseline = new float[0];
  private int[] rejected = new int[0];
  private byte[] worst = new byte[0];
  private boolean[] any = new boolean[0];
  private double dataMin;
  private double dataMax;
  private long rowsRead;

  /**
   * Reduces rows with onset in [{@code t0S}, {@code t1S}) to {@code columns} equal columns.
   *
   * @return the number of rows read
   */
  public long reduce(TrendHistory h, Parameter p, double t0S, double t1S, int columns) {
    ensure(columns);
    this.columns = columns;
    for (int c = 0; c < columns; c++) {
      min[c] = Float.NaN;
      max[c] = Float.NaN;
      baseline[c] = Float.NaN;
      rejected[c] = 0;
      worst[c] = (byte) HealthState.STEADY.ordinal();
      any[c] = false;
    }
    dataMin = Double.NaN;
    dataMax = Double.NaN;
    long count = h.rowCount();
    long oldest = h.oldestReadableRow(count);
    if (count == 0 || !(t1S > t0S) || columns <= 0) {
      rowsRead = 0;
      return 0;
    }
    long from = h.firstRowAtOrAfter(t0S, oldest, count);
    long to = h.firstRowAtOrAfter(t1S, from, count);
    double perColumn = columns / (t1S - t0S);
    float lo = Float.POSITIVE_INFINITY;
    float hi = Float.NEGATIVE_INFINITY;
    // A run of rows at a time within one storage chunk, on the chunk's arrays: locating each row
    // anew (a long modulo and three array hops per column read) was most of a day-long redraw.
    long r = from;
    while (r < to) {
      int slot = h.slot(r);
      int chunk = slot / TrendHistory.CHUNK_ROWS;
      int start = slot % TrendHistory.CHUNK_ROWS;
      int end = (int) Math.min(TrendHistory.CHUNK_ROWS, start + (to - r));
      final double[] ts = h.timeChunk(chunk);
      final byte[] acc = h.acceptedChunk(chunk);
      final float[] vs = h.valueChunk(chunk, p);
      final float[] bs = h.baselineChunk(chunk, p);
      final byte[] st = h.stateChunk(chunk, p);
      for (int i = start; i < end; i++) {
        int c = (int) ((ts[i] - t0S) * perColumn);
        if (c < 0 || c >= columns) {
          continue;
        }
        any[c] = true;
        int s = st[i];
        if (SEVERITY[s] > SEVERITY[worst[c]]) {
          worst[c] = (byte) s;
        }
        float b = bs[i];
        if (!Float.isNaN(b)) {
          baseline[c] = b;
        }
        if (acc[i] == 0) {
          rejected[c]++;
          continue;
        }
        float v = vs[i];
        if (Float.isNaN(v)) {
          continue;
        }
        if (Float.isNaN(min[c]) || v < min[c]) {
          min[c] = v;
        }
        if (Float.isNaN(max[c]) || v > max[c]) {
          max[c] = v;
        }
        if (v < lo) {
          lo = v;
        }
        if (v > hi) {
          hi = v;
        }
      }
      r += end - start;
    }
    if (lo <= hi) {
      dataMin = lo;
      dataMax = hi;
    }
    rowsRead = to - from;
    return rowsRead;
  }

  private void ensure(int n) {
    if (min.length < n) {
      min = new float[n];
      max = new float[n];
      baseline = new float[n];
      rejected = new int[n];
      worst = new byte[n];
      any = new boolean[n];
    }
  }

  public int columns() {
    return columns;
  }

  /** Smallest accepted value in column {@code c}, NaN when none. */
  public float min(int c) {
    return min[c];
  }

  /** Largest accepted value in column {@code c}, NaN when none. */
  public float max(int c) {
    return max[c];
  }

  /** The latest baseline in force in column {@code c}, NaN when none. */
  public float baseline(int c) {
    return baseline[c];
  }

  /** Rejected pulses in column {@code c}. */
  public int rejected(int c) {
    return rejected[c];
  }

  /** Whether any pulse (accepted or not) falls in column {@code c}. */
  public boolean hasPulses(int c) {
    return any[c];
  }

  /** The worst health state of the pulses in column {@code c} (steady when none). */
  public HealthState worstState(int c) {
    return STATES[worst[c]];
  }

  /** Smallest accepted value over all columns, NaN when none. */
  public double dataMin() {
    return dataMin;
  }

  /** Largest accepted value over all columns, NaN when none. */
  public double dataMax() {
    return dataMax;
  }

  /** Rows read by the last {@link #reduce}. */
  public long rowsRead() {
    return rowsRead;
  }
}
