package tauwatch.monitor;

import java.nio.file.Path;

/**
 * What one monitoring session did, for the command line's summary and for tests.
 *
 * <p>Immutable.
 */
public record MonitorResult(
    Path sessionDir,
    long samples,
    long pulses,
    long accepted,
    long gaps,
    long overrunSamples,
    long eventRows,
    long analysisErrors,
    boolean drained,
    String status) {

  public boolean complete() {
    return "complete".equals(status);
  }
}
