package tauwatch.sim;

/**
 * A cell wired to the amplifier in one clamp mode, with the amplifier's output filter, as one
 * continuous-time linear system x' = A x + B u, y = C x + D u.
 *
 * <p>Every wiring has the same inputs: {@link #IN_COMMAND} the command (mV in voltage clamp, pA in
 * current clamp), {@link #IN_LEAK} the leak battery E_L (mV), {@link #IN_NOISE} a noise source in
 * the output's unit added at the filter's input, {@link #IN_SYNAPTIC} a synaptic current (pA,
 * positive = inward, into the soma). Implementations are single-threaded; {@link #build} allocates
 * nothing.
 */
public interface ClampPlant {
  int IN_COMMAND = 0;
  int IN_LEAK = 1;
  int IN_NOISE = 2;
  int IN_SYNAPTIC = 3;
  int INPUTS = 4;

  int states();

  boolean filtered();

  /**
   * Fills A (states×states), B (states×INPUTS), C (states) and D (INPUTS) for the cell values
   * indexed by {@link CellQuantity#ordinal()}.
   */
  void build(double[] values, double[] a, double[] b, double[] c, double[] d);
}
