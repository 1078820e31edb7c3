package tauwatch.sim;

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
import tauwatch.stream.ClampMode;

/**
 * Reads scenario files (TOML; the format is described in {@code simulator/README.md}) from the
 * built-in set on the class path ({@code /tauwatch/simulator/NAME.toml}) or from a file.
 *
 * <p>Stateless and thread-safe; allocates freely (set-up only). Every problem — bad syntax, an
 * unknown key, a missing key, a value of the wrong type or out of range — is a {@link
 * ScenarioException} with one line naming the file and the key.
 */
public final class ScenarioLoader {
  /** The scenario that {@code sim} without a name means. */
  public static final String DEFAULT_SCENARIO = "steady-cell";

  private static final List<String> BUILT_IN =
      List.of(
          "steady-cell",
          "ra-creep",
          "seal-failing",
          "sudden-reseal",
          "model-circuit",
          "dendritic-cell",
          "cc-steady-cell",
          "synaptic-cell");

  private static final Set<String> TOP_KEYS =
      Set.of(
          "name",
          "description",
          "duration_s",
          "seed",
          "protocol",
          "amplifier",
          "cell",
          "drift",
          "synaptic",
          "spikes");
  private static final Set<String> PROTOCOL_KEYS =
      Set.of(
          "mode",
          "holding_mv",
          "step_mv",
          "holding_pa",
          "step_pa",
          "step_width_ms",
          "period_ms",
          "first_onset_ms");
  private static final Set<String> SYNAPTIC_KEYS =
      Set.of("rate_hz", "amplitude_pa", "amplitude_spread", "rise_ms", "decay_ms");
  private static final Set<String> SPIKE_KEYS =
      Set.of("threshold_mv", "amplitude_mv", "width_ms", "refractory_ms");
  private static final Set<String> AMPLIFIER_KEYS =
      Set.of(
          "sample_rate_hz",
          "filter_cutoff_hz",
          "noise_rms_pa",
          "hum_amplitude_pa",
          "hum_frequency_hz",
          "adc_bits",
          "adc_range_pa",
          "noise_rms_mv",
          "hum_amplitude_mv",
          "adc_range_mv",
          "bridge_balance_mohm");

  private ScenarioLoader() {}

  /** Names of the scenarios shipped in the jar. */
  public static List<String> builtInNames() {
    return BUILT_IN;
  }

  /** A built-in scenario by name, or else a scenario file at that path. */
  public static Scenario load(String nameOrPath) {
    if (BUILT_IN.contains(nameOrPath)) {
      return loadBuiltIn(nameOrPath);
    }
    Path path = Path.of(nameOrPath);
    if (Files.isRegularFile(path)) {
      return loadFile(path);
    }
    throw new ScenarioException(
        nameOrPath
            + ": no such scenario file or built-in scenario (built-in: "
            + String.join(", ", BUILT_IN)
            + ")");
  }

  public static Scenario loadBuiltIn(String name) {
    return loadBuiltIn(name, Map.of());
  }

  /**
   * A built-in scenario with some of its numeric settings replaced, e.g. {@code sample_rate_hz}:
   * each {@code key = value} line of the scenario's text is rewritten before it is parsed, so every
   * check of the loader still applies (keys are unique across the shipped files' tables).
   */
  public static Scenario loadBuiltIn(String name, Map<String, Double> settings) {
    String resource = "/tauwatch/simulator/" + name + ".toml";
    try (InputStream in = ScenarioLoader.class.getResourceAsStream(resource)) {
      if (in == null) {
        throw new ScenarioException(
            name + ": unknown scenario (built-in: " + String.join(", ", BUILT_IN) + ")");
      }
      String text = new String(in.readAllBytes(), StandardCharsets.UTF_8);
      for (Map.Entry<String, Double> e : settings.entrySet()) {
        text =
            text.replaceAll(
                "(?m)^" + java.util.regex.Pattern.quote(e.getKey()) + "\\s*=.*$",
                e.getKey() + " = " + String.format(java.util.Locale.ROOT, "%s", e.getValue()));
      }
      return parse(resource, name, text);
    } catch (IOException e) {
      throw new ScenarioException(resource + ": cannot be read: " + e.getMessage());
    }
  }

  public static Scenario loadFile(Path path) {
    String text;
    try {
      text = Files.readString(path, StandardCharsets.UTF_8);
    } catch (IOException e) {
      throw new ScenarioException(path + ": cannot be read: " + e.getMessage());
    }
    String base = path.getFileName().toString();
    if (base.endsWith(".toml")) {
      base = base.substring(0, base.length() - ".toml".length());
    }
    return parse(path.toString(), base, text);
  }

  /**
   * Parses scenario text; {@code source} names it in errors, {@code defaultName} is used when the
   * file has no {@code name}.
   */
  public static Scenario parse(String source, String defaultName, String toml) {
    JsonNode root;
    try {
      root = new TomlMapper().readTree(toml);
    } catch (IOException e) {
      throw new ScenarioException(source + ": not valid TOML: " + firstLine(e.getMessage()));
    }
    Reader r = new Reader(source);
    r.onlyKeys(root, "", TOP_KEYS);
    String name = r.text(root, "", "name", defaultName);
    String description = r.text(root, "", "description", "");
    double durationS = r.number(root, "", "duration_s", 60, 1e-3, 1e7);
    long seed = (long) r.integer(root, "", "seed", 1, Long.MIN_VALUE, Long.MAX_VALUE);

    JsonNode p = r.table(root, "protocol", true);
    r.onlyKeys(p, "protocol.", PROTOCOL_KEYS);
    String modeText = r.text(p, "protocol.", "mode", "voltage-clamp");
    ClampMode mode;
    switch (modeText) {
      case "voltage-clamp" -> mode = ClampMode.VOLTAGE_CLAMP;
      case "current-clamp" -> mode = ClampMode.CURRENT_CLAMP;
      default ->
          throw r.error(
              "protocol.mode", "must be \"voltage-clamp\" or \"current-clamp\", got " + modeText);
    }
    boolean cc = mode == ClampMode.CURRENT_CLAMP;
    String unitKey = cc ? "_pa" : "_mv";
    String otherKey = cc ? "_mv" : "_pa";
    for (String k : new String[] {"holding", "step"}) {
      if (p.has(k + otherKey)) {
        throw r.error(
            "protocol." + k + otherKey,
            "does not belong to a " + modeText + " protocol (use " + k + unitKey + ")");
      }
    }
    double holding =
        cc
            ? r.number(p, "protocol.", "holding_pa", 0, -10_000, 10_000)
            : r.number(p, "protocol.", "holding_mv", Double.NaN, -200, 200);
    double step =
        cc
            ? r.number(p, "protocol.", "step_pa", Double.NaN, -10_000, 10_000)
            : r.number(p, "protocol.", "step_mv", Double.NaN, -200, 200);
    if (step == 0) {
      throw r.error("protocol.step" + unitKey, "must be non-zero");
    }
    double width = r.number(p, "protocol.", "step_width_ms", Double.NaN, 1e-3, 1e5);
    double period = r.number(p, "protocol.", "period_ms", Double.NaN, 1e-3, 1e6);
    if (!(period > width)) {
      throw r.error("protocol.period_ms", "must be longer than step_width_ms (" + width + ")");
    }
    double onset = r.number(p, "protocol.", "first_onset_ms", 10, 0, 1e6);
    TestPulseProtocol protocol = new TestPulseProtocol(holding, step, width, period, onset, mode);

    JsonNode a = r.table(root, "amplifier", false);
    r.onlyKeys(a, "amplifier.", AMPLIFIER_KEYS);
    double rate = r.number(a, "amplifier.", "sample_rate_hz", 50_000, 100, 1e7);
    double cutoff = r.number(a, "amplifier.", "filter_cutoff_hz", 10_000, 0, 1e7);
    // The amplifier's keys carry the response's unit: pA in voltage clamp, mV in current clamp.
    String respKey = otherKey;
    String wrongKey = unitKey;
    for (String k : new String[] {"noise_rms", "hum_amplitude", "adc_range"}) {
      if (a.has(k + wrongKey)) {
        throw r.error(
            "amplifier." + k + wrongKey,
            "does not belong to a " + modeText + " recording (use " + k + respKey + ")");
      }
    }
    if (!cc && a.has("bridge_balance_mohm")) {
      throw r.error("amplifier.bridge_balance_mohm", "applies to current clamp only");
    }
    double noise = r.number(a, "amplifier.", "noise_rms" + respKey, 0, 0, 1e5);
    double humAmp = r.number(a, "amplifier.", "hum_amplitude" + respKey, 0, 0, 1e5);
    double humHz = r.number(a, "amplifier.", "hum_frequency_hz", 50, 0, rate / 2 * 0.999);
    int bits = (int) r.integer(a, "amplifier.", "adc_bits", 0, 0, 32);
    if (bits == 1) {
      throw r.error("amplifier.adc_bits", "must be 0 (no quantisation) or 2..32, got 1");
    }
    double range = r.number(a, "amplifier.", "adc_range" + respKey, cc ? 500 : 2000, 1e-3, 1e9);
    double bridge = r.number(a, "amplifier.", "bridge_balance_mohm", 0, 0, 1e4);
    AmplifierSettings amplifier =
        new AmplifierSettings(rate, cutoff, noise, humAmp, humHz, bits, range, bridge);

    JsonNode synNode = r.table(root, "synaptic", false);
    r.onlyKeys(synNode, "synaptic.", SYNAPTIC_KEYS);
    SynapticActivity synaptic = SynapticActivity.NONE;
    if (synNode.size() > 0) {
      double synRate = r.number(synNode, "synaptic.", "rate_hz", Double.NaN, 0, 1e4);
      double synAmp = r.number(synNode, "synaptic.", "amplitude_pa", Double.NaN, -1e5, 1e5);
      double spread = r.number(synNode, "synaptic.", "amplitude_spread", 0.5, 0, 1);
      double rise = r.number(synNode, "synaptic.", "rise_ms", 0.3, 1e-3, 1e3);
      double decay = r.number(synNode, "synaptic.", "decay_ms", 3, 1e-3, 1e4);
      if (!(decay > rise)) {
        throw r.error("synaptic.decay_ms", "must be longer than rise_ms (" + rise + ")");
      }
      synaptic = new SynapticActivity(synRate, synAmp, spread, rise, decay);
    }
    JsonNode spikeNode = r.table(root, "spikes", false);
    r.onlyKeys(spikeNode, "spikes.", SPIKE_KEYS);
    SpikeWaveform spikes = SpikeWaveform.NONE;
    if (spikeNode.size() > 0) {
      if (!cc) {
        throw r.error("spikes", "applies to current clamp only");
      }
      spikes =
          new SpikeWaveform(
              r.number(spikeNode, "spikes.", "threshold_mv", Double.NaN, -200, 200),
              r.number(spikeNode, "spikes.", "amplitude_mv", 90, 0, 500),
              r.number(spikeNode, "spikes.", "width_ms", 1, 1e-2, 100),
              r.number(spikeNode, "spikes.", "refractory_ms", 5, 0, 1e4));
    }
    try {
      new TestPulseCommand(protocol, rate);
    } catch (IllegalArgumentException e) {
      throw r.error("protocol.step_width_ms", e.getMessage());
    }

    JsonNode cellNode = r.table(root, "cell", true);
    double[] start = new double[CellQuantity.COUNT];
    Set<String> cellKeys = new java.util.HashSet<>();
    for (CellQuantity q : CellQuantity.values()) {
      cellKeys.add(q.key());
    }
    r.onlyKeys(cellNode, "cell.", cellKeys);
    for (CellQuantity q : CellQuantity.values()) {
      start[q.ordinal()] = cellValue(r, cellNode, "cell.", q);
    }
    CellParameters startCell;
    try {
      startCell = CellParameters.of(start);
    } catch (IllegalArgumentException e) {
      throw r.error("cell", e.getMessage());
    }

    ParameterSchedule.Builder builder = ParameterSchedule.builder(startCell);
    JsonNode drift = r.table(root, "drift", false);
    r.onlyKeys(drift, "drift.", cellKeys);
    for (Iterator<Map.Entry<String, JsonNode>> it = drift.fields(); it.hasNext(); ) {
      Map.Entry<String, JsonNode> e = it.next();
      String key = "drift." + e.getKey();
      CellQuantity q = CellQuantity.ofKey(e.getKey());
      JsonNode knots = e.getValue();
      if (!knots.isArray() || knots.isEmpty()) {
        throw r.error(key, "must be a list of [time_s, value] pairs");
      }
      double[] t = new double[knots.size()];
      double[] v = new double[knots.size()];
      for (int i = 0; i < knots.size(); i++) {
        JsonNode k = knots.get(i);
        if (!k.isArray() || k.size() != 2 || !k.get(0).isNumber() || !isNumberOrInf(k.get(1))) {
          throw r.error(key, "knot " + (i + 1) + " must be a [time_s, value] pair of numbers");
        }
        t[i] = k.get(0).asDouble();
        v[i] = numberOrInf(k.get(1));
        checkRange(r, key, q, v[i]);
      }
      try {
        builder.knots(q, t, v);
      } catch (IllegalArgumentException ex) {
        // The builder's message starts with the quantity's key already.
        throw r.error("drift." + ex.getMessage(), "");
      }
    }
    ParameterSchedule schedule;
    try {
      schedule = builder.build();
    } catch (IllegalArgumentException e) {
      throw r.error("drift", e.getMessage());
    }
    return new Scenario(
        name, description, durationS, seed, protocol, amplifier, schedule, synaptic, spikes);
  }

  private static double cellValue(Reader r, JsonNode cell, String prefix, CellQuantity q) {
    String key = prefix + q.key();
    JsonNode v = cell.get(q.key());
    double value;
    switch (q) {
      case ACCESS_MOHM, MEMBRANE_MOHM, CAPACITANCE_PF -> {
        if (v == null) {
          throw r.error(key, "is required");
        }
        value = r.number(cell, prefix, q.key(), Double.NaN, -Double.MAX_VALUE, Double.MAX_VALUE);
      }
      case SEAL_GOHM -> {
        if (v == null) {
          return Double.POSITIVE_INFINITY;
        }
        if (!isNumberOrInf(v)) {
          throw r.error(key, "must be a number or inf, got " + v);
        }
        value = numberOrInf(v);
      }
      default -> {
        if (v == null) {
          return 0;
        }
        value = r.number(cell, prefix, q.key(), 0, -Double.MAX_VALUE, Double.MAX_VALUE);
      }
    }
    checkRange(r, key, q, value);
    return value;
  }

  /** Plausible ranges, wide enough for any cell or model circuit. */
  private static void checkRange(Reader r, String key, CellQuantity q, double value) {
    double lo;
    double hi;
    switch (q) {
      case ACCESS_MOHM -> {
        lo = 0.01;
        hi = 1000;
      }
      case MEMBRANE_MOHM, DENDRITE_MOHM -> {
        lo = 1;
        hi = 1e6;
      }
      case CAPACITANCE_PF -> {
        lo = 0.01;
        hi = 1e5;
      }
      case DENDRITE_CAPACITANCE_PF -> {
        lo = 0;
        hi = 1e5;
      }
      case AXIAL_MOHM -> {
        lo = 0;
        hi = 1e5;
      }
      case LEAK_REVERSAL_MV -> {
        lo = -200;
        hi = 200;
      }
      case SEAL_GOHM -> {
        if (value == Double.POSITIVE_INFINITY) {
          return;
        }
        lo = 1e-3;
        hi = 1e6;
      }
      default -> throw new IllegalStateException(q.toString());
    }
    if (!(value >= lo && value <= hi)) {
      throw r.error(key, "must be in [" + lo + ", " + hi + "], got " + value);
    }
  }

  private static boolean isNumberOrInf(JsonNode v) {
    return v.isNumber() || (v.isTextual() && v.asText().equals("inf"));
  }

  private static double numberOrInf(JsonNode v) {
    return v.isNumber() ? v.asDouble() : Double.POSITIVE_INFINITY;
  }

  private static String firstLine(String s) {
    if (s == null) {
      return "";
    }
    int nl = s.indexOf('\n');
    return (nl < 0 ? s : s.substring(0, nl)).trim();
  }

  /** Typed, range-checked access to one file's tree, with errors that name the key. */
  private static final class Reader {
    private final String source;

    Reader(String source) {
      this.source = source;
    }

    ScenarioException error(String key, String problem) {
      String p = firstLine(problem);
      return new ScenarioException(source + ": " + key + (p.isEmpty() ? "" : ": " + p));
    }

    void onlyKeys(JsonNode node, String prefix, Set<String> allowed) {
      List<String> unknown = new ArrayList<>();
      node.fieldNames()
          .forEachRemaining(
              k -> {
                if (!allowed.contains(k)) {
                  unknown.add(k);
                }
              });
      if (!unknown.isEmpty()) {
        throw error(
            prefix + unknown.get(0),
            "unknown key (allowed: " + String.join(", ", sorted(allowed)) + ")");
      }
    }

    JsonNode table(JsonNode root, String key, boolean required) {
      JsonNode t = root.get(key);
      if (t == null) {
        if (required) {
          throw error(key, "table [" + key + "] is required");
        }
        return com.fasterxml.jackson.databind.node.JsonNodeFactory.instance.objectNode();
      }
      if (!t.isObject()) {
        throw error(key, "must be a table [" + key + "]");
      }
      return t;
    }

    String text(JsonNode node, String prefix, String key, String fallback) {
      JsonNode v = node.get(key);
      if (v == null) {
        return fallback;
      }
      if (!v.isTextual()) {
        throw error(prefix + key, "must be a string");
      }
      return v.asText();
    }

    double number(JsonNode node, String prefix, String key, double fallback, double lo, double hi) {
      JsonNode v = node.get(key);
      if (v == null) {
        if (Double.isNaN(fallback)) {
          throw error(prefix + key, "is required");
        }
        return fallback;
      }
      if (!v.isNumber()) {
        throw error(prefix + key, "must be a number, got " + v);
      }
      double d = v.asDouble();
      if (!(d >= lo && d <= hi)) {
        throw error(prefix + key, "must be in [" + lo + ", " + hi + "], got " + d);
      }
      return d;
    }

    long integer(JsonNode node, String prefix, String key, long fallback, long lo, long hi) {
      JsonNode v = node.get(key);
      if (v == null) {
        return fallback;
      }
      if (!v.isIntegralNumber() || !v.canConvertToLong()) {
        throw error(prefix + key, "must be an integer, got " + v);
      }
      long l = v.asLong();
      if (l < lo || l > hi) {
        throw error(prefix + key, "must be in [" + lo + ", " + hi + "], got " + l);
      }
      return l;
    }

    private static List<String> sorted(Set<String> s) {
      List<String> l = new ArrayList<>(s);
      java.util.Collections.sort(l);
      return l;
    }
  }
}
