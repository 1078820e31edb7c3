package tauwatch.event;

/**
 * One entry of the event log.
 *
 * <p>Immutable. Events are rare (state changes, gaps, marks), so creating one may allocate.
 *
 * @param wallMillis wall-clock time in ms since the epoch when the event was raised
 * @param streamTimeS stream time in seconds the event refers to, or NaN when it has none
 * @param kind what happened
 * @param detail a one-line, human-readable detail (no line breaks)
 */
public record MonitorEvent(long wallMillis, double streamTimeS, EventKind kind, String detail) {

  public MonitorEvent {
    detail = detail == null ? "" : detail.replace('\n', ' ').replace('\r', ' ');
  }
}
