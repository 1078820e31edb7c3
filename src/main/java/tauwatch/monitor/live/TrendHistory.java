package tauwatch.monitor.live;

import java.util.concurrent.atomic.AtomicLong;
import tauwatch.fit.Parameter;
import tauwatch.fit.PulseEstimate;
import tauwatch.health.HealthSnapshot;
import tauwatch.health.HealthState;

/**
 * Every pulse estimate of a session, in primitive columns, for the trend panel: stream time,
 * accepted or not, each parameter's value and baseline, and each parameter's health state.
 *
 * <p>Single writer: {@link #append} is called on the analysis thread only. Any thread may read:
 * {@link #rowCount()} is a volatile publication of the rows written before it (the writer fills a
 * row, then advances the count with a release store), so a reader that loads the count once sees
 * complete rows below it. Storage is a ring of fixed capacity made of chunks of {@value
 * #CHUNK_ROWS} rows, all allocated at construction so that the heap stays flat over a long session;
 * once full, the oldest rows are overwritten. A reader reads only rows from {@link
 * #oldestReadableRow()}, which leaves a slack of {@value #READ_SLACK_ROWS} rows the writer may be
 * overwriting meanwhile. Memory: about 120 bytes per row, 21 MB for 24 h at 2 pulses/s, taken at
 * start.
 */
public final class TrendHistory {
  /** Rows per storage chunk. */
  public static final int CHUNK_ROWS = 4096;

  /** Oldest rows a reader leaves alone: far more than a writer adds in one frame. */
  public static final int READ_SLACK_ROWS = 256;

  /** 24 h at 2 pulses/s, rounded up to whole chunks. */
  public static final int DEFAULT_CAPACITY_ROWS = 24 * 3600 * 2;

  private static final Parameter[] PARAMETERS = Parameter.values();
  private static final int NP = PARAMETERS.length;
  private static final HealthState[] STATES = HealthState.values();

  private final int chunks;
  private final int capacity;
  private final double[][] timeS;
  private final byte[][] accepted;
  private final byte[][] overall;
  private final float[][][] values;
  private final float[][][] baselines;
  private final byte[][][] states;
  private final AtomicLong rows = new AtomicLong();

  public TrendHistory() {
    this(DEFAULT_CAPACITY_ROWS);
  }

  public TrendHistory(int capacityRows) {
    if (capacityRows < 2 * READ_SLACK_ROWS) {
      throw new IllegalArgumentException(
          "trend capacity must be at least " + 2 * READ_SLACK_ROWS + " rows, got " + capacityRows);
    }
    chunks = (capacityRows + CHUNK_ROWS - 1) / CHUNK_ROWS;
    capacity = chunks * CHUNK_ROWS;
    timeS = new double[chunks][];
    accepted = new byte[chunks][];
    overall = new byte[chunks][];
    values = new float[chunks][][];
    baselines = new float[chunks][][];
    states = new byte[chunks][][];
    // All storage up front: a day-long session's heap then stays flat instead of growing by a
    // chunk every half hour until the ring is full.
    for (int c = 0; c < chunks; c++) {
      timeS[c] = new double[CHUNK_ROWS];
      accepted[c] = new byte[CHUNK_ROWS];
      overall[c] = new byte[CHUNK_ROWS];
      values[c] = new float[NP][CHUNK_ROWS];
      baselines[c] = new float[NP][CHUNK_ROWS];
      states[c] = new byte[NP][CHUNK_ROWS];
    }
  }

  /** Rows the ring can hold. */
  public int capacity() {
    return capacity;
  }

  /** Appends one estimate with the health it left. Analysis thread only. */
  public void append(PulseEstimate e, HealthSnapshot h) {
    long row = rows.getPlain();
    int slot = slot(row);
    int c = slot / CHUNK_ROWS;
    int i = slot % CHUNK_ROWS;
    timeS[c][i] = e.onsetTimeS();
    accepted[c][i] = (byte) (e.accepted() ? 1 : 0);
    overall[c][i] = (byte) h.overall().ordinal();
    for (int p = 0; p < NP; p++) {
      Parameter param = PARAMETERS[p];
      values[c][p][i] = (float) e.value(param);
      var status = h.parameters().get(param);
      baselines[c][p][i] = status == null ? Float.NaN : (float) status.baseline();
      states[c][p][i] = (byte) h.state(param).ordinal();
    }
    // Release: the row's contents happen-before any read of the new count.
    rows.setRelease(row + 1);
  }

  /** Rows written since the start (the newest row is {@code rowCount() − 1}). */
  public long rowCount() {
    return rows.getAcquire();
  }

  /** The oldest row a reader may read, given a row count it loaded. */
  public long oldestReadableRow(long rowCount) {
    return Math.max(0, rowCount - capacity + READ_SLACK_ROWS);
  }

  /** Stream time of a row's pulse onset, in s. */
  public double timeS(long row) {
    int slot = slot(row);
    return timeS[slot / CHUNK_ROWS][slot % CHUNK_ROWS];
  }

  public boolean accepted(long row) {
    int slot = slot(row);
    return accepted[slot / CHUNK_ROWS][slot % CHUNK_ROWS] != 0;
  }

  /** A row's value of a parameter, NaN when the mode has none or the fit failed. */
  public float value(long row, Parameter p) {
    int slot = slot(row);
    return values[slot / CHUNK_ROWS][p.ordinal()][slot % CHUNK_ROWS];
  }

  /** The baseline in force at a row, NaN while it is being learnt. */
  public float baseline(long row, Parameter p) {
    int slot = slot(row);
    return baselines[slot / CHUNK_ROWS][p.ordinal()][slot % CHUNK_ROWS];
  }

  /** Ordinal of a row's health state of a parameter ({@link HealthState#ordinal()}). */
  public int stateOrdinal(long row, Parameter p) {
    int slot = slot(row);
    return states[slot / CHUNK_ROWS][p.ordinal()][slot % CHUNK_ROWS];
  }

  public HealthState overall(long row) {
    int slot = slot(row);
    return STATES[overall[slot / CHUNK_ROWS][slot % CHUNK_ROWS]];
  }

  /** The storage slot (index in the ring) of a row. */
  int slot(long row) {
    return (int) (row % capacity);
  }

  // The chunk columns themselves, for readers in this package that walk a run of rows within one
  // chunk directly instead of locating every row again (TrendReduction over a day of rows).

  double[] timeChunk(int chunk) {
    return timeS[chunk];
  }

  byte[] acceptedChunk(int chunk) {
    return accepted[chunk];
  }

  float[] valueChunk(int chunk, Parameter p) {
    return values[chunk][p.ordinal()];
  }

  float[] baselineChunk(int chunk, Parameter p) {
    return baselines[chunk][p.ordinal()];
  }

  byte[] stateChunk(int chunk, Parameter p) {
    return states[chunk][p.ordinal()];
  }

  /**
   * The first row in {@code [from, to)} whose time is at least {@code tS} (binary search: onset
   * times only grow), or {@code to} when none.
   */
  public long firstRowAtOrAfter(double tS, long from, long to) {
    long lo = from;
    long hi = to;
    while (lo < hi) {
      long mid = (lo + hi) >>> 1;
      if (timeS(mid) < tS) {
        lo = mid + 1;
      } else {
        hi = mid;
      }
    }
    return lo;
  }
}
