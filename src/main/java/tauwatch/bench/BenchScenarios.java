package tauwatch.bench;

import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.util.Locale;
import tauwatch.sim.Scenario;
import tauwatch.sim.ScenarioLoader;

/**
 * The shipped simulator scenarios with their sample rate or pulse timing changed for a benchmark,
 * by rewriting the keys of the scenario's TOML text before it is parsed (so every check of the
 * loader still applies).
 *
 * <p>Stateless.
 */
final class BenchScenarios {
  private BenchScenarios() {}

  /** {@code name} at {@code rateHz}; {@code periodMs}/{@code stepMs} ≤ 0 keep the scenario's. */
  static Scenario load(String name, double rateHz, double periodMs, double stepMs) {
    String toml = text(name);
    toml = set(toml, "sample_rate_hz", rateHz);
    if (periodMs > 0) {
      toml = set(toml, "period_ms", periodMs);
    }
    if (stepMs > 0) {
      toml = set(toml, "step_width_ms", stepMs);
    }
    return ScenarioLoader.parse("bench:" + name, name, toml);
  }

  private static String set(String toml, String key, double value) {
    return toml.replaceAll(
        "(?m)^" + key + "\\s*=.*$", key + " = " + String.format(Locale.ROOT, "%.1f", value));
  }

  private static String text(String name) {
    String resource = "/tauwatch/simulator/" + name + ".toml";
    try (InputStream in = BenchScenarios.class.getResourceAsStream(resource)) {
      if (in == null) {
        throw new IllegalArgumentException("no built-in scenario " + name);
      }
      return new String(in.readAllBytes(), StandardCharsets.UTF_8);
    } catch (IOException e) {
      throw new UncheckedIOException(e);
    }
  }
}
