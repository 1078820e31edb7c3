package tauwatch.monitor.live;

import java.nio.file.Path;
import tauwatch.fit.Parameter;
import tauwatch.health.HealthSnapshot;
import tauwatch.stream.StreamCounters;

/**
 * What the live view may ask of a running session: the user's actions and the session's live state.
 *
 * <p>Every method may be called from any thread (the view thread) and returns at once: requests
 * cross to the pipeline through atomics or the thread-safe event log.
 */
public interface SessionControl {
  /** Acknowledges the alarm on a parameter; the alarm stays in the event log. */
  void acknowledge(Parameter p);

  /** Sets the baseline from the latest accepted pulses, at the next pulse. */
  void requestBaselineNow();

  /** Writes a user's note to the event log. */
  void mark(String note);

  /** The health after the latest pulse or acknowledgement, or null before the session starts. */
  HealthSnapshot health();

  /** The stream's counters, or null before the session starts. */
  StreamCounters counters();

  /** The session folder, or null before it is created. */
  Path sessionDir();

  /** Whether the session still runs (logs are open). */
  boolean running();

  /** Asks the session to end; its logs close once it has drained. */
  void stop();
}
