package tauwatch.health;

/** The health of one parameter; {@link #label()} is the word shown and logged. */
public enum HealthState {
  /** Within its limits and not moving toward them. */
  STEADY("steady"),
  /**
   * Moving toward a limit: a sustained change from baseline was detected, or the value is past the
   * warning share of an allowed change or range.
   */
  DRIFTING("drifting"),
  /** A limit or the allowed change from baseline was crossed (debounced); raises an alarm. */
  BREACH("breach"),
  /** No estimates arrive: the signal is lost or the pulses stopped. */
  NO_SIGNAL("no signal");

  private final String label;

  HealthState(String label) {
    this.label = label;
  }

  public String label() {
    return label;
  }

  /** The more severe of two states, for the overall state of a pulse. */
  public static HealthState worse(HealthState a, HealthState b) {
    return a.severity() >= b.severity() ? a : b;
  }

  /** How bad the state is: a higher rank is worse ({@link #worse} keeps the higher). */
  public int severity() {
    switch (this) {
      case STEADY:
        return 0;
      case DRIFTING:
        return 1;
      case NO_SIGNAL:
        return 2;
      case BREACH:
        return 3;
      default:
        throw new AssertionError(this);
    }
  }
}
