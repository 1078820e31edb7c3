package tauwatch.event;

/** The kinds of entry in the event log; {@link #code()} is what {@code events.csv} carries. */
public enum EventKind {
  SESSION_START("session_start"),
  SESSION_END("session_end"),
  BASELINE_SET("baseline_set"),
  STATE_CHANGE("state_change"),
  ALARM("alarm"),
  ALARM_ACK("alarm_ack"),
  MARK("mark"),
  STEP_IGNORED("step_ignored"),
  GAP("gap"),
  OVERRUN("overrun"),
  RESYNC("resync"),
  SIGNAL_LOST("signal_lost"),
  SIGNAL_RESTORED("signal_restored"),
  LINK("link"),
  STREAM_MISMATCH("stream_mismatch"),
  SOURCE_ERROR("source_error"),
  ANALYSIS_ERROR("analysis_error");

  private final String code;

  EventKind(String code) {
    this.code = code;
  }

  public String code() {
    return code;
  }
}
