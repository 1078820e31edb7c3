package tauwatch.pulse;

/**
 * Receives each completed test-pulse window.
 *
 * <p>Called on the analysis thread; the window is reused after the call returns.
 */
@FunctionalInterface
public interface PulseListener {
  void onPulse(PulseWindow window);
}
