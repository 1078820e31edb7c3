package tauwatch.sim;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import org.apache.commons.math3.ode.FirstOrderDifferentialEquations;
import org.apache.commons.math3.ode.nonstiff.DormandPrince853Integrator;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/**
 * The simulator's exact zero-order-hold discretisation against an independent integration of the
 * same circuit by Commons Math's Dormand–Prince 8(5,3) integrator (tight tolerances), sample by
 * sample with the command held constant over each interval. The circuit is written here again from
 * its equations in SI units; the filter is SciPy's Bessel design (coefficients from the fixture
 * header, controllable canonical form), so neither shares code with the simulator.
 */
class DiscretisationAgainstOdeTest {
  private static final double FS = 50_000;

  @ParameterizedTest(name = "dendrite={0}, filter={1}, seal={2} GΩ")
  @CsvSource({
    "false, false, inf",
    "false, true, inf",
    "false, true, 2.0",
    "true, false, inf",
    "true, true, 5.0"
  })
  void simulatorMatchesOdeIntegrationToOnePartPerMillion(
      boolean dendrite, boolean filter, String seal) throws IOException {
    double sealGOhm = seal.equals("inf") ? Double.POSITIVE_INFINITY : Double.parseDouble(seal);
    CellParameters cell = new CellParameters(10, 300, 30, -65, sealGOhm, 0, 0, 0);
    if (dendrite) {
      cell = cell.withDendrite(50, 600, 20);
    }
    TestPulseProtocol protocol = new TestPulseProtocol(-70, -5, 2, 5, 1);
    double fc = filter ? 10_000 : 0;
    Scenario scenario =
        new Scenario(
            "ode-check",
            "",
            1,
            1,
            protocol,
            new AmplifierSettings(FS, fc, 0, 0, 0, 0, 0),
            ParameterSchedule.constant(cell));
    int count = 1000;
    double[] cmd = new double[count];
    double[] sim = new double[count];
    new SimulatedRecording(scenario, 1).fill(cmd, sim, 0, count);

    double[] ode = integrate(cell, filter ? readScipyCoefficients() : null, cmd, protocol);
    double min = Double.MAX_VALUE;
    double max = -Double.MAX_VALUE;
    double worst = 0;
    for (int k = 0; k < count; k++) {
      min = Math.min(min, ode[k]);
      max = Math.max(max, ode[k]);
      worst = Math.max(worst, Math.abs(sim[k] - ode[k]));
    }
    double relative = worst / (max - min);
    System.out.printf(
        "ODE check dendrite=%s filter=%s seal=%s: max |sim-ode| = %.3g pA, relative %.3g%n",
        dendrite, filter, seal, worst, relative);
    assertTrue(relative < 1e-6, "relative difference " + relative);
  }

  /** Response in pA at each sample, by the interchange timing (sampled before the new command). */
  private static double[] integrate(
      CellParameters cell, double[][] filterBa, double[] cmdMv, TestPulseProtocol protocol) {
    double ra = cell.accessMOhm() * 1e6;
    double rm = cell.membraneMOhm() * 1e6;
    double cm = cell.membraneCapacitancePf() * 1e-12;
    double el = cell.leakReversalMv() * 1e-3;
    double gs = cell.hasSealLeak() ? 1 / (cell.sealGOhm() * 1e9) : 0;
    boolean dend = cell.hasDendrite();
    double rx = cell.axialMOhm() * 1e6;
    double rd = cell.dendriteMOhm() * 1e6;
    double cd = cell.dendriteCapacitancePf() * 1e-12;
    // Filter b0/(s^4 + a1 s^3 + ... + a4) in time scaled by ω = 2π fc to keep the states O(input).
    double omega = 2 * Math.PI * 10_000;
    double[] alpha = new double[5];
    double beta = 0;
    if (filterBa != null) {
      for (int k = 1; k <= 4; k++) {
        alpha[k] = filterBa[1][k] / Math.pow(omega, k);
      }
      beta = filterBa[0][filterBa[0].length - 1] / Math.pow(omega, 4);
    }
    int nodes = dend ? 2 : 1;
    int dim = nodes + (filterBa != null ? 4 : 0);
    double[] vp = new double[1];
    double[] alphaF = alpha;
    FirstOrderDifferentialEquations eq =
        new FirstOrderDifferentialEquations() {
          @Override
          public int getDimension() {
            return dim;
          }

          @Override
          public void computeDerivatives(double t, double[] y, double[] dy) {
            double vm = y[0];
            double vd = dend ? y[1] : 0;
            double iAccess = (vp[0] - vm) / ra;
            double iAxial = dend ? (vm - vd) / rx : 0;
            dy[0] = (iAccess - (vm - el) / rm - iAxial) / cm;
            if (dend) {
              dy[1] = (iAxial - (vd - el) / rd) / cd;
            }
            if (dim > nodes) {
              double im = iAccess + vp[0] * gs;
              int f = nodes;
              dy[f] = omega * y[f + 1];
              dy[f + 1] = omega * y[f + 2];
              dy[f + 2] = omega * y[f + 3];
              dy[f + 3] =
                  omega
                      * (-alphaF[4] * y[f]
                          - alphaF[3] * y[f + 1]
                          - alphaF[2] * y[f + 2]
                          - alphaF[1] * y[f + 3]
                          + im);
            }
          }
        };
    // Steady state at holding: node voltages from the resistive divider, filter at DC.
    double vh = protocol.holdingMv() * 1e-3;
    double[] y = new double[dim];
    if (dend) {
      // Solve the 2x2 DC node equations by Cramer's rule.
      double a00 = 1 / ra + 1 / rm + 1 / rx;
      double a01 = -1 / rx;
      double a11 = 1 / rx + 1 / rd;
      double r0 = vh / ra + el / rm;
      double r1 = el / rd;
      double det = a00 * a11 - a01 * a01;
      y[0] = (r0 * a11 - a01 * r1) / det;
      y[1] = (a00 * r1 - a01 * r0) / det;
    } else {
      y[0] = (vh / ra + el / rm) / (1 / ra + 1 / rm);
    }
    if (dim > nodes) {
      double im = (vh - y[0]) / ra + vh * gs;
      y[nodes] = im / alpha[4]; // DC: alpha4 z1 = u, output beta z1 = im (beta = alpha4)
    }
    DormandPrince853Integrator integrator =
        new DormandPrince853Integrator(1e-14, 1e-5, absTol(dim, nodes), relTol(dim));
    double h = 1 / FS;
    double[] out = new double[cmdMv.length];
    double prev = vh;
    for (int k = 0; k < cmdMv.length; k++) {
      double current;
      if (dim > nodes) {
        current = beta * y[nodes];
      } else {
        current = (prev - y[0]) / ra + prev * gs;
      }
      out[k] = current * 1e12;
      vp[0] = cmdMv[k] * 1e-3;
      integrator.integrate(eq, k * h, y, (k + 1) * h, y);
      prev = vp[0];
    }
    return out;
  }

  private static double[] absTol(int dim, int nodes) {
    double[] t = new double[dim];
    for (int i = 0; i < dim; i++) {
      t[i] = i < nodes ? 1e-15 : 1e-24; // volts; amperes for the filter states
    }
    return t;
  }

  private static double[] relTol(int dim) {
    double[] t = new double[dim];
    java.util.Arrays.fill(t, 1e-12);
    return t;
  }

  /** {b, a} of scipy.signal.bessel(4, 2π·10 kHz, analog=True, norm='mag') from the fixture. */
  static double[][] readScipyCoefficients() throws IOException {
    try (InputStream in =
        DiscretisationAgainstOdeTest.class.getResourceAsStream(
            "/fixtures/scipy/bessel4_fc10000_fs50000.csv")) {
      String text = new String(in.readAllBytes(), StandardCharsets.UTF_8);
      double[] b = null;
      double[] a = null;
      for (String line : text.split("\n")) {
        if (line.startsWith("# b = ")) {
          b = parse(line.substring(6));
        } else if (line.startsWith("# a = ")) {
          a = parse(line.substring(6));
        }
      }
      return new double[][] {b, a};
    }
  }

  private static double[] parse(String s) {
    String[] parts = s.trim().split("\\s+");
    double[] v = new double[parts.length];
    for (int i = 0; i < parts.length; i++) {
      v[i] = Double.parseDouble(parts[i]);
    }
    return v;
  }
}
