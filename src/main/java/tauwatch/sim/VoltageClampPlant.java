package tauwatch.sim;

import java.util.Arrays;

/**
 * The cell under ideal voltage clamp together with the amplifier's output filter, as one
 * continuous-time linear system x' = A x + B u, y = C x + D u.
 *
 * <p>States: the cell's nodes ({@link CellCircuit}), then the 4 filter states when a filter is
 * present. Inputs: {@link #IN_COMMAND} the pipette potential Vp (mV), {@link #IN_LEAK} the leak
 * battery E_L (mV), {@link #IN_NOISE} a current-noise source (pA) added to the filter's input,
 * {@link #IN_SYNAPTIC} a synaptic current into the soma (pA, inward positive). Output: the recorded
 * current (pA, outward positive)
 *
 * <pre>
 *   Im = (Vp − Vm)/Ra + Vp/Rseal
 * </pre>
 *
 * — or, with the filter, the filter's output driven by Im + noise. Without a filter the output has
 * the direct term D on Vp; with it D = 0. Single-threaded; {@link #build} allocates nothing.
 */
public final class VoltageClampPlant implements ClampPlant {

  private final CellCircuit cell;
  private final BesselFilter filter;
  private final int states;

  /** A plant; {@code filter} may be null for an unfiltered output. */
  public VoltageClampPlant(boolean dendrite, BesselFilter filter) {
    this.cell = new CellCircuit(dendrite);
    this.filter = filter;
    this.states = cell.nodes() + (filter == null ? 0 : BesselFilter.ORDER);
  }

  @Override
  public int states() {
    return states;
  }

  @Override
  public boolean filtered() {
    return filter != null;
  }

  /**
   * Fills A (states×states), B (states×INPUTS), C (states) and D (INPUTS) for the cell values
   * indexed by {@link CellQuantity#ordinal()}.
   */
  @Override
  public void build(double[] values, double[] a, double[] b, double[] c, double[] d) {
    Arrays.fill(a, 0, states * states, 0.0);
    Arrays.fill(b, 0, states * INPUTS, 0.0);
    Arrays.fill(c, 0, states, 0.0);
    Arrays.fill(d, 0, INPUTS, 0.0);
    cell.addNodeEquations(values, a, states, b, INPUTS, IN_LEAK);
    double ga = 1000.0 / values[CellQuantity.ACCESS_MOHM.ordinal()]; // 1/GΩ
    double gs = 1.0 / values[CellQuantity.SEAL_GOHM.ordinal()]; // 0 for a perfect seal
    double cm = values[CellQuantity.CAPACITANCE_PF.ordinal()];
    int soma = CellCircuit.SOMA;
    // The clamped pipette drives the soma through Ra.
    a[soma * states + soma] -= ga / cm;
    b[soma * INPUTS + IN_COMMAND] += ga / cm;
    b[soma * INPUTS + IN_SYNAPTIC] += 1 / cm;
    // Im = −ga·Vm + (ga + gs)·Vp.
    double imFromVm = -ga;
    double imFromVp = ga + gs;
    if (filter == null) {
      c[soma] = imFromVm;
      d[IN_COMMAND] = imFromVp;
      d[IN_NOISE] = 1.0;
      return;
    }
    int f0 = cell.nodes();
    filter.copyA(a, states, f0, f0);
    for (int i = 0; i < BesselFilter.ORDER; i++) {
      double g = filter.inputGain(i);
      a[(f0 + i) * states + soma] += g * imFromVm;
      b[(f0 + i) * INPUTS + IN_COMMAND] += g * imFromVp;
      b[(f0 + i) * INPUTS + IN_NOISE] += g;
      c[f0 + i] = filter.outputGain(i);
    }
  }
}
