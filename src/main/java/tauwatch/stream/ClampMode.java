package tauwatch.stream;

/**
 * The amplifier's clamp mode, which decides the units of the two channels.
 *
 * <p>In voltage clamp the command is in mV and the response in pA; in current clamp the command is
 * in pA and the response in mV.
 */
public enum ClampMode {
  VOLTAGE_CLAMP("VC", "mV", "pA"),
  CURRENT_CLAMP("CC", "pA", "mV");

  private final String code;
  private final String commandUnit;
  private final String responseUnit;

  ClampMode(String code, String commandUnit, String responseUnit) {
    this.code = code;
    this.commandUnit = commandUnit;
    this.responseUnit = responseUnit;
  }

  /** The short code written in logs: {@code VC} or {@code CC}. */
  public String code() {
    return code;
  }

  public String commandUnit() {
    return commandUnit;
  }

  public String responseUnit() {
    return responseUnit;
  }
}
