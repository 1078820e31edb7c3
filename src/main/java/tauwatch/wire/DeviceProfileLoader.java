package tauwatch.wire;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.dataformat.toml.TomlMapper;
import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Iterator;
import java.util.List;
import java.util.Map;
import java.util.Set;
import tauwatch.stream.ClampMode;

/**
 * Reads device profiles ({@code drivers/*.toml}, format in {@code drivers/WIRE-FORMAT.md}) from the
 * built-in set ({@code /tauwatch/drivers/NAME.toml}) or from a file, and validates them.
 *
 * <p>Stateless and thread-safe; set-up only. Every problem is a {@link ProfileException} with one
 * line naming the file and the key.
 */
public final class DeviceProfileLoader {
  /** The profile the simulator serves with, and that a TCP or serial source assumes by default. */
  public static final String DEFAULT_PROFILE = "simulator";

  private static final List<String> BUILT_IN =
      List.of("simulator", "usb-board-16bit", "usb-board-text", "network-daq-float32");

  private static final Map<String, Set<String>> KEYS =
      Map.of(
          "",
          Set.of("name", "description", "transport", "framing", "stream", "channels", "scaling"),
          "transport",
          Set.of("tcp", "serial"),
          "transport.tcp",
          Set.of("host", "port"),
          "transport.serial",
          Set.of("device", "baud", "data_bits", "parity", "stop_bits"),
          "framing",
          Set.of("kind", "sample_format", "channels", "samples_per_frame", "line_counter"),
          "stream",
          Set.of("sample_rate_hz", "mode", "filter_cutoff_hz"),
          "channels",
          Set.of("command", "response", "trigger", "trigger_threshold"),
          "scaling",
          Set.of(
              "values",
              "adc_bits",
              "adc_range_v",
              "command_mv_per_v",
              "command_pa_per_v",
              "response_mv_per_pa",
              "response_mv_per_mv",
              "command_offset",
              "response_offset"));

  private static final TomlMapper TOML = new TomlMapper();

  private DeviceProfileLoader() {}

  public static List<String> builtInNames() {
    return BUILT_IN;
  }

  /** A built-in profile by name, or else a profile file at that path. */
  public static DeviceProfile load(String nameOrPath) throws ProfileException {
    if (BUILT_IN.contains(nameOrPath)) {
      return loadBuiltIn(nameOrPath);
    }
    Path path = Path.of(nameOrPath);
    if (Files.isRegularFile(path)) {
      try {
        return parse(path.toString(), Files.readString(path, StandardCharsets.UTF_8));
      } catch (IOException e) {
        throw new ProfileException(path + ": cannot be read: " + e.getMessage());
      }
    }
    throw new ProfileException(
        nameOrPath
            + ": no such profile file or built-in profile (built-in: "
            + String.join(", ", BUILT_IN)
            + ")");
  }

  public static DeviceProfile loadBuiltIn(String name) throws ProfileException {
    String resource = "/tauwatch/drivers/" + name + ".toml";
    try (InputStream in = DeviceProfileLoader.class.getResourceAsStream(resource)) {
      if (in == null) {
        throw new ProfileException(name + ": unknown built-in profile");
      }
      return parse(
          "drivers/" + name + ".toml", new String(in.readAllBytes(), StandardCharsets.UTF_8));
    } catch (IOException e) {
      throw new ProfileException(resource + ": cannot be read: " + e.getMessage());
    }
  }

  /** Parses and validates profile text; {@code origin} names it in errors. */
  public static DeviceProfile parse(String origin, String toml) throws ProfileException {
    JsonNode root;
    try {
      root = TOML.readTree(toml);
    } catch (JsonProcessingException e) {
      String where = e.getLocation() == null ? "" : " at line " + e.getLocation().getLineNr();
      throw new ProfileException(
          origin + ": not valid TOML" + where + ": " + oneLine(e.getOriginalMessage()));
    }
    if (root == null || !root.isObject()) {
      throw new ProfileException(origin + ": empty profile");
    }
    Keys k = new Keys(origin, root);
    k.checkKnown(root, "");

    String name = k.text("name", "");
    String description = k.text("description", "");

    DeviceProfile.TcpSettings tcp = null;
    if (root.path("transport").has("tcp")) {
      int port = k.integer("transport.tcp.port", 0);
      if (port < 0 || port > 65535) {
        throw k.error("transport.tcp.port", "must be 1–65535 (or 0 for none), got " + port);
      }
      tcp = new DeviceProfile.TcpSettings(k.text("transport.tcp.host", "127.0.0.1"), port);
    }
    DeviceProfile.SerialSettings serial = null;
    if (root.path("transport").has("serial")) {
      int baud = k.integer("transport.serial.baud", -1);
      if (baud < 300 || baud > 16_000_000) {
        throw k.error("transport.serial.baud", "must be 300–16000000, got " + baud);
      }
      int dataBits = k.integer("transport.serial.data_bits", 8);
      if (dataBits < 5 || dataBits > 8) {
        throw k.error("transport.serial.data_bits", "must be 5–8, got " + dataBits);
      }
      String parity = k.choice("transport.serial.parity", "none", "none", "even", "odd");
      int stopBits = k.integer("transport.serial.stop_bits", 1);
      if (stopBits != 1 && stopBits != 2) {
        throw k.error("transport.serial.stop_bits", "must be 1 or 2, got " + stopBits);
      }
      serial =
          new DeviceProfile.SerialSettings(
              k.text("transport.serial.device", ""), baud, dataBits, parity, stopBits);
    }
    if (tcp == null && serial == null) {
      throw k.error("transport", "needs a [transport.tcp] or a [transport.serial] table");
    }

    String framingKind = k.choice("framing.kind", null, "binary", "text");
    DeviceProfile.Framing framing =
        framingKind.equals("binary") ? DeviceProfile.Framing.BINARY : DeviceProfile.Framing.TEXT;
    int channels = k.integer("framing.channels", -1);
    if (channels < 1 || channels > WireFormat.MAX_CHANNELS) {
      throw k.error(
          "framing.channels", "must be 1–" + WireFormat.MAX_CHANNELS + ", got " + channels);
    }
    int sampleFormat = 0;
    if (framing == DeviceProfile.Framing.BINARY) {
      String f = k.choice("framing.sample_format", null, "int16", "float32");
      sampleFormat = f.equals("int16") ? WireFormat.FORMAT_INT16 : WireFormat.FORMAT_FLOAT32;
    } else if (root.path("framing").has("sample_format")) {
      throw k.error(
          "framing.sample_format", "applies to binary framing only (text lines are integers)");
    }
    boolean lineCounter = k.bool("framing.line_counter", false);
    if (lineCounter && framing != DeviceProfile.Framing.TEXT) {
      throw k.error("framing.line_counter", "applies to text framing only");
    }

    double rate = k.number("stream.sample_rate_hz", Double.NaN);
    if (!(rate > 0) || rate > 10_000_000) {
      throw k.error("stream.sample_rate_hz", "must be a rate in Hz above 0, got " + rate);
    }
    int perFrame =
        k.integer(
            "framing.samples_per_frame",
            (int) Math.max(1, Math.min(WireFormat.MAX_SAMPLES_PER_FRAME, Math.round(rate / 1000))));
    if (perFrame < 1 || perFrame > WireFormat.MAX_SAMPLES_PER_FRAME) {
      throw k.error(
          "framing.samples_per_frame",
          "must be 1–" + WireFormat.MAX_SAMPLES_PER_FRAME + ", got " + perFrame);
    }
    String modeCode = k.choice("stream.mode", null, "VC", "CC");
    ClampMode mode = modeCode.equals("VC") ? ClampMode.VOLTAGE_CLAMP : ClampMode.CURRENT_CLAMP;
    double filter = k.number("stream.filter_cutoff_hz", 0);
    if (!(filter >= 0) || filter >= rate / 2 && filter > 0) {
      throw k.error(
          "stream.filter_cutoff_hz",
          "must be 0 (none) or below half the sample rate, got " + filter);
    }

    int cmdCh = channel(k, "channels.command", channels, true);
    int respCh = channel(k, "channels.response", channels, true);
    int trigCh = channel(k, "channels.trigger", channels, false);
    if (cmdCh == respCh) {
      throw k.error("channels.response", "must differ from channels.command");
    }
    if (trigCh >= 0 && (trigCh == cmdCh || trigCh == respCh)) {
      throw k.error("channels.trigger", "must differ from the command and response channels");
    }
    double threshold = k.number("channels.trigger_threshold", Double.NaN);
    if (trigCh >= 0 && Double.isNaN(threshold)) {
      throw k.error("channels.trigger_threshold", "is needed with channels.trigger");
    }
    if (trigCh < 0 && !Double.isNaN(threshold)) {
      throw k.error("channels.trigger_threshold", "given without channels.trigger");
    }

    String defaultValues = sampleFormat == WireFormat.FORMAT_FLOAT32 ? "volts" : "counts";
    String values = k.choice("scaling.values", defaultValues, "counts", "volts", "units");
    if (values.equals("counts") && sampleFormat == WireFormat.FORMAT_FLOAT32) {
      throw k.error("scaling.values", "float32 samples are \"volts\" or \"units\", not counts");
    }
    if (!values.equals("counts") && sampleFormat != WireFormat.FORMAT_FLOAT32) {
      throw k.error("scaling.values", "int16 and text samples are \"counts\"");
    }
    int bits = 0;
    double rangeV = Double.NaN;
    if (values.equals("counts")) {
      int maxBits = sampleFormat == WireFormat.FORMAT_INT16 ? 16 : 24;
      bits = k.integer("scaling.adc_bits", -1);
      if (bits < 2 || bits > maxBits) {
        throw k.error("scaling.adc_bits", "must be 2–" + maxBits + ", got " + bits);
      }
    }
    if (!values.equals("units")) {
      rangeV = k.number("scaling.adc_range_v", Double.NaN);
      if (!(rangeV > 0) || rangeV > 100) {
        throw k.error(
            "scaling.adc_range_v",
            "must be the digitiser's full scale in V (0–100), got " + rangeV);
      }
    }
    double cmdPerV;
    double respPerV;
    if (values.equals("units")) {
      for (String key :
          List.of(
              "command_mv_per_v", "command_pa_per_v", "response_mv_per_pa", "response_mv_per_mv")) {
        if (root.path("scaling").has(key)) {
          throw k.error("scaling." + key, "does not apply to values = \"units\"");
        }
      }
      cmdPerV = Double.NaN;
      respPerV = Double.NaN;
    } else if (mode == ClampMode.VOLTAGE_CLAMP) {
      k.forbid("scaling.command_pa_per_v", "is for current clamp; use scaling.command_mv_per_v");
      k.forbid(
          "scaling.response_mv_per_mv", "is for current clamp; use scaling.response_mv_per_pa");
      cmdPerV = k.nonZero("scaling.command_mv_per_v");
      // The amplifier's gain in mV out per pA in: pA per V is 1000 / gain.
      respPerV = 1000 / k.nonZero("scaling.response_mv_per_pa");
    } else {
      k.forbid("scaling.command_mv_per_v", "is for voltage clamp; use scaling.command_pa_per_v");
      k.forbid(
          "scaling.response_mv_per_pa", "is for voltage clamp; use scaling.response_mv_per_mv");
      cmdPerV = k.nonZero("scaling.command_pa_per_v");
      respPerV = 1000 / k.nonZero("scaling.response_mv_per_mv");
    }
    double cmdOffset = k.number("scaling.command_offset", 0);
    double respOffset = k.number("scaling.response_offset", 0);
    if (name.isEmpty()) {
      String base = Path.of(origin).getFileName().toString();
      name = base.endsWith(".toml") ? base.substring(0, base.length() - 5) : base;
    }
    return new DeviceProfile(
        name,
        description,
        origin,
        toml,
        tcp,
        serial,
        framing,
        sampleFormat,
        channels,
        perFrame,
        lineCounter,
        rate,
        mode,
        filter,
        cmdCh,
        respCh,
        trigCh,
        threshold,
        values,
        bits,
        rangeV,
        cmdPerV,
        respPerV,
        cmdOffset,
        respOffset);
  }

  private static int channel(Keys k, String key, int channels, boolean required)
      throws ProfileException {
    int c = k.integer(key, required ? -2 : -1);
    if (c == -2) {
      throw k.error(key, "is required");
    }
    if (c < -1 || c >= channels) {
      throw k.error(key, "must be a channel index 0–" + (channels - 1) + ", got " + c);
    }
    return c;
  }

  private static String oneLine(String s) {
    return s == null ? "" : s.replace('\n', ' ');
  }

  /** Typed access by dotted key; every failure names the file and key. */
  private static final class Keys {
    private final String origin;
    private final JsonNode root;

    Keys(String origin, JsonNode root) {
      this.origin = origin;
      this.root = root;
    }

    ProfileException error(String key, String what) {
      return new ProfileException(origin + ": '" + key + "' " + what);
    }

    void checkKnown(JsonNode node, String path) throws ProfileException {
      Set<String> allowed = KEYS.get(path);
      Iterator<Map.Entry<String, JsonNode>> it = node.fields();
      while (it.hasNext()) {
        Map.Entry<String, JsonNode> e = it.next();
        String key = path.isEmpty() ? e.getKey() : path + "." + e.getKey();
        if (allowed == null || !allowed.contains(e.getKey())) {
          throw new ProfileException(origin + ": unknown key '" + key + "'");
        }
        if (KEYS.containsKey(key)) {
          if (!e.getValue().isObject()) {
            throw error(key, "must be a table");
          }
          checkKnown(e.getValue(), key);
        }
      }
    }

    JsonNode node(String key) {
      JsonNode n = root;
      for (String part : key.split("\\.")) {
        n = n == null ? null : n.get(part);
      }
      return n;
    }

    String text(String key, String fallback) throws ProfileException {
      JsonNode n = node(key);
      if (n == null) {
        if (fallback == null) {
          throw error(key, "is required");
        }
        return fallback;
      }
      if (!n.isTextual()) {
        throw error(key, "must be a string, got " + n);
      }
      return n.asText();
    }

    String choice(String key, String fallback, String... allowed) throws ProfileException {
      String v = text(key, fallback);
      for (String a : allowed) {
        if (a.equals(v)) {
          return v;
        }
      }
      throw error(key, "must be one of " + String.join(", ", allowed) + ", got \"" + v + "\"");
    }

    double number(String key, double fallback) throws ProfileException {
      JsonNode n = node(key);
      if (n == null) {
        return fallback;
      }
      if (!n.isNumber()) {
        throw error(key, "must be a number, got " + n);
      }
      return n.asDouble();
    }

    double nonZero(String key) throws ProfileException {
      JsonNode n = node(key);
      if (n == null) {
        throw error(key, "is required");
      }
      double v = number(key, Double.NaN);
      if (v == 0 || !Double.isFinite(v)) {
        throw error(key, "must be a finite, non-zero gain, got " + v);
      }
      return v;
    }

    int integer(String key, int fallback) throws ProfileException {
      JsonNode n = node(key);
      if (n == null) {
        if (fallback == -1 && !key.startsWith("channels.")) {
          throw error(key, "is required");
        }
        return fallback;
      }
      if (!n.isIntegralNumber()) {
        throw error(key, "must be a whole number, got " + n);
      }
      return n.asInt();
    }

    boolean bool(String key, boolean fallback) throws ProfileException {
      JsonNode n = node(key);
      if (n == null) {
        return fallback;
      }
      if (!n.isBoolean()) {
        throw error(key, "must be true or false, got " + n);
      }
      return n.asBoolean();
    }

    void forbid(String key, String why) throws ProfileException {
      if (node(key) != null) {
        throw error(key, why);
      }
    }
  }
}
