package tauwatch.cli;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import com.fasterxml.jackson.dataformat.toml.TomlMapper;
import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.EnumMap;
import java.util.Iterator;
import java.util.Map;
import java.util.Set;
import tauwatch.fit.EstimatorOptions;
import tauwatch.fit.FilterCompensation;
import tauwatch.fit.Parameter;
import tauwatch.health.DriftDetection;
import tauwatch.health.HealthCriteria;
import tauwatch.health.OutlierScreening;
import tauwatch.health.ParameterLimits;
import tauwatch.monitor.MonitorConfig;
import tauwatch.pulse.PulseSchedule;
import tauwatch.pulse.SegmenterOptions;

/**
 * Loads the monitor configuration: the shipped defaults ({@code config/tauwatch.toml}, inside the
 * jar) overlaid by the user's file.
 *
 * <p>The defaults file is the schema: a user key it does not have is an error, as is a value of the
 * wrong type or out of range, each reported in one line naming the file and the key. The one
 * exception is {@code [limits.X]}, where X may be any parameter key and a user's table replaces the
 * default table of that parameter whole. Called once at start-up.
 */
public final class ConfigLoader {
  static final String DEFAULTS_RESOURCE = "/tauwatch/config/tauwatch.toml";
  private static final Set<String> LIMIT_KEYS =
      Set.of("min", "max", "max_change_percent", "max_change");
  private static final TomlMapper TOML = new TomlMapper();

  private ConfigLoader() {}

  /** The shipped defaults. */
  public static MonitorConfig defaults() throws ConfigException {
    return build(readDefaults(), "built-in defaults");
  }

  /** The defaults overlaid by {@code file}; a null file gives the defaults. */
  public static MonitorConfig load(Path file) throws ConfigException {
    if (file == null) {
      return defaults();
    }
    ObjectNode defaults = readDefaults();
    ObjectNode user = read(file);
    check(user, defaults, "", file.toString());
    overlay(defaults, user, "");
    return build(defaults, file.toString());
  }

  private static ObjectNode readDefaults() throws ConfigException {
    try (InputStream in = ConfigLoader.class.getResourceAsStream(DEFAULTS_RESOURCE)) {
      if (in == null) {
        throw new ConfigException(
            "built-in defaults " + DEFAULTS_RESOURCE + " missing from the jar");
      }
      return (ObjectNode) TOML.readTree(in);
    } catch (IOException e) {
      throw new ConfigException("built-in defaults: " + oneLine(e));
    }
  }

  private static ObjectNode read(Path file) throws ConfigException {
    try {
      JsonNode n = TOML.readTree(Files.readString(file));
      if (n == null || !n.isObject()) {
        return TOML.createObjectNode();
      }
      return (ObjectNode) n;
    } catch (NoSuchFileException e) {
      throw new ConfigException(file + ": no such file");
    } catch (JsonProcessingException e) {
      String where = e.getLocation() == null ? "" : " at line " + e.getLocation().getLineNr();
      throw new ConfigException(file + ": not valid TOML" + where + ": " + e.getOriginalMessage());
    } catch (IOException e) {
      throw new ConfigException(file + ": " + oneLine(e));
    }
  }

  private static void check(ObjectNode user, ObjectNode schema, String prefix, String file)
      throws ConfigException {
    Iterator<Map.Entry<String, JsonNode>> it = user.fields();
    while (it.hasNext()) {
      Map.Entry<String, JsonNode> e = it.next();
      String key = prefix + e.getKey();
      JsonNode value = e.getValue();
      if (prefix.equals("limits.")) {
        checkLimitTable(e.getKey(), value, file);
        continue;
      }
      JsonNode expected = schema.get(e.getKey());
      if (expected == null) {
        throw new ConfigException(file + ": unknown key '" + key + "'");
      }
      if (expected.isObject()) {
        if (!value.isObject()) {
          throw new ConfigException(file + ": '" + key + "' must be a table");
        }
        check((ObjectNode) value, (ObjectNode) expected, key + ".", file);
      } else if (expected.isNumber() && !value.isNumber()) {
        throw new ConfigException(file + ": '" + key + "' must be a number, got " + value);
      } else if (expected.isBoolean() && !value.isBoolean()) {
        throw new ConfigException(file + ": '" + key + "' must be true or false, got " + value);
      } else if (expected.isTextual() && !value.isTextual()) {
        throw new ConfigException(file + ": '" + key + "' must be a string, got " + value);
      }
    }
  }

  private static void checkLimitTable(String param, JsonNode table, String file)
      throws ConfigException {
    String key = "limits." + param;
    if (Parameter.byKey(param) == null) {
      throw new ConfigException(file + ": unknown parameter in '" + key + "'");
    }
    if (!table.isObject()) {
      throw new ConfigException(file + ": '" + key + "' must be a table");
    }
    Iterator<Map.Entry<String, JsonNode>> it = table.fields();
    while (it.hasNext()) {
      Map.Entry<String, JsonNode> e = it.next();
      if (!LIMIT_KEYS.contains(e.getKey())) {
        throw new ConfigException(file + ": unknown key '" + key + "." + e.getKey() + "'");
      }
      if (!e.getValue().isNumber()) {
        throw new ConfigException(
            file + ": '" + key + "." + e.getKey() + "' must be a number, got " + e.getValue());
      }
    }
  }

  /** Overlays the user's values; under {@code limits} a user's table replaces the default. */
  private static void overlay(ObjectNode base, ObjectNode user, String path) {
    Iterator<Map.Entry<String, JsonNode>> it = user.fields();
    while (it.hasNext()) {
      Map.Entry<String, JsonNode> e = it.next();
      JsonNode b = base.get(e.getKey());
      if (!path.equals("limits") && b != null && b.isObject() && e.getValue().isObject()) {
        overlay((ObjectNode) b, (ObjectNode) e.getValue(), e.getKey());
      } else {
        base.set(e.getKey(), e.getValue());
      }
    }
  }

  private static MonitorConfig build(ObjectNode c, String file) throws ConfigException {
    Reader r = new Reader(c, file);
    try {
      PulseSchedule schedule = null;
      if (r.bool("pulses.schedule.enabled")) {
        schedule =
            r.valid(
                "pulses.schedule",
                () ->
                    new PulseSchedule(
                        r.number("pulses.schedule.first_onset_ms"),
                        r.number("pulses.schedule.period_ms"),
                        r.number("pulses.schedule.width_ms"),
                        r.number("pulses.schedule.step")));
      }
      PulseSchedule s = schedule;
      SegmenterOptions seg =
          r.valid(
              "pulses",
              () ->
                  new SegmenterOptions(
                      r.number("pulses.edge_threshold_mv"),
                      r.number("pulses.baseline_ms"),
                      r.number("pulses.max_step_ms"),
                      r.number("pulses.off_window_ms"),
                      s));
      double edgePa = r.positive("pulses.edge_threshold_pa");
      double filterHz = r.number("amplifier.filter_cutoff_hz");
      if (filterHz < 0) {
        throw new ConfigException(
            file + ": 'amplifier.filter_cutoff_hz' must be >= 0, got " + filterHz);
      }
      EstimatorOptions estimator = estimatorOptions(r);
      EnumMap<Parameter, ParameterLimits> limits = new EnumMap<>(Parameter.class);
      JsonNode lim = c.get("limits");
      if (lim != null) {
        Iterator<String> names = lim.fieldNames();
        while (names.hasNext()) {
          String name = names.next();
          Parameter p = Parameter.byKey(name);
          JsonNode t = lim.get(name);
          limits.put(
              p,
              r.valid(
                  "limits." + name,
                  () ->
                      new ParameterLimits(
                          p,
                          optional(t, "min"),
                          optional(t, "max"),
                          optional(t, "max_change_percent"),
                          optional(t, "max_change"))));
        }
      }
      DriftDetection drift =
          r.valid(
              "drift",
              () ->
                  new DriftDetection(
                      r.bool("drift.enabled"),
                      r.number("drift.allowance_sigma"),
                      r.number("drift.threshold_sigma"),
                      r.number("drift.winsor_sigma"),
                      r.number("drift.min_noise_percent"),
                      r.integer("drift.noise_window_pulses"),
                      r.integer("drift.noise_min_pulses")));
      HealthCriteria health =
          r.valid(
              "health",
              () ->
                  new HealthCriteria(
                      r.integer("baseline.pulses"),
                      r.integer("health.debounce_pulses"),
                      r.number("health.hysteresis_percent"),
                      r.number("health.drift_warning_fraction"),
                      r.number("health.no_pulse_timeout_s"),
                      limits,
                      drift,
                      r.integer("health.average_pulses"),
                      r.number("health.change_sigmas")));
      OutlierScreening outliers =
          r.valid(
              "outliers",
              () ->
                  new OutlierScreening(
                      r.bool("outliers.enabled"),
                      r.integer("outliers.history_pulses"),
                      r.integer("outliers.min_history_pulses"),
                      r.number("outliers.outlier_sigmas"),
                      r.number("outliers.relative_floor_percent"),
                      r.integer("outliers.confirm_pulses")));
      @SuppressWarnings("unchecked")
      Map<String, Object> asLoaded = TOML.convertValue(c, Map.class);
      return new MonitorConfig(seg, edgePa, filterHz, estimator, health, outliers, asLoaded);
    } catch (ConfigFailure f) {
      throw f.cause;
    }
  }

  private static EstimatorOptions estimatorOptions(Reader r) {
    String comp = r.node("estimator.filter_compensation").asText();
    FilterCompensation fc;
    switch (comp) {
      case "bessel-gain":
        fc = FilterCompensation.BESSEL_GAIN;
        break;
      case "group-delay":
        fc = FilterCompensation.GROUP_DELAY;
        break;
      case "none":
        fc = FilterCompensation.NONE;
        break;
      default:
        throw new ConfigFailure(
            new ConfigException(
                r.file
                    + ": 'estimator.filter_compensation' must be \"bessel-gain\", \"group-delay\""
                    + " or \"none\", got \""
                    + comp
                    + "\""));
    }
    return r.valid(
        "estimator",
        () ->
            EstimatorOptions.defaults().toBuilder()
                .filterCompensation(fc)
                .minRaMOhm(r.number("estimator.min_ra_mohm"))
                .maxRaMOhm(r.number("estimator.max_ra_mohm"))
                .minRinMOhm(r.number("estimator.min_rin_mohm"))
                .maxRinMOhm(r.number("estimator.max_rin_mohm"))
                .minCmPf(r.number("estimator.min_cm_pf"))
                .maxCmPf(r.number("estimator.max_cm_pf"))
                .maxResidualToNoise(r.number("estimator.max_residual_to_noise"))
                .modelSelectionAlpha(r.number("estimator.model_selection_alpha"))
                .maxExcursionSigmas(r.number("estimator.max_excursion_sigmas"))
                .excursionWindowMs(r.number("estimator.excursion_window_ms"))
                .bridgeBalancedMOhm(r.number("estimator.bridge_balanced_mohm"))
                .build());
  }

  private static double optional(JsonNode table, String key) {
    JsonNode v = table.get(key);
    return v == null ? Double.NaN : v.asDouble();
  }

  private static String oneLine(Exception e) {
    String m = e.getMessage();
    return m == null ? e.toString() : m.replace('\n', ' ');
  }

  /** Carries a ConfigException out of the value suppliers. */
  private static final class ConfigFailure extends RuntimeException {
    private static final long serialVersionUID = 1L;
    final ConfigException cause;

    ConfigFailure(ConfigException cause) {
      super(cause.getMessage(), null, false, false);
      this.cause = cause;
    }
  }

  /** Reads typed values by dotted key; a missing or mistyped key names itself. */
  private static final class Reader {
    private final ObjectNode root;
    final String file;

    Reader(ObjectNode root, String file) {
      this.root = root;
      this.file = file;
    }

    JsonNode node(String key) {
      JsonNode n = root;
      for (String part : key.split("\\.")) {
        n = n == null ? null : n.get(part);
      }
      if (n == null) {
        throw new ConfigFailure(new ConfigException(file + ": missing key '" + key + "'"));
      }
      return n;
    }

    double number(String key) {
      JsonNode n = node(key);
      if (!n.isNumber()) {
        throw new ConfigFailure(new ConfigException(file + ": '" + key + "' must be a number"));
      }
      return n.asDouble();
    }

    double positive(String key) {
      double v = number(key);
      if (!(v > 0)) {
        throw new ConfigFailure(
            new ConfigException(file + ": '" + key + "' must be positive, got " + v));
      }
      return v;
    }

    int integer(String key) {
      JsonNode n = node(key);
      if (!n.isIntegralNumber()) {
        throw new ConfigFailure(
            new ConfigException(file + ": '" + key + "' must be a whole number, got " + n));
      }
      return n.asInt();
    }

    boolean bool(String key) {
      JsonNode n = node(key);
      if (!n.isBoolean()) {
        throw new ConfigFailure(
            new ConfigException(file + ": '" + key + "' must be true or false"));
      }
      return n.asBoolean();
    }

    /** Builds a component's options, turning its validation message into one naming the key. */
    <T> T valid(String section, java.util.function.Supplier<T> make) {
      try {
        return make.get();
      } catch (ConfigFailure f) {
        throw f;
      } catch (IllegalArgumentException e) {
        throw new ConfigFailure(
            new ConfigException(file + ": [" + section + "] " + e.getMessage()));
      }
    }
  }
}
