package tauwatch.sim;

/**
 * Discretises a continuous linear system x' = A x + B u exactly for inputs held constant over each
 * sample interval: x[k+1] = Ad x[k] + Bd u[k], with Ad = e^(A h) and Bd = ∫_0^h e^(A s) ds B.
 *
 * <p>Both come from one exponential of the augmented matrix [[A h, B h], [0, 0]] = [[Ad, Bd], [0,
 * I]] (Van Loan, "Computing integrals involving the matrix exponential", IEEE Trans. Autom. Control
 * 23:395, 1978 — from memory). Single-threaded; allocates only in the constructor.
 */
public final class ZeroOrderHold {
  private final int states;
  private final int inputs;
  private final int size;
  private final double[] augmented;
  private final double[] exponential;
  private final MatrixExponential expm;

  public ZeroOrderHold(int states, int inputs) {
    this.states = states;
    this.inputs = inputs;
    this.size = states + inputs;
    augmented = new double[size * size];
    exponential = new double[size * size];
    expm = new MatrixExponential(size);
  }

  /**
   * Fills {@code ad} (states × states, row-major) and {@code bd} (states × inputs, row-major) from
   * the continuous {@code a} and {@code b} of the same shapes, for the interval {@code h}.
   */
  public void discretise(double[] a, double[] b, double h, double[] ad, double[] bd) {
    java.util.Arrays.fill(augmented, 0.0);
    for (int r = 0; r < states; r++) {
      for (int c = 0; c < states; c++) {
        augmented[r * size + c] = a[r * states + c] * h;
      }
      for (int c = 0; c < inputs; c++) {
        augmented[r * size + states + c] = b[r * inputs + c] * h;
      }
    }
    expm.compute(augmented, exponential);
    for (int r = 0; r < states; r++) {
      System.arraycopy(exponential, r * size, ad, r * states, states);
      System.arraycopy(exponential, r * size + states, bd, r * inputs, inputs);
    }
  }
}
