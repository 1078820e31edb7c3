package tauwatch.cli;

import java.nio.file.Path;
import java.time.Duration;
import java.util.concurrent.atomic.AtomicReference;
import tauwatch.monitor.MonitorConfig;
import tauwatch.monitor.PulseEstimators;
import tauwatch.monitor.live.LiveSession;
import tauwatch.monitor.live.LiveSessionFactory;
import tauwatch.source.SampleSource;

/**
 * Starts the live view's sessions from a source URI and a device profile with the command line's
 * settings, through the same {@link SourceOpener} as {@code watch --source ... --profile ...}.
 *
 * <p>Called on the view thread (later sessions) and the command's thread (the first); returns once
 * the source is open, without waiting for data. Remembers the latest session for the shutdown hook.
 */
final class WindowSessions implements LiveSessionFactory {
  private final MonitorConfig config;
  private final boolean paced;
  private final Long seed;
  private final double filterHz;
  private final Path logDir;
  private final Duration duration;
  private final AtomicReference<LiveSession> current = new AtomicReference<>();

  WindowSessions(
      MonitorConfig config,
      boolean paced,
      Long seed,
      double filterHz,
      Path logDir,
      Duration duration) {
    this.config = config;
    this.paced = paced;
    this.seed = seed;
    this.filterHz = filterHz;
    this.logDir = logDir;
    this.duration = duration;
  }

  @Override
  public LiveSession start(String sourceUri, String profile) {
    try {
      // A profile describes a device stream; the simulator and files carry their own format.
      String p = isDevice(sourceUri) ? blankToNull(profile) : null;
      return startOn(SourceOpener.open(sourceUri, paced, seed, filterHz, p, null));
    } catch (UserInputException e) {
      throw new IllegalArgumentException(e.getMessage(), e);
    }
  }

  /** Starts a session on an opened source; its device profile goes into session.json. */
  LiveSession startOn(SourceOpener.Opened opened) throws UserInputException {
    SampleSource src = opened.source();
    try {
      LiveSession s =
          LiveSession.start(
              src,
              config,
              PulseEstimators.forFormat(src.format(), config),
              logDir,
              duration,
              m -> {
                if (opened.profile() != null) {
                  m.sessionField("device_profile", opened.profileField());
                }
              });
      current.set(s);
      return s;
    } catch (IllegalArgumentException e) {
      throw new UserInputException(src.name() + ": " + e.getMessage());
    }
  }

  /** The latest session started, or null. */
  LiveSession current() {
    return current.get();
  }

  static boolean isDevice(String uri) {
    String u = uri == null ? "" : uri.trim();
    return u.startsWith("tcp:") || u.startsWith("serial:");
  }

  private static String blankToNull(String s) {
    return s == null || s.isBlank() ? null : s.trim();
  }
}
