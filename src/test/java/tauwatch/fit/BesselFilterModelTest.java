package tauwatch.fit;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.junit.jupiter.api.Test;

/** The filter facts the estimator relies on, against SciPy and Bessel filter theory. */
class BesselFilterModelTest {
  @Test
  void minus3dBFrequencyOfTheDelayNormalisedBesselMatchesScipy() {
    // SciPy 1.17.1: scipy.signal.bessel(4, 1, analog=True, norm='mag') has a = [1, 4.7306,
    // 10.0702, 11.1154, 5.2582]; its DC group delay a[3]/a[4] = 2.1139176749 is the frequency
    // scale between the 'delay' and 'mag' normalisations.
    assertEquals(2.1139176749, BesselFilterModel.OMEGA_3DB, 1e-9);
  }

  @Test
  void groupDelayAt10kHzIsAbout33point6Microseconds() {
    // CHECKS.md / Bessel filter theory: ≈ 0.336/f_c for a 4-pole Bessel.
    assertEquals(33.64e-6, new BesselFilterModel(10_000).groupDelayS(), 0.01e-6);
    assertEquals(0, new BesselFilterModel(0).groupDelayS());
  }

  @Test
  void slowestPoleRateIsARootOfTheBesselPolynomial() {
    // numpy.roots([1, 10, 45, 105, 105]) gives −2.1037894 ± 2.6574180j and −2.8962106 ± 0.8672341j.
    assertEquals(2.1037894, BesselFilterModel.SLOWEST_POLE_RATE, 1e-4);
  }

  @Test
  void tailCorrectionIsTheInverseFilterGainAtMinusOneOverTau() {
    // SciPy: b, a = bessel(4, 2π·10 kHz, analog=True, norm='mag'); polyval(b, s)/polyval(a, s)
    // at s = −1/(0.3 ms) is 1.1196823232.
    assertEquals(1 / 1.1196823232, new BesselFilterModel(10_000).tailCorrection(3e-4), 1e-9);
    // First-order, H(−1/τ) ≈ e^(delay/τ) (CHECKS.md).
    assertEquals(
        Math.exp(-33.64e-6 / 3e-4), new BesselFilterModel(10_000).tailCorrection(3e-4), 2e-3);
  }

  @Test
  void tailCorrectionDerivativeMatchesAFiniteDifference() {
    BesselFilterModel f = new BesselFilterModel(5_000);
    double tau = 2e-4;
    double h = 1e-9;
    double fd = (f.tailCorrection(tau + h) - f.tailCorrection(tau - h)) / (2 * h);
    assertEquals(fd, f.tailCorrectionDerivative(tau), 1e-6 * Math.abs(fd));
  }
}
