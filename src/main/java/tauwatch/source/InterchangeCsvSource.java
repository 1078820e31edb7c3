package tauwatch.source;

import java.io.BufferedInputStream;
import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import tauwatch.stream.ClampMode;
import tauwatch.stream.SampleWriter;
import tauwatch.stream.StreamFormat;

/**
 * Replays an interchange CSV file: a header, then one row per sample.
 *
 * <p>Voltage clamp {@code t_s,cmd_mV,im_pA}, current clamp {@code t_s,cmd_pA,vm_mV}; the header
 * decides the mode. The sample interval is read from the first two rows and every later row must
 * keep it; a missing stretch of rows (a jump by a whole number of intervals) is passed on as a gap,
 * anything else is an error naming the file and line. Not live: the replay runs as fast as the
 * analysis takes the samples. {@link #run} runs on the source thread and allocates nothing per row.
 */
public final class InterchangeCsvSource implements SampleSource {
  private static final String VC_HEADER = "t_s,cmd_mV,im_pA";
  private static final String CC_HEADER = "t_s,cmd_pA,vm_mV";

  /** Rows may jitter by this share of an interval (rounded time stamps) and still be on time. */
  private static final double TIMING_TOLERANCE = 0.05;

  private final Path file;
  private final StreamFormat format;
  private final double firstT;
  private final double intervalS;
  private volatile boolean stopped;

  /**
   * Opens the file far enough to learn its mode and sample rate.
   *
   * @param filterCutoffHz the amplifier filter the recording went through, 0 if none or unknown
   */
  public InterchangeCsvSource(Path file, double filterCutoffHz) throws IOException {
    this.file = file;
    try (InputStream in = open(file)) {
      CsvRowReader r = new CsvRowReader(in, file.toString());
      ClampMode mode = modeOf(r);
      double[] row = new double[3];
      if (!r.readRow(row)) {
        throw r.error("no samples after the header");
      }
      double t0 = row[0];
      if (!r.readRow(row)) {
        throw r.error("only one sample; the sample rate needs at least two");
      }
      double dt = row[0] - t0;
      if (!(dt > 0)) {
        throw r.error("t_s must increase (got " + t0 + " then " + row[0] + ")");
      }
      this.firstT = t0;
      this.intervalS = dt;
      this.format = new StreamFormat(1.0 / dt, mode, filterCutoffHz, t0, "file:" + file);
    }
  }

  private static InputStream open(Path file) throws IOException {
    try {
      return new BufferedInputStream(Files.newInputStream(file), 1 << 16);
    } catch (NoSuchFileException e) {
      throw new SourceException(file + ": no such file");
    }
  }

  private static ClampMode modeOf(CsvRowReader r) throws IOException {
    String header = r.readTextLine();
    if (header == null) {
      throw new SourceException(r.error("empty file; expected the header").getMessage());
    }
    String h = header.replace(" ", "").replace("\uFEFF", "");
    if (h.equalsIgnoreCase(VC_HEADER)) {
      return ClampMode.VOLTAGE_CLAMP;
    }
    if (h.equalsIgnoreCase(CC_HEADER)) {
      return ClampMode.CURRENT_CLAMP;
    }
    throw r.error(
        "header must be '"
            + VC_HEADER
            + "' (voltage clamp) or '"
            + CC_HEADER
            + "' (current clamp), got '"
            + header
            + "'");
  }

  @Override
  public StreamFormat format() {
    return format;
  }

  @Override
  public String name() {
    return "file:" + file.getFileName();
  }

  @Override
  public boolean live() {
    return false;
  }

  @Override
  public void run(SampleWriter writer, long maxSamples) throws IOException {
    try (InputStream in = open(file)) {
      CsvRowReader r = new CsvRowReader(in, file.toString());
      modeOf(r);
      double[] row = new double[3];
      long expectedIndex = 0;
      long written = 0;
      while (!stopped && written < maxSamples && r.readRow(row)) {
        double steps = (row[0] - firstT) / intervalS;
        long index = Math.round(steps);
        if (Math.abs(steps - index) > TIMING_TOLERANCE || index < expectedIndex) {
          throw r.error(
              String.format(
                  "t_s %s is off the sample clock (interval %.6g s from the first rows)",
                  row[0], intervalS));
        }
        if (index > expectedIndex) {
          writer.gap(index - expectedIndex);
        }
        writer.put(row[1], row[2]);
        expectedIndex = index + 1;
        written++;
      }
      writer.flush();
    }
  }

  @Override
  public void stop() {
    stopped = true;
  }
}
