package tauwatch.sim;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.SplittableRandom;
import org.apache.commons.math3.linear.EigenDecomposition;
import org.apache.commons.math3.linear.MatrixUtils;
import org.apache.commons.math3.linear.RealMatrix;
import org.apache.commons.math3.ode.FirstOrderDifferentialEquations;
import org.apache.commons.math3.ode.nonstiff.DormandPrince853Integrator;
import org.junit.jupiter.api.Test;

/** Reference: Apache Commons Math 3.6.1 (EigenDecomposition; DormandPrince853Integrator). */
class MatrixExponentialTest {

  @Test
  void symmetricMatricesMatchCommonsMathEigenDecomposition() {
    // exp(S) = V exp(D) Vᵀ for symmetric S (spectral theorem), computed by Commons Math.
    SplittableRandom rnd = new SplittableRandom(7);
    for (int n = 1; n <= 9; n++) {
      for (double scale : new double[] {0.01, 1, 30}) {
        double[] a = new double[n * n];
        for (int r = 0; r < n; r++) {
          for (int c = 0; c <= r; c++) {
            double v = scale * (rnd.nextDouble() - 0.5);
            a[r * n + c] = v;
            a[c * n + r] = v;
          }
        }
        RealMatrix m = MatrixUtils.createRealMatrix(n, n);
        for (int i = 0; i < n * n; i++) {
          m.setEntry(i / n, i % n, a[i]);
        }
        EigenDecomposition eig = new EigenDecomposition(m);
        RealMatrix d = eig.getD().copy();
        for (int i = 0; i < n; i++) {
          d.setEntry(i, i, Math.exp(d.getEntry(i, i)));
        }
        RealMatrix expected = eig.getV().multiply(d).multiply(eig.getVT());
        double[] out = new double[n * n];
        new MatrixExponential(n).compute(a, out);
        double norm = expected.getNorm();
        for (int i = 0; i < n * n; i++) {
          assertEquals(expected.getEntry(i / n, i % n), out[i], 1e-12 * norm, "n=" + n);
        }
      }
    }
  }

  @Test
  void theVoltageClampPlantMatrixMatchesAnOdeIntegrationOfTheIdentity() {
    // exp(A t) is the solution of X' = A X, X(0) = I; integrated by Commons Math Dormand-Prince
    // 8(5,3).
    double[] values = new double[CellQuantity.COUNT];
    new CellParameters(10, 300, 30, -65, 2.0, 50, 600, 20).copyTo(values);
    VoltageClampPlant plant = new VoltageClampPlant(true, new BesselFilter(10_000));
    int n = plant.states();
    double[] a = new double[n * n];
    plant.build(
        values, a, new double[n * ClampPlant.INPUTS], new double[n], new double[ClampPlant.INPUTS]);
    double h = 0.02; // ms, one sample at 50 kHz
    double[] ah = new double[n * n];
    for (int i = 0; i < n * n; i++) {
      ah[i] = a[i] * h;
    }
    double[] out = new double[n * n];
    new MatrixExponential(n).compute(ah, out);

    FirstOrderDifferentialEquations ode =
        new FirstOrderDifferentialEquations() {
          @Override
          public int getDimension() {
            return n * n;
          }

          @Override
          public void computeDerivatives(double t, double[] y, double[] dy) {
            for (int r = 0; r < n; r++) {
              for (int c = 0; c < n; c++) {
                double s = 0;
                for (int k = 0; k < n; k++) {
                  s += ah[r * n + k] * y[k * n + c];
                }
                dy[r * n + c] = s;
              }
            }
          }
        };
    double[] y = new double[n * n];
    for (int i = 0; i < n; i++) {
      y[i * n + i] = 1;
    }
    new DormandPrince853Integrator(1e-12, 1, 1e-14, 1e-13).integrate(ode, 0, y, 1, y);
    for (int i = 0; i < n * n; i++) {
      assertEquals(y[i], out[i], 1e-10, "entry " + i);
    }
  }
}
