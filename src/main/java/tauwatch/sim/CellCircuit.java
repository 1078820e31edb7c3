package tauwatch.sim;

/**
 * The passive node equations of the cell alone — membrane leak to its reversal battery, membrane
 * capacitance and the soma–dendrite axial coupling — without the electrode.
 *
 * <p>The clamp wiring ({@link VoltageClampPlant}; a current-clamp wiring later) adds the access
 * path on top. Units: mV, pA, GΩ, pF, ms, so that C dV/dt = I with no factor. Stateless apart from
 * the node count; allocation-free.
 *
 * <p>Equations (nodes Vm and, with a dendrite, Vd):
 *
 * <pre>
 *   Cm dVm/dt = − (Vm − E_L)/Rm − (Vm − Vd)/Rax   [+ the electrode's current]
 *   Cd dVd/dt =   (Vm − Vd)/Rax − (Vd − E_L)/Rd
 * </pre>
 */
public final class CellCircuit {
  /** Index of the soma node in the state vector. */
  public static final int SOMA = 0;

  /** Index of the dendrite node in the state vector, when present. */
  public static final int DENDRITE = 1;

  private final int nodes;

  public CellCircuit(boolean dendrite) {
    this.nodes = dendrite ? 2 : 1;
  }

  public int nodes() {
    return nodes;
  }

  /**
   * Adds the node equations into rows/columns 0..nodes−1 of {@code a} (leading dimension {@code
   * lda}) and the leak battery's column {@code leakCol} of {@code b} (leading dimension {@code
   * ldb}). {@code values} is indexed by {@link CellQuantity#ordinal()} in the public units.
   */
  public void addNodeEquations(
      double[] values, double[] a, int lda, double[] b, int ldb, int leakCol) {
    double cm = values[CellQuantity.CAPACITANCE_PF.ordinal()];
    double gm = 1000.0 / values[CellQuantity.MEMBRANE_MOHM.ordinal()]; // 1/GΩ
    a[SOMA * lda + SOMA] -= gm / cm;
    b[SOMA * ldb + leakCol] += gm / cm;
    if (nodes == 2) {
      double cd = values[CellQuantity.DENDRITE_CAPACITANCE_PF.ordinal()];
      double gx = 1000.0 / values[CellQuantity.AXIAL_MOHM.ordinal()];
      double gd = 1000.0 / values[CellQuantity.DENDRITE_MOHM.ordinal()];
      a[SOMA * lda + SOMA] -= gx / cm;
      a[SOMA * lda + DENDRITE] += gx / cm;
      a[DENDRITE * lda + SOMA] += gx / cd;
      a[DENDRITE * lda + DENDRITE] -= (gx + gd) / cd;
      b[DENDRITE * ldb + leakCol] += gd / cd;
    }
  }
}
