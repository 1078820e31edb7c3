package tauwatch.monitor.live;

/**
 * Opens a source and starts a {@link LiveSession} on it: how the view starts logging again or
 * switches source without knowing the command line's configuration.
 *
 * <p>Called on the view thread; implementations must return promptly (opening a file or a scenario,
 * not waiting for data).
 */
@FunctionalInterface
public interface LiveSessionFactory {
  /**
   * @param sourceUri a {@code --source} URI
   * @throws IllegalArgumentException with a one-line reason when the source cannot be opened
   */
  LiveSession start(String sourceUri);
}
