package tauwatch.fit;

/**
 * The passive properties Tauwatch estimates from each test pulse.
 *
 * <p>{@link #key()} is the stem of the column names in {@code params.csv}.
 */
public enum Parameter {
  ACCESS_RESISTANCE("ra", "Ra", "MΩ", "access resistance"),
  INPUT_RESISTANCE("rin", "Rin", "MΩ", "input resistance"),
  TOTAL_RESISTANCE("rt", "Rt", "MΩ", "total resistance"),
  MEMBRANE_CAPACITANCE("cm", "Cm", "pF", "membrane capacitance"),
  CHARGE_CAPACITANCE("cmq", "Cm(Q)", "pF", "membrane capacitance from charge"),
  TIME_CONSTANT("tau", "tau", "ms", "time constant"),
  HOLDING_CURRENT("hold", "Ihold", "pA", "holding current"),
  RESTING_POTENTIAL("vrest", "Vrest", "mV", "resting potential"),
  FAST_TIME_CONSTANT("tau_fast", "tau1", "ms", "fast time constant of a two-exponential transient"),
  SLOW_TIME_CONSTANT("tau_slow", "tau2", "ms", "slow time constant of a two-exponential transient"),
  FAST_AMPLITUDE(
      "amp_fast", "A1", "pA", "onset amplitude of the fast component, per the step's sign"),
  SLOW_AMPLITUDE(
      "amp_slow", "A2", "pA", "onset amplitude of the slow component, per the step's sign");

  private final String key;
  private final String symbol;
  private final String unit;
  private final String description;

  Parameter(String key, String symbol, String unit, String description) {
    this.key = key;
    this.symbol = symbol;
    this.unit = unit;
    this.description = description;
  }

  public String key() {
    return key;
  }

  public String symbol() {
    return symbol;
  }

  public String unit() {
    return unit;
  }

  public String description() {
    return description;
  }

  /** Looks a parameter up by its {@link #key()}, or returns null. */
  public static Parameter byKey(String key) {
    for (Parameter p : values()) {
      if (p.key.equals(key)) {
        return p;
      }
    }
    return null;
  }
}
