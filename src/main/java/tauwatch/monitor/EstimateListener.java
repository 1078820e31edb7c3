package tauwatch.monitor;

import tauwatch.fit.PulseEstimate;
import tauwatch.health.HealthSnapshot;

/**
 * Told of every pulse estimate and the health it left, after it is logged.
 *
 * <p>Called on the analysis thread; must return quickly and must not block (hand work to another
 * thread through an immutable object if needed).
 */
@FunctionalInterface
public interface EstimateListener {
  void onEstimate(PulseEstimate estimate, HealthSnapshot health);
}
