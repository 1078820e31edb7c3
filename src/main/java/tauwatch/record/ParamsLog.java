package tauwatch.record;

import java.io.Closeable;
import java.io.IOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.concurrent.ArrayBlockingQueue;
import java.util.concurrent.BlockingQueue;
import java.util.concurrent.locks.LockSupport;
import tauwatch.event.StreamClock;
import tauwatch.fit.Parameter;
import tauwatch.fit.PulseEstimate;
import tauwatch.health.HealthSnapshot;
import tauwatch.health.HealthState;
import tauwatch.health.ParameterStatus;

/**
 * Writes {@code params.csv}: one row per pulse estimate, accepted or rejected, formatted and
 * written by a thread of its own and flushed as soon as no further row is waiting, so that a crash
 * loses at most the rows of the last few milliseconds ({@link #POLL_NANOS}).
 *
 * <p>{@link #write} is called on the analysis thread only; it hands the (immutable) estimate and
 * health snapshot over a bounded queue and returns. Why a thread: formatting a row and the write
 * system call cost more than the fit (150–800 µs per row measured live on the 2-core development
 * machine), and a disk that stalls — a network share, a busy USB drive — must not stall the
 * analysis and fill the sample ring. The queue holds {@link #QUEUE_ROWS} rows (minutes of pulses);
 * when it is full {@code write} waits, so no row is ever dropped. A write failure is reported by
 * the next {@code write} or by {@link #close}. Column contract in DESIGN.md; the columns after
 * {@code state} are extensions and may grow.
 */
public final class ParamsLog implements Closeable {
  /** Value columns in contract order, each with its unit suffix. */
  private static final Parameter[] VALUE_COLUMNS = {
    Parameter.ACCESS_RESISTANCE,
    Parameter.INPUT_RESISTANCE,
    Parameter.TOTAL_RESISTANCE,
    Parameter.MEMBRANE_CAPACITANCE,
    Parameter.TIME_CONSTANT,
    Parameter.HOLDING_CURRENT,
    Parameter.RESTING_POTENTIAL
  };

  /** Parameters whose standard error gets a column. */
  private static final Parameter[] ERROR_COLUMNS = {
    Parameter.ACCESS_RESISTANCE,
    Parameter.INPUT_RESISTANCE,
    Parameter.TOTAL_RESISTANCE,
    Parameter.MEMBRANE_CAPACITANCE,
    Parameter.TIME_CONSTANT,
    Parameter.HOLDING_CURRENT,
    Parameter.RESTING_POTENTIAL
  };

  /** The components of a two-exponential transient, with their standard errors. */
  private static final Parameter[] COMPONENT_COLUMNS = {
    Parameter.FAST_TIME_CONSTANT,
    Parameter.SLOW_TIME_CONSTANT,
    Parameter.FAST_AMPLITUDE,
    Parameter.SLOW_AMPLITUDE
  };

  private final Path path;

  /** How often the writer thread looks for rows: rows reach the file within about this long. */
  static final long POLL_NANOS = 2_000_000;

  /** Rows the hand-over queue holds before {@link #write} waits. */
  static final int QUEUE_ROWS = 4096;

  private final Writer out;
  private final StreamClock clock;
  private final boolean sweepColumns;
  private final BlockingQueue<Row> queue = new ArrayBlockingQueue<>(QUEUE_ROWS);
  private final Thread writer;
  private volatile long rows;
  private volatile IOException failure;
  private boolean failureReported;
  private boolean closed;

  /** One row to write; the end marker has a null estimate. */
  private record Row(PulseEstimate estimate, HealthSnapshot health) {}

  private static final Row END = new Row(null, null);

  public ParamsLog(Path path, StreamClock clock, boolean sweepColumns) throws IOException {
    this(path, Files.newBufferedWriter(path, StandardCharsets.UTF_8), clock, sweepColumns);
  }

  /**
   * Writes the rows to {@code out} instead of a file; {@code path} only names the log in messages
   * (the analysis warm-up writes its rows to {@link Writer#nullWriter()}).
   */
  public ParamsLog(Path path, Writer out, StreamClock clock, boolean sweepColumns)
      throws IOException {
    this.path = path;
    this.clock = clock;
    this.sweepColumns = sweepColumns;
    this.out = out;
    out.write(header(sweepColumns));
    out.write('\n');
    out.flush();
    writer = new Thread(this::drain, "tauwatch-params-log");
    writer.setDaemon(true);
    writer.start();
  }

  /** The header line (without line break). */
  public static String header(boolean sweepColumns) {
    StringBuilder sb = new StringBuilder("time_iso,t_s,pulse,mode");
    for (Parameter p : VALUE_COLUMNS) {
      sb.append(',').append(columnName(p));
    }
    sb.append(",accepted,state,cmq_pf");
    for (Parameter p : ERROR_COLUMNS) {
      sb.append(',').append(p.key()).append("_se_").append(unitSuffix(p));
    }
    sb.append(",step,rms_residual,model,alarms,reject_reason");
    for (Parameter p : COMPONENT_COLUMNS) {
      sb.append(',').append(columnName(p));
      sb.append(',').append(p.key()).append("_se_").append(unitSuffix(p));
    }
    sb.append(",note");
    if (sweepColumns) {
      sb.append(",sweep,sweep_t_s");
    }
    return sb.toString();
  }

  /** The contract's column name of a parameter, e.g. {@code ra_mohm}. */
  public static String columnName(Parameter p) {
    return p.key() + "_" + unitSuffix(p);
  }

  private static String unitSuffix(Parameter p) {
    switch (p.unit()) {
      case "MΩ":
        return "mohm";
      case "pF":
        return "pf";
      case "ms":
        return "ms";
      case "pA":
        return "pa";
      case "mV":
        return "mv";
      default:
        throw new IllegalArgumentException("no column unit for " + p.unit());
    }
  }

  /**
   * Queues the row of one estimate with the health it left; waits only when {@link #QUEUE_ROWS}
   * rows are already waiting.
   *
   * @throws IOException the first failure of an earlier row's write, once
   */
  public void write(PulseEstimate e, HealthSnapshot health) throws IOException {
    reportFailure();
    Row row = new Row(e, health);
    // The writer polls, so a hand-over with room is a lock and a store, never a wake-up call.
    if (queue.offer(row)) {
      return;
    }
    try {
      queue.put(row);
    } catch (InterruptedException ex) {
      Thread.currentThread().interrupt();
      throw new java.io.InterruptedIOException("interrupted while queueing a params row");
    }
  }

  /**
   * The writer thread: formats and writes rows in order, flushing whenever the queue runs empty,
   * and looks again every {@link #POLL_NANOS} (it is never signalled: a wake-up call would be a
   * system call on the analysis thread for every pulse).
   */
  private void drain() {
    boolean dirty = false;
    while (true) {
      Row r = queue.poll();
      if (r == null) {
        if (dirty && failure == null) {
          try {
            out.flush();
          } catch (IOException ex) {
            failure = ex;
          }
        }
        dirty = false;
        LockSupport.parkNanos(POLL_NANOS);
        continue;
      }
      if (r == END) {
        return;
      }
      if (failure == null) {
        try {
          writeRow(r.estimate(), r.health());
          dirty = true;
        } catch (IOException ex) {
          failure = ex; // later rows are taken and dropped: the analysis must never block on them
        }
      }
    }
  }

  private void reportFailure() throws IOException {
    IOException f = failure;
    if (f != null && !failureReported) {
      failureReported = true;
      throw f;
    }
  }

  private void writeRow(PulseEstimate e, HealthSnapshot health) throws IOException {
    StringBuilder sb = new StringBuilder(256);
    sb.append(clock.instant(e.onsetTimeS())).append(',');
    sb.append(CsvText.fixed(e.onsetTimeS(), 6)).append(',');
    sb.append(e.pulseNumber()).append(',');
    sb.append(e.mode().code());
    for (Parameter p : VALUE_COLUMNS) {
      sb.append(',').append(CsvText.number(e.value(p), 6));
    }
    sb.append(',').append(e.accepted() ? "true" : "false");
    sb.append(',').append(CsvText.text(health.overall().label()));
    sb.append(',').append(CsvText.number(e.value(Parameter.CHARGE_CAPACITANCE), 6));
    for (Parameter p : ERROR_COLUMNS) {
      sb.append(',').append(CsvText.number(e.standardError(p), 3));
    }
    sb.append(',').append(CsvText.number(e.stepAmplitude(), 6));
    sb.append(',').append(CsvText.number(e.rmsResidual(), 4));
    sb.append(',').append(CsvText.text(e.model()));
    sb.append(',').append(CsvText.text(alarms(health)));
    sb.append(',').append(CsvText.text(e.rejectReason()));
    for (Parameter p : COMPONENT_COLUMNS) {
      sb.append(',').append(CsvText.number(e.value(p), 6));
      sb.append(',').append(CsvText.number(e.standardError(p), 3));
    }
    sb.append(',').append(CsvText.text(e.note()));
    if (sweepColumns) {
      sb.append(',').append(e.sweepNumber() >= 0 ? Long.toString(e.sweepNumber()) : "");
      sb.append(',').append(CsvText.fixed(e.sweepTimeS(), 6));
    }
    sb.append('\n');
    out.write(sb.toString());
    rows++;
  }

  private static String alarms(HealthSnapshot h) {
    StringBuilder sb = new StringBuilder();
    for (ParameterStatus s : h.parameters().values()) {
      if (s.state() == HealthState.BREACH) {
        if (sb.length() > 0) {
          sb.append(';');
        }
        sb.append(s.parameter().key());
      }
    }
    return sb.toString();
  }

  public Path path() {
    return path;
  }

  /** Rows written so far (behind {@link #write} by the rows still queued). */
  public long rows() {
    return rows;
  }

  /** Writes every queued row, stops the writer thread and closes the file. */
  @Override
  public void close() throws IOException {
    if (closed) {
      return;
    }
    closed = true;
    boolean interrupted = false;
    while (true) {
      try {
        queue.put(END);
        writer.join();
        break;
      } catch (InterruptedException ex) {
        interrupted = true; // the rows must still reach the file
      }
    }
    if (interrupted) {
      Thread.currentThread().interrupt();
    }
    try {
      out.close();
    } finally {
      reportFailure();
    }
  }
}
