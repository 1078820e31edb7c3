package tauwatch.record;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.time.ZoneId;
import java.time.format.DateTimeFormatter;

/**
 * Chooses and creates the folder of one session under the log directory.
 *
 * <p>Folders are named by start time and source, e.g. {@code 2026-12-01_193512_sim-steady-cell}, so
 * that they sort by time and say what they hold. Stateless.
 */
public final class SessionFolder {
  private static final DateTimeFormatter STAMP =
      DateTimeFormatter.ofPattern("yyyy-MM-dd_HHmmss").withZone(ZoneId.systemDefault());

  private SessionFolder() {}

  /** The default log directory: {@code ~/tauwatch-sessions}. */
  public static Path defaultLogDir() {
    return Path.of(System.getProperty("user.home"), "tauwatch-sessions");
  }

  /** Creates a new, empty session folder; never reuses an existing one. */
  public static Path create(Path logDir, Instant start, String sourceName) throws IOException {
    Files.createDirectories(logDir);
    String base = STAMP.format(start) + "_" + slug(sourceName);
    for (int i = 1; i < 1000; i++) {
      Path dir = logDir.resolve(i == 1 ? base : base + "-" + i);
      if (!Files.exists(dir)) {
        return Files.createDirectory(dir);
      }
    }
    throw new IOException("cannot create a new session folder under " + logDir);
  }

  static String slug(String s) {
    String t = s.replaceAll("[^A-Za-z0-9._-]+", "-").replaceAll("-+", "-");
    t = t.replaceAll("^-|-$", "");
    if (t.length() > 40) {
      t = t.substring(t.length() - 40);
    }
    return t.isEmpty() ? "session" : t;
  }
}
