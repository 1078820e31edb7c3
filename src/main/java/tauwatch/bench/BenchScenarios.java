package tauwatch.bench;

import java.util.LinkedHashMap;
import java.util.Map;
import tauwatch.sim.Scenario;
import tauwatch.sim.ScenarioLoader;

/**
 * The shipped simulator scenarios with their sample rate or pulse timing changed for a benchmark
 * ({@link ScenarioLoader#loadBuiltIn(String, Map)}).
 *
 * <p>Stateless.
 */
final class BenchScenarios {
  private BenchScenarios() {}

  /** {@code name} at {@code rateHz}; {@code periodMs}/{@code stepMs} ≤ 0 keep the scenario's. */
  static Scenario load(String name, double rateHz, double periodMs, double stepMs) {
    Map<String, Double> settings = new LinkedHashMap<>();
    settings.put("sample_rate_hz", rateHz);
    if (periodMs > 0) {
      settings.put("period_ms", periodMs);
    }
    if (stepMs > 0) {
      settings.put("step_width_ms", stepMs);
    }
    return ScenarioLoader.loadBuiltIn(name, settings);
  }
}
