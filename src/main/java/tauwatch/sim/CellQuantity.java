package tauwatch.sim;

/**
 * One scheduled property of the simulated cell, with the key that names it in scenario files.
 *
 * <p>Immutable. The ordinal indexes the value arrays of {@link ParameterSchedule}.
 */
public enum CellQuantity {
  ACCESS_MOHM("access_mohm"),
  MEMBRANE_MOHM("membrane_mohm"),
  CAPACITANCE_PF("capacitance_pf"),
  LEAK_REVERSAL_MV("leak_reversal_mv"),
  SEAL_GOHM("seal_gohm"),
  AXIAL_MOHM("axial_mohm"),
  DENDRITE_MOHM("dendrite_mohm"),
  DENDRITE_CAPACITANCE_PF("dendrite_capacitance_pf");

  /** Number of quantities, the length of a value array. */
  public static final int COUNT = values().length;

  private final String key;

  CellQuantity(String key) {
    this.key = key;
  }

  /** The key in a scenario file's {@code [cell]} and {@code [drift]} tables. */
  public String key() {
    return key;
  }

  /** The quantity with the given scenario-file key, or null when there is none. */
  public static CellQuantity ofKey(String key) {
    for (CellQuantity q : values()) {
      if (q.key.equals(key)) {
        return q;
      }
    }
    return null;
  }
}
