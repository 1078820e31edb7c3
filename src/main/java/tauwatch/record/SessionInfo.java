package tauwatch.record;

import com.fasterxml.jackson.core.JsonGenerator;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.time.Instant;
import java.util.LinkedHashMap;
import java.util.Map;

/**
 * Writes {@code session.json}: what was recorded, with which configuration, device profile and
 * software, and whether the session finished.
 *
 * <p>Written at the start with status {@code running} and rewritten at the end, each time to a
 * temporary file moved into place, so the file is never half-written and a crashed session still
 * says {@code running}, not {@code complete}. Called from one thread at a time.
 */
public final class SessionInfo {
  private static final ObjectMapper JSON =
      new ObjectMapper()
          .enable(SerializationFeature.INDENT_OUTPUT)
          .enable(JsonGenerator.Feature.WRITE_BIGDECIMAL_AS_PLAIN);

  private final Path path;
  private final Map<String, Object> fields = new LinkedHashMap<>();

  public SessionInfo(Path path) {
    this.path = path;
  }

  /** The software version from the jar manifest, or {@code dev} when run from classes. */
  public static String softwareVersion() {
    String v = SessionInfo.class.getPackage().getImplementationVersion();
    return v == null ? "dev" : v;
  }

  public SessionInfo put(String key, Object value) {
    fields.put(key, value);
    return this;
  }

  public void writeStarted(Instant start) throws IOException {
    fields.put("software", "tauwatch");
    fields.put("version", softwareVersion());
    fields.put("started", start.toString());
    fields.put("status", "running");
    write();
  }

  /** Rewrites the file with the final status ({@code complete} or {@code failed: reason}). */
  public void writeEnded(Instant end, String status) throws IOException {
    fields.put("ended", end.toString());
    fields.put("status", status);
    write();
  }

  public Path path() {
    return path;
  }

  private void write() throws IOException {
    Path tmp = path.resolveSibling(path.getFileName() + ".tmp");
    JSON.writeValue(tmp.toFile(), fields);
    Files.move(tmp, path, StandardCopyOption.REPLACE_EXISTING, StandardCopyOption.ATOMIC_MOVE);
  }
}
