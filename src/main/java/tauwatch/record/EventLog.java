package tauwatch.record;

import java.io.BufferedWriter;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import tauwatch.event.EventSink;
import tauwatch.event.MonitorEvent;

/**
 * Writes {@code events.csv}: {@code time_iso,t_s,kind,detail}, one row per event, flushed as
 * written.
 *
 * <p>Thread-safe: events come from the source, analysis and view threads; they are rare, so a lock
 * is fine. Listeners (the console, the view) are told of each event after it is written.
 */
public final class EventLog implements EventSink, AutoCloseable {
  public static final String HEADER = "time_iso,t_s,kind,detail";

  private final Path path;
  private final BufferedWriter out;
  private final List<EventSink> listeners = new ArrayList<>();
  private long rows;
  private IOException failure;

  public EventLog(Path path) throws IOException {
    this.path = path;
    this.out = Files.newBufferedWriter(path, StandardCharsets.UTF_8);
    out.write(HEADER);
    out.write('\n');
    out.flush();
  }

  /** Adds a listener told of every event after it is logged; call before events flow. */
  public synchronized void addListener(EventSink listener) {
    listeners.add(listener);
  }

  @Override
  public void onEvent(MonitorEvent e) {
    List<EventSink> toTell;
    synchronized (this) {
      if (failure == null) {
        try {
          out.write(Instant.ofEpochMilli(e.wallMillis()).toString());
          out.write(',');
          out.write(CsvText.fixed(e.streamTimeS(), 6));
          out.write(',');
          out.write(e.kind().code());
          out.write(',');
          out.write(CsvText.text(e.detail()));
          out.write('\n');
          out.flush();
          rows++;
        } catch (IOException ex) {
          failure = ex;
        }
      }
      toTell = List.copyOf(listeners);
    }
    for (EventSink l : toTell) {
      l.onEvent(e);
    }
  }

  public synchronized long rows() {
    return rows;
  }

  public Path path() {
    return path;
  }

  /** Throws if a write failed: a log that silently stopped would lose data. */
  public synchronized void checkHealthy() {
    if (failure != null) {
      throw new UncheckedIOException("cannot write " + path + ": " + failure.getMessage(), failure);
    }
  }

  @Override
  public synchronized void close() throws IOException {
    out.close();
  }
}
