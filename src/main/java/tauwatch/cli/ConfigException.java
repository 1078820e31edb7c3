package tauwatch.cli;

/** A configuration that cannot be used; the message is one line naming the file and key. */
public final class ConfigException extends Exception {
  private static final long serialVersionUID = 1L;

  public ConfigException(String message) {
    super(message);
  }
}
