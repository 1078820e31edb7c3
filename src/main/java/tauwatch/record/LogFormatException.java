package tauwatch.record;

import java.io.IOException;

/** A session log that cannot be read back; the message names the file and line. */
public final class LogFormatException extends IOException {
  private static final long serialVersionUID = 1L;

  public LogFormatException(String message) {
    super(message);
  }
}
