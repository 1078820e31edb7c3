package tauwatch.fit;

import tauwatch.pulse.PulseWindow;

/**
 * Turns one test-pulse window into an estimate of the cell's passive properties.
 *
 * <p>Called on the analysis thread once per pulse; may allocate modestly but must stay well under a
 * millisecond. Never throws for bad data: a pulse it cannot fit comes back rejected with a reason.
 */
public interface PulseEstimator {
  PulseEstimate estimate(PulseWindow window);
}
