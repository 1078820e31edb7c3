package tauwatch.wire;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import tauwatch.stream.ClampMode;

class DeviceProfileLoaderTest {
  private static final String GOOD =
      """
      [transport.tcp]
      host = "127.0.0.1"
      port = 5000
      [framing]
      kind = "binary"
      sample_format = "int16"
      channels = 2
      [stream]
      sample_rate_hz = 20000.0
      mode = "VC"
      [channels]
      command = 0
      response = 1
      [scaling]
      adc_bits = 16
      adc_range_v = 10.0
      command_mv_per_v = 20.0
      response_mv_per_pa = 0.5
      """;

  @Test
  void everyShippedProfileLoadsAndIsListed() throws Exception {
    List<String> onDisk;
    try (Stream<Path> files = Files.list(Path.of("drivers"))) {
      onDisk =
          files
              .map(p -> p.getFileName().toString())
              .filter(f -> f.endsWith(".toml"))
              .map(f -> f.substring(0, f.length() - 5))
              .sorted()
              .toList();
    }
    assertEquals(onDisk, DeviceProfileLoader.builtInNames().stream().sorted().toList());
    for (String name : DeviceProfileLoader.builtInNames()) {
      DeviceProfile p = DeviceProfileLoader.load(name);
      assertEquals(name, p.name());
      assertFalse(p.description().isBlank(), name);
      assertTrue(p.commandScale() != 0 && Double.isFinite(p.responseScale()), name);
    }
  }

  @Test
  void countsScaleByTheDigitiserRangeAndTheAmplifierGain() throws Exception {
    DeviceProfile p = DeviceProfileLoader.parse("t.toml", GOOD);
    // 1 count = 10 V / 2^15; VC command 20 mV/V; response 0.5 mV/pA → 2000 pA/V.
    assertEquals(10.0 / 32768 * 20, p.commandScale(), 1e-15);
    assertEquals(10.0 / 32768 * 2000, p.responseScale(), 1e-12);
    assertEquals(ClampMode.VOLTAGE_CLAMP, p.mode());
    assertEquals(20, p.samplesPerFrame()); // ≈ 1 ms by default
    assertEquals(32768, p.rawLimit());
  }

  @ParameterizedTest(name = "{0} → names {1}")
  @CsvSource(
      delimiter = '|',
      value = {
        "[framing];kind = \"binary\";sample_format = \"int16\";channels = 2;speed = 3 | 'framing.speed'",
        "[framing];kind = \"morse\";sample_format = \"int16\";channels = 2 | 'framing.kind'",
        "[framing];kind = \"binary\";sample_format = \"int16\";channels = 9 | 'framing.channels'",
        "[scaling];adc_bits = 20;adc_range_v = 10.0;command_mv_per_v = 20.0;response_mv_per_pa = 0.5 | 'scaling.adc_bits'",
        "[scaling];adc_bits = 16;adc_range_v = 10.0;command_mv_per_v = 20.0;response_mv_per_mv = 0.5 | 'scaling.response_mv_per_mv'",
        "[scaling];adc_bits = 16;adc_range_v = 10.0;command_mv_per_v = 20.0 | 'scaling.response_mv_per_pa'",
        "[channels];command = 0;response = 0 | 'channels.response'",
        "[channels];command = 0;response = 1;trigger = 5;trigger_threshold = 1 | 'channels.trigger'",
        "[channels];command = 0;response = 1;trigger = 1 | 'channels.trigger'",
        "[stream];sample_rate_hz = 20000.0;mode = \"VC\";filter_cutoff_hz = 15000.0 | 'stream.filter_cutoff_hz'",
        "[transport.serial];baud = 12 | 'transport.serial.baud'",
      })
  void errorsNameTheFileAndTheKey(String replacement, String key) {
    String lines = replacement.replace(';', '\n');
    String toml = replace(GOOD, lines.substring(0, lines.indexOf('\n')), lines);
    ProfileException e =
        assertThrows(ProfileException.class, () -> DeviceProfileLoader.parse("bad.toml", toml));
    assertTrue(e.getMessage().startsWith("bad.toml: "), e.getMessage());
    assertTrue(e.getMessage().contains(key), e.getMessage());
  }

  @Test
  void aProfileFileIsNamedInItsErrors(@org.junit.jupiter.api.io.TempDir Path dir)
      throws IOException {
    Path f = dir.resolve("rig.toml");
    Files.writeString(f, GOOD.replace("mode = \"VC\"", "mode = \"XX\""));
    ProfileException e =
        assertThrows(ProfileException.class, () -> DeviceProfileLoader.load(f.toString()));
    assertTrue(e.getMessage().startsWith(f + ": 'stream.mode'"), e.getMessage());
    ProfileException missing =
        assertThrows(ProfileException.class, () -> DeviceProfileLoader.load("no-such-rig"));
    assertTrue(missing.getMessage().contains("no-such-rig"), missing.getMessage());
  }

  /** Replaces the table that starts with {@code header} in {@code toml} by {@code table}. */
  private static String replace(String toml, String header, String table) {
    int start = toml.indexOf(header);
    if (start < 0) {
      return toml + table + "\n";
    }
    int end = toml.indexOf("\n[", start + 1);
    return toml.substring(0, start) + table + "\n" + (end < 0 ? "" : toml.substring(end + 1));
  }
}
