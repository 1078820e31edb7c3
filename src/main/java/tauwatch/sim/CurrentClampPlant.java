package tauwatch.sim;

import java.util.Arrays;

/**
 * The cell under current clamp (bridge mode) together with the amplifier's output filter, as one
 * continuous-time linear system.
 *
 * <p>States: the cell's nodes ({@link CellCircuit}), then the 4 filter states when a filter is
 * present. Inputs as in {@link ClampPlant}: the command is the injected current I (pA); the noise
 * input is a voltage (mV) at the filter's input. Output: the recorded voltage (mV)
 *
 * <pre>
 *   Vp   = α·(Vm + I·Ra),  α = Rseal/(Ra + Rseal)  (1 for a perfect seal)
 *   Vrec = Vp − I·Rbridge
 * </pre>
 *
 * — the pipette potential, which carries the electrode's I·Ra drop (the bridge error), less the
 * amplifier's bridge balance. The current reaching the soma is (Vp − Vm)/Ra = α·I + (α − 1)·Vm/Ra;
 * the rest leaks through the seal to the bath. Units mV, pA, GΩ, pF, ms. Single-threaded; {@link
 * #build} allocates nothing.
 */
public final class CurrentClampPlant implements ClampPlant {
  private final CellCircuit cell;
  private final BesselFilter filter;
  private final int states;
  private final double bridgeGOhm;

  /**
   * A plant; {@code filter} may be null for an unfiltered output; {@code bridgeBalanceMOhm} is the
   * amplifier's bridge balance (0 = unbalanced).
   */
  public CurrentClampPlant(boolean dendrite, BesselFilter filter, double bridgeBalanceMOhm) {
    this.cell = new CellCircuit(dendrite);
    this.filter = filter;
    this.states = cell.nodes() + (filter == null ? 0 : BesselFilter.ORDER);
    this.bridgeGOhm = bridgeBalanceMOhm / 1000.0;
  }

  @Override
  public int states() {
    return states;
  }

  @Override
  public boolean filtered() {
    return filter != null;
  }

  @Override
  public void build(double[] values, double[] a, double[] b, double[] c, double[] d) {
    Arrays.fill(a, 0, states * states, 0.0);
    Arrays.fill(b, 0, states * INPUTS, 0.0);
    Arrays.fill(c, 0, states, 0.0);
    Arrays.fill(d, 0, INPUTS, 0.0);
    cell.addNodeEquations(values, a, states, b, INPUTS, IN_LEAK);
    double ra = values[CellQuantity.ACCESS_MOHM.ordinal()] / 1000.0; // GΩ
    double rs = values[CellQuantity.SEAL_GOHM.ordinal()];
    double alpha = Double.isInfinite(rs) ? 1.0 : rs / (ra + rs);
    double cm = values[CellQuantity.CAPACITANCE_PF.ordinal()];
    int soma = CellCircuit.SOMA;
    a[soma * states + soma] += (alpha - 1) / (ra * cm);
    b[soma * INPUTS + IN_COMMAND] += alpha / cm;
    b[soma * INPUTS + IN_SYNAPTIC] += 1 / cm;
    double vFromVm = alpha;
    double vFromI = alpha * ra - bridgeGOhm;
    if (filter == null) {
      c[soma] = vFromVm;
      d[IN_COMMAND] = vFromI;
      d[IN_NOISE] = 1.0;
      return;
    }
    int f0 = cell.nodes();
    filter.copyA(a, states, f0, f0);
    for (int i = 0; i < BesselFilter.ORDER; i++) {
      double g = filter.inputGain(i);
      a[(f0 + i) * states + soma] += g * vFromVm;
      b[(f0 + i) * INPUTS + IN_COMMAND] += g * vFromI;
      b[(f0 + i) * INPUTS + IN_NOISE] += g;
      c[f0 + i] = filter.outputGain(i);
    }
  }
}
