package tauwatch.source;

import java.io.IOException;

/** Input a source cannot read on; the message is one line naming the file, line or field. */
public final class SourceException extends IOException {
  private static final long serialVersionUID = 1L;

  public SourceException(String message) {
    super(message);
  }
}
