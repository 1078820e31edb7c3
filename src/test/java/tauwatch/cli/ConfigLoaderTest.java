package tauwatch.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import tauwatch.fit.Parameter;
import tauwatch.monitor.MonitorConfig;

class ConfigLoaderTest {
  @TempDir Path dir;

  private Path write(String toml) throws IOException {
    Path f = dir.resolve("lab.toml");
    Files.writeString(f, toml);
    return f;
  }

  private String error(String toml) throws IOException {
    Path f = write(toml);
    return assertThrows(ConfigException.class, () -> ConfigLoader.load(f)).getMessage();
  }

  @Test
  void theShippedDefaultsCarryTheCommonPracticeCriteria() throws Exception {
    MonitorConfig c = ConfigLoader.defaults();
    var ra = c.health().limits().get(Parameter.ACCESS_RESISTANCE);
    assertEquals(25.0, ra.max());
    assertEquals(20.0, ra.maxChangePercent());
    assertEquals(-200.0, c.health().limits().get(Parameter.HOLDING_CURRENT).min());
    assertEquals(20, c.health().baselinePulses());
    assertNull(c.segmenter().schedule());
  }

  @Test
  void aUserFileOverridesSomeKeysAndKeepsTheRest() throws Exception {
    MonitorConfig c =
        ConfigLoader.load(
            write(
                "[health]\ndebounce_pulses = 5\n[limits.ra]\nmax = 20.0\n[limits.tau]\nmax = 5\n"));
    assertEquals(5, c.health().debouncePulses());
    assertEquals(5.0, c.health().hysteresisPercent());
    // A [limits.X] table replaces the default one for X whole.
    assertEquals(20.0, c.health().limits().get(Parameter.ACCESS_RESISTANCE).max());
    assertTrue(
        Double.isNaN(c.health().limits().get(Parameter.ACCESS_RESISTANCE).maxChangePercent()));
    assertEquals(5.0, c.health().limits().get(Parameter.TIME_CONSTANT).max());
    assertEquals(30.0, c.health().limits().get(Parameter.INPUT_RESISTANCE).maxChangePercent());
  }

  @Test
  void theOutlierScreenIsTheLabsToSetOrSwitchOff() throws Exception {
    assertEquals(tauwatch.health.OutlierScreening.defaults(), ConfigLoader.defaults().outliers());
    MonitorConfig c =
        ConfigLoader.load(write("[outliers]\noutlier_sigmas = 4.5\nhistory_pulses = 30\n"));
    assertEquals(4.5, c.outliers().outlierSigmas());
    assertEquals(30, c.outliers().historyPulses());
    assertEquals(8, c.outliers().minHistoryPulses(), "the rest keeps its default");
    assertTrue(c.outliers().enabled());
    assertTrue(!ConfigLoader.load(write("[outliers]\nenabled = false\n")).outliers().enabled());
    String m = error("[outliers]\nconfirm_pulses = 1\n");
    assertTrue(m.contains("lab.toml: [outliers] confirm_pulses must be >= 2, got 1"), m);
  }

  @Test
  void anUnknownKeyIsNamedWithItsFile() throws Exception {
    String m = error("[health]\ndebounce = 5\n");
    assertEquals(dir.resolve("lab.toml") + ": unknown key 'health.debounce'", m);
  }

  @Test
  void aValueOfTheWrongTypeIsNamed() throws Exception {
    assertTrue(
        error("[baseline]\npulses = \"many\"\n")
            .endsWith("'baseline.pulses' must be a number, got \"many\""));
  }

  @Test
  void aValueOutOfRangeIsNamed() throws Exception {
    String m = error("[health]\ndebounce_pulses = 0\n");
    assertTrue(m.contains("lab.toml: [health] debounce_pulses must be >= 1"), m);
  }

  @Test
  void anUnknownParameterInTheLimitsIsNamed() throws Exception {
    assertTrue(error("[limits.rs]\nmax = 3\n").endsWith("unknown parameter in 'limits.rs'"));
    assertTrue(error("[limits.ra]\nmaximum = 3\n").endsWith("unknown key 'limits.ra.maximum'"));
  }

  @Test
  void contradictoryLimitsAreNamed() throws Exception {
    String m = error("[limits.ra]\nmin = 30\nmax = 25\n");
    assertTrue(m.contains("[limits.ra] ra: min (30.0) must be below max (25.0)"), m);
  }

  @Test
  void malformedTomlGivesTheLine() throws Exception {
    String m = error("[health]\ndebounce_pulses = = 3\n");
    assertTrue(m.startsWith(dir.resolve("lab.toml") + ": not valid TOML at line 2"), m);
  }

  @Test
  void aMissingFileIsNamed() {
    Path f = dir.resolve("nope.toml");
    assertEquals(
        f + ": no such file",
        assertThrows(ConfigException.class, () -> ConfigLoader.load(f)).getMessage());
  }
}
