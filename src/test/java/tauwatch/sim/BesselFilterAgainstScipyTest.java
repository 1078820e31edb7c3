package tauwatch.sim;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/**
 * The simulator's output filter against SciPy: step responses of scipy.signal.bessel(4, 2π fc,
 * btype='low', analog=True, norm='mag') from scipy.signal.step, written by
 * src/test/python/scipy/bessel_fixture.py (SciPy 1.17.1, version in each fixture's header).
 */
class BesselFilterAgainstScipyTest {

  @ParameterizedTest(name = "fc={0} Hz, fs={1} Hz")
  @CsvSource({"10000, 50000", "2000, 20000", "5000, 100000"})
  void unitStepResponseMatchesScipy(int fc, int fs) throws IOException {
    List<double[]> rows = readFixture("/fixtures/scipy/bessel4_fc" + fc + "_fs" + fs + ".csv");
    double[] y = stepResponse(new BesselFilter(fc), 1000.0 / fs, rows.size());
    double worst = 0;
    for (int k = 0; k < rows.size(); k++) {
      worst = Math.max(worst, Math.abs(y[k] - rows.get(k)[1]));
    }
    System.out.printf("Bessel fc=%d fs=%d: max |sim - scipy| = %.3g (unit step)%n", fc, fs, worst);
    // Both are exact ZOH/expm solutions; 1e-9 of the step leaves room for SciPy's own rounding.
    assertEquals(0, worst, 1e-9);
  }

  @Test
  void lowFrequencyGroupDelayIsAbout0Point336OverCutoff() {
    // Bessel filter theory (CHECKS.md): 4-pole, −3 dB at fc, DC group delay ≈ 0.336/fc. For a
    // unit-DC-gain low-pass, the DC group delay is ∫(1 − step(t)) dt; measured on a fine grid.
    double fc = 10_000;
    double hMs = 1e-4; // 10 MHz grid, 100 points per 1/fc
    int n = 20_000;
    double[] y = stepResponse(new BesselFilter(fc), hMs, n);
    double area = 0;
    for (int k = 1; k < n; k++) {
      area += 0.5 * ((1 - y[k - 1]) + (1 - y[k])) * hMs;
    }
    double delayS = area / 1000;
    assertEquals(0.336 / fc, delayS, 0.001 / fc);
  }

  /** y_k at t_k = k h for a unit step applied at t_0, from the filter's exact discretisation. */
  static double[] stepResponse(BesselFilter filter, double hMs, int n) {
    int order = BesselFilter.ORDER;
    double[] a = new double[order * order];
    double[] b = new double[order];
    filter.copyA(a, order, 0, 0);
    for (int i = 0; i < order; i++) {
      b[i] = filter.inputGain(i);
    }
    double[] ad = new double[order * order];
    double[] bd = new double[order];
    new ZeroOrderHold(order, 1).discretise(a, b, hMs, ad, bd);
    double[] x = new double[order];
    double[] next = new double[order];
    double[] y = new double[n];
    for (int k = 0; k < n; k++) {
      double out = 0;
      for (int i = 0; i < order; i++) {
        out += filter.outputGain(i) * x[i];
      }
      y[k] = out;
      for (int r = 0; r < order; r++) {
        double s = bd[r];
        for (int c = 0; c < order; c++) {
          s += ad[r * order + c] * x[c];
        }
        next[r] = s;
      }
      System.arraycopy(next, 0, x, 0, order);
    }
    return y;
  }

  private static List<double[]> readFixture(String resource) throws IOException {
    try (InputStream in = BesselFilterAgainstScipyTest.class.getResourceAsStream(resource)) {
      List<double[]> rows = new ArrayList<>();
      boolean header = true;
      for (String line : new String(in.readAllBytes(), StandardCharsets.UTF_8).split("\n")) {
        if (line.startsWith("#") || line.isBlank()) {
          continue;
        }
        if (header) {
          header = false; // t_s,step
          continue;
        }
        String[] p = line.split(",");
        rows.add(new double[] {Double.parseDouble(p[0]), Double.parseDouble(p[1])});
      }
      return rows;
    }
  }
}
