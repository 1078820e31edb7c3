package tauwatch.checkout;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.dataformat.toml.TomlMapper;
import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.List;
import java.util.Map;
import java.util.Set;
import tauwatch.fit.Parameter;
import tauwatch.sim.CellTruth;

/**
 * Reads checkout expectations ({@code simulator/checkout/NAME.toml}) and builds them from the
 * simulator's truth.
 *
 * <p>Stateless; set-up only. Every problem is an {@link IllegalArgumentException} with one line
 * naming the file and key.
 */
public final class CheckoutExpectationLoader {
  public static final String DEFAULT = "model-circuit";
  private static final List<String> BUILT_IN = List.of("model-circuit");
  private static final Set<String> TOP =
      Set.of("name", "description", "scenario", "expect", "stream");
  private static final Set<String> PARAM_KEYS = Set.of("nominal", "tolerance_percent");
  private static final Set<String> STREAM_KEYS =
      Set.of(
          "max_noise_rms_pa",
          "sample_rate_tolerance_percent",
          "max_dropped_frames",
          "max_corrupt_frames",
          "max_lost_samples");
  private static final TomlMapper TOML = new TomlMapper();

  private CheckoutExpectationLoader() {}

  public static CheckoutExpectation load(String nameOrPath) {
    if (BUILT_IN.contains(nameOrPath)) {
      String resource = "/tauwatch/simulator/checkout/" + nameOrPath + ".toml";
      try (InputStream in = CheckoutExpectationLoader.class.getResourceAsStream(resource)) {
        if (in == null) {
          throw new IllegalArgumentException(resource + ": missing from the jar");
        }
        return parse(
            "simulator/checkout/" + nameOrPath + ".toml",
            new String(in.readAllBytes(), StandardCharsets.UTF_8));
      } catch (IOException e) {
        throw new IllegalArgumentException(resource + ": cannot be read: " + e.getMessage());
      }
    }
    Path p = Path.of(nameOrPath);
    if (!Files.isRegularFile(p)) {
      throw new IllegalArgumentException(
          nameOrPath + ": no such checkout file or built-in expectation (built-in: model-circuit)");
    }
    try {
      return parse(p.toString(), Files.readString(p, StandardCharsets.UTF_8));
    } catch (IOException e) {
      throw new IllegalArgumentException(p + ": cannot be read: " + e.getMessage());
    }
  }

  public static CheckoutExpectation parse(String origin, String toml) {
    JsonNode root;
    try {
      root = TOML.readTree(toml);
    } catch (JsonProcessingException e) {
      throw new IllegalArgumentException(origin + ": not valid TOML: " + e.getOriginalMessage());
    }
    known(origin, root, TOP, "");
    List<CheckoutExpectation.Expected> expected = new ArrayList<>();
    JsonNode exp = root.path("expect");
    Iterator<Map.Entry<String, JsonNode>> it = exp.fields();
    while (it.hasNext()) {
      Map.Entry<String, JsonNode> e = it.next();
      Parameter p = Parameter.byKey(e.getKey());
      String key = "expect." + e.getKey();
      if (p == null) {
        throw new IllegalArgumentException(origin + ": unknown parameter '" + key + "'");
      }
      known(origin, e.getValue(), PARAM_KEYS, key + ".");
      try {
        expected.add(
            new CheckoutExpectation.Expected(
                p,
                number(origin, e.getValue(), key + ".nominal", Double.NaN),
                number(origin, e.getValue(), key + ".tolerance_percent", Double.NaN)));
      } catch (IllegalArgumentException bad) {
        throw new IllegalArgumentException(origin + ": expect." + bad.getMessage());
      }
    }
    if (expected.isEmpty()) {
      throw new IllegalArgumentException(origin + ": 'expect' needs at least one parameter table");
    }
    JsonNode s = root.path("stream");
    if (!s.isMissingNode()) {
      known(origin, s, STREAM_KEYS, "stream.");
    }
    return new CheckoutExpectation(
        root.path("name").asText(DEFAULT),
        root.path("description").asText(""),
        root.has("scenario") ? root.get("scenario").asText() : null,
        expected,
        number(origin, s, "stream.max_noise_rms_pa", 5.0),
        number(origin, s, "stream.sample_rate_tolerance_percent", 1.0),
        (long) number(origin, s, "stream.max_dropped_frames", 0),
        (long) number(origin, s, "stream.max_corrupt_frames", 0),
        (long) number(origin, s, "stream.max_lost_samples", 0));
  }

  /**
   * The simulator's truth at {@code timeS} as the expectation: Ra, Rin, Cm within {@value
   * CheckoutExpectation#TRUTH_TOLERANCE_PERCENT} %, τ within double that; stream limits from {@code
   * limits}.
   */
  public static CheckoutExpectation fromTruth(
      String scenario, CellTruth truth, CheckoutExpectation limits) {
    double tol = CheckoutExpectation.TRUTH_TOLERANCE_PERCENT;
    return new CheckoutExpectation(
        "truth of sim:" + scenario,
        "the simulated cell's own parameters",
        scenario,
        List.of(
            new CheckoutExpectation.Expected(Parameter.ACCESS_RESISTANCE, truth.accessMOhm(), tol),
            new CheckoutExpectation.Expected(Parameter.INPUT_RESISTANCE, truth.inputMOhm(), tol),
            new CheckoutExpectation.Expected(
                Parameter.MEMBRANE_CAPACITANCE, truth.capacitancePf(), tol),
            new CheckoutExpectation.Expected(
                Parameter.TIME_CONSTANT,
                truth.tauMs(),
                CheckoutExpectation.TRUTH_TAU_TOLERANCE_PERCENT)),
        limits.maxNoiseRmsPa(),
        limits.sampleRateTolerancePercent(),
        limits.maxDroppedFrames(),
        limits.maxCorruptFrames(),
        limits.maxLostSamples());
  }

  private static void known(String origin, JsonNode node, Set<String> allowed, String prefix) {
    if (!node.isObject()) {
      throw new IllegalArgumentException(origin + ": '" + prefix + "' must be a table");
    }
    Iterator<String> names = node.fieldNames();
    while (names.hasNext()) {
      String n = names.next();
      if (!allowed.contains(n)) {
        throw new IllegalArgumentException(origin + ": unknown key '" + prefix + n + "'");
      }
    }
  }

  private static double number(String origin, JsonNode table, String key, double fallback) {
    String leaf = key.substring(key.lastIndexOf('.') + 1);
    JsonNode v = table.get(leaf);
    if (v == null) {
      if (Double.isNaN(fallback)) {
        throw new IllegalArgumentException(origin + ": missing key '" + key + "'");
      }
      return fallback;
    }
    if (!v.isNumber()) {
      throw new IllegalArgumentException(origin + ": '" + key + "' must be a number, got " + v);
    }
    return v.asDouble();
  }
}
