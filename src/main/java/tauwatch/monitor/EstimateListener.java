package tauwatch.monitor;

import tauwatch.fit.PulseEstimate;
import tauwatch.health.HealthSnapshot;
import tauwatch.pulse.PulseWindow;

/**
 * Told of every pulse estimate and the health it left, after it is logged.
 *
 * <p>Called on the analysis thread; must return quickly and must not block (hand work to another
 * thread through an immutable object if needed).
 */
@FunctionalInterface
public interface EstimateListener {
  void onEstimate(PulseEstimate estimate, HealthSnapshot health);

  /**
   * Told of every estimate together with the pulse it came from; by default forwards to {@link
   * #onEstimate(PulseEstimate, HealthSnapshot)}. The window is a reused buffer, valid only during
   * the call: a listener that keeps samples (the live view's trace) copies them.
   */
  default void onPulseEstimate(PulseWindow window, PulseEstimate estimate, HealthSnapshot health) {
    onEstimate(estimate, health);
  }

  /**
   * A fresh instance of this listener's class, connected to nothing, for the analysis warm-up
   * ({@link AnalysisWarmUp}) to drive with simulated pulses so that this listener's per-pulse code
   * is compiled before the first real pulse too; null (the default) when there is nothing worth
   * warming or no copy without side effects.
   */
  default EstimateListener warmUpTwin() {
    return null;
  }
}
