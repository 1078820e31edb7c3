package tauwatch.record;

import java.io.Closeable;
import java.io.IOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import tauwatch.event.StreamClock;
import tauwatch.fit.Parameter;
import tauwatch.fit.PulseEstimate;
import tauwatch.health.HealthSnapshot;
import tauwatch.health.HealthState;
import tauwatch.health.ParameterStatus;

/**
 * Writes {@code params.csv}: one row per pulse estimate, accepted or rejected, flushed as written
 * so that a crash loses at most the row being written.
 *
 * <p>Single-threaded: called on the analysis thread only. Column contract in DESIGN.md; the columns
 * after {@code state} are extensions and may grow.
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
  private final Writer out;
  private final StreamClock clock;
  private final boolean sweepColumns;
  private long rows;

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

  /** Appends the row of one estimate with the health it left. */
  public void write(PulseEstimate e, HealthSnapshot health) throws IOException {
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
    out.flush();
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

  public long rows() {
    return rows;
  }

  public Path path() {
    return path;
  }

  @Override
  public void close() throws IOException {
    out.close();
  }
}
