package tauwatch.sim;

/**
 * The electrical circuit of a whole-cell patch at one moment: access resistance in series with the
 * soma's membrane (resistance ∥ capacitance, leak reversal battery), a seal leak from the pipette
 * to the bath, and optionally a dendrite compartment coupled to the soma through an axial
 * resistance.
 *
 * <p>Immutable and validated on construction.
 *
 * @param accessMOhm access (series) resistance Ra between pipette and soma, MΩ
 * @param membraneMOhm soma membrane resistance Rm, MΩ
 * @param membraneCapacitancePf soma membrane capacitance Cm, pF
 * @param leakReversalMv reversal potential E_L of the membrane leak, mV
 * @param sealGOhm seal resistance from pipette to bath, GΩ; {@code Double.POSITIVE_INFINITY} for a
 *     perfect seal
 * @param axialMOhm axial resistance between soma and dendrite, MΩ (ignored without a dendrite)
 * @param dendriteMOhm dendrite membrane resistance, MΩ (ignored without a dendrite)
 * @param dendriteCapacitancePf dendrite membrane capacitance, pF; 0 when there is no dendrite
 */
public record CellParameters(
    double accessMOhm,
    double membraneMOhm,
    double membraneCapacitancePf,
    double leakReversalMv,
    double sealGOhm,
    double axialMOhm,
    double dendriteMOhm,
    double dendriteCapacitancePf) {

  public CellParameters {
    requirePositiveFinite("access resistance (MΩ)", accessMOhm);
    requirePositiveFinite("membrane resistance (MΩ)", membraneMOhm);
    requirePositiveFinite("membrane capacitance (pF)", membraneCapacitancePf);
    if (!Double.isFinite(leakReversalMv)) {
      throw new IllegalArgumentException(
          "leak reversal (mV) must be finite, got " + leakReversalMv);
    }
    if (!(sealGOhm > 0)) {
      throw new IllegalArgumentException(
          "seal resistance (GΩ) must be > 0 (infinite for a perfect seal), got " + sealGOhm);
    }
    if (!(dendriteCapacitancePf >= 0) || Double.isInfinite(dendriteCapacitancePf)) {
      throw new IllegalArgumentException(
          "dendrite capacitance (pF) must be >= 0 and finite, got " + dendriteCapacitancePf);
    }
    if (dendriteCapacitancePf > 0) {
      requirePositiveFinite("axial resistance (MΩ) of the dendrite", axialMOhm);
      requirePositiveFinite("dendrite membrane resistance (MΩ)", dendriteMOhm);
    }
  }

  /** A single isopotential soma with a perfect seal. */
  public static CellParameters soma(
      double accessMOhm, double membraneMOhm, double membraneCapacitancePf, double leakReversalMv) {
    return new CellParameters(
        accessMOhm,
        membraneMOhm,
        membraneCapacitancePf,
        leakReversalMv,
        Double.POSITIVE_INFINITY,
        0,
        0,
        0);
  }

  /** The cell built from a value array indexed by {@link CellQuantity#ordinal()}. */
  public static CellParameters of(double[] values) {
    return new CellParameters(
        values[CellQuantity.ACCESS_MOHM.ordinal()],
        values[CellQuantity.MEMBRANE_MOHM.ordinal()],
        values[CellQuantity.CAPACITANCE_PF.ordinal()],
        values[CellQuantity.LEAK_REVERSAL_MV.ordinal()],
        values[CellQuantity.SEAL_GOHM.ordinal()],
        values[CellQuantity.AXIAL_MOHM.ordinal()],
        values[CellQuantity.DENDRITE_MOHM.ordinal()],
        values[CellQuantity.DENDRITE_CAPACITANCE_PF.ordinal()]);
  }

  public boolean hasDendrite() {
    return dendriteCapacitancePf > 0;
  }

  public boolean hasSealLeak() {
    return sealGOhm != Double.POSITIVE_INFINITY;
  }

  public CellParameters withSealGOhm(double seal) {
    return new CellParameters(
        accessMOhm,
        membraneMOhm,
        membraneCapacitancePf,
        leakReversalMv,
        seal,
        axialMOhm,
        dendriteMOhm,
        dendriteCapacitancePf);
  }

  public CellParameters withDendrite(double axial, double dendriteR, double dendriteC) {
    return new CellParameters(
        accessMOhm,
        membraneMOhm,
        membraneCapacitancePf,
        leakReversalMv,
        sealGOhm,
        axial,
        dendriteR,
        dendriteC);
  }

  public double get(CellQuantity q) {
    return switch (q) {
      case ACCESS_MOHM -> accessMOhm;
      case MEMBRANE_MOHM -> membraneMOhm;
      case CAPACITANCE_PF -> membraneCapacitancePf;
      case LEAK_REVERSAL_MV -> leakReversalMv;
      case SEAL_GOHM -> sealGOhm;
      case AXIAL_MOHM -> axialMOhm;
      case DENDRITE_MOHM -> dendriteMOhm;
      case DENDRITE_CAPACITANCE_PF -> dendriteCapacitancePf;
    };
  }

  /** Writes the values into an array indexed by {@link CellQuantity#ordinal()}. */
  public void copyTo(double[] values) {
    for (CellQuantity q : CellQuantity.values()) {
      values[q.ordinal()] = get(q);
    }
  }

  private static void requirePositiveFinite(String what, double value) {
    if (!(value > 0) || Double.isInfinite(value)) {
      throw new IllegalArgumentException(what + " must be > 0 and finite, got " + value);
    }
  }
}
