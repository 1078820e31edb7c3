package tauwatch.monitor;

/**
 * What became of a user's mark: written to the event log, held until the session's log opens, or
 * refused because the session has ended.
 *
 * <p>Immutable (an enum).
 */
public enum MarkOutcome {
  /** Written to {@code events.csv}. */
  LOGGED,
  /** The log is not open yet; the mark is written as soon as it opens. */
  QUEUED,
  /** The session's log is closed; the mark was not written. */
  SESSION_ENDED
}
