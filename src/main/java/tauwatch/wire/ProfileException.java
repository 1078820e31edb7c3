package tauwatch.wire;

/** A device profile that cannot be used; the message is one line naming the file and key. */
public final class ProfileException extends Exception {
  private static final long serialVersionUID = 1L;

  public ProfileException(String message) {
    super(message);
  }
}
