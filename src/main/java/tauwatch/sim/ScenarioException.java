package tauwatch.sim;

/**
 * A scenario that cannot be loaded; the message is one line naming the file and the key.
 *
 * <p>Immutable.
 */
public final class ScenarioException extends RuntimeException {
  private static final long serialVersionUID = 1L;

  public ScenarioException(String message) {
    super(message);
  }
}
