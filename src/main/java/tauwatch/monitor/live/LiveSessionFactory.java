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
   * @param profile for {@code tcp://} and {@code serial:} sources, a device profile name or file
   *     ({@code --profile}); null or blank for the default; ignored for other sources
   * @throws IllegalArgumentException with a one-line reason when the source cannot be opened
   */
  LiveSession start(String sourceUri, String profile);
}
