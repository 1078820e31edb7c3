package tauwatch.checkout;

import java.util.List;
import tauwatch.fit.Parameter;

/**
 * What a rig checkout expects to read: each parameter's nominal value and tolerance, and the limits
 * the stream itself must keep.
 *
 * <p>Immutable.
 *
 * @param name short name, e.g. {@code model-circuit}
 * @param description one line for people
 * @param scenario the simulated twin to play when checking out against the simulator, or null
 * @param expected the parameters, in table order
 * @param maxNoiseRmsPa largest acceptable noise (fit residual rms), pA
 * @param sampleRateTolerancePercent how far the measured sample rate may stray from the nominal
 * @param maxDroppedFrames frames missing by sequence number that still pass
 * @param maxCorruptFrames corrupt frames that still pass
 * @param maxLostSamples samples lost to gaps and overruns that still pass
 */
public record CheckoutExpectation(
    String name,
    String description,
    String scenario,
    List<Expected> expected,
    double maxNoiseRmsPa,
    double sampleRateTolerancePercent,
    long maxDroppedFrames,
    long maxCorruptFrames,
    long maxLostSamples) {

  /** Tolerance used when the expectation is the simulator's own truth. */
  public static final double TRUTH_TOLERANCE_PERCENT = 5.0;

  /** τ is the least certain of the fitted quantities, so its tolerance is double. */
  public static final double TRUTH_TAU_TOLERANCE_PERCENT = 10.0;

  public CheckoutExpectation {
    expected = List.copyOf(expected);
  }

  /** One parameter's expected value. */
  public record Expected(Parameter parameter, double nominal, double tolerancePercent) {
    public Expected {
      if (!(tolerancePercent > 0)) {
        throw new IllegalArgumentException(
            parameter.key() + ": tolerance_percent must be > 0, got " + tolerancePercent);
      }
      if (!Double.isFinite(nominal)) {
        throw new IllegalArgumentException(parameter.key() + ": nominal must be finite");
      }
    }

    public double low() {
      return nominal - Math.abs(nominal) * tolerancePercent / 100;
    }

    public double high() {
      return nominal + Math.abs(nominal) * tolerancePercent / 100;
    }
  }
}
