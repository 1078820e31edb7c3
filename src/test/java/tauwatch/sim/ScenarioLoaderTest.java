package tauwatch.sim;

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
import org.junit.jupiter.api.io.TempDir;

/** Scenario files: the shipped set, and one-line errors that name file and key. */
class ScenarioLoaderTest {
  private static final String VALID =
      """
      name = "t"
      [protocol]
      holding_mv = -70.0
      step_mv = -5.0
      step_width_ms = 10.0
      period_ms = 500.0
      [cell]
      access_mohm = 10.0
      membrane_mohm = 300.0
      capacitance_pf = 30.0
      """;

  @Test
  void everyShippedScenarioLoadsAndIsListed() throws IOException {
    List<String> onDisk;
    try (Stream<Path> files = Files.list(Path.of("simulator"))) {
      onDisk =
          files
              .map(p -> p.getFileName().toString())
              .filter(f -> f.endsWith(".toml"))
              .map(f -> f.substring(0, f.length() - 5))
              .sorted()
              .toList();
    }
    assertEquals(onDisk, ScenarioLoader.builtInNames().stream().sorted().toList());
    for (String name : ScenarioLoader.builtInNames()) {
      Scenario s = ScenarioLoader.load(name);
      assertEquals(name, s.name());
      assertFalse(s.description().isBlank(), name);
      new SimulatedRecording(s).fill(new double[1000], new double[1000], 0, 1000);
    }
  }

  @Test
  void steadyCellIsTheBriefsDefault() {
    Scenario s = ScenarioLoader.load(ScenarioLoader.DEFAULT_SCENARIO);
    CellTruth t = s.truthAt(0);
    assertEquals(10, t.accessMOhm(), 1e-9);
    assertEquals(300, t.inputMOhm(), 1e-9);
    assertEquals(30, t.capacitancePf(), 1e-9);
    assertEquals(Double.POSITIVE_INFINITY, t.cell().sealGOhm());
    assertEquals(50_000, s.amplifier().sampleRateHz());
    assertEquals(10_000, s.amplifier().filterCutoffHz());
    assertEquals(16, s.amplifier().adcBits());
    assertEquals("sim:steady-cell", new SimulatedRecording(s).format().description());
  }

  @Test
  void failingSealPassesMinus200PicoampHolding() {
    // Common practice: beyond about −200 pA at −70 mV suggests a leaky seal.
    Scenario s = ScenarioLoader.load("seal-failing");
    assertTrue(s.truthAt(0).holdingPa() > -50);
    assertTrue(s.truthAt(s.durationS()).holdingPa() < -200);
  }

  @Test
  void scenarioFileLoadsFromAPath(@TempDir Path dir) throws IOException {
    Path f = dir.resolve("mine.toml");
    Files.writeString(f, VALID.replace("name = \"t\"\n", ""));
    Scenario s = ScenarioLoader.load(f.toString());
    assertEquals("mine", s.name());
  }

  @Test
  void unknownKeyIsNamedWithItsFile() {
    ScenarioException e =
        assertThrows(
            ScenarioException.class,
            () -> ScenarioLoader.parse("x.toml", "x", "sead = 3\n" + VALID));
    assertOneLine(e, "x.toml: sead: unknown key");
    e =
        assertThrows(
            ScenarioException.class,
            () -> ScenarioLoader.parse("x.toml", "x", VALID.replace("access_mohm", "acces_mohm")));
    assertOneLine(e, "x.toml: cell.acces_mohm: unknown key");
  }

  @Test
  void outOfRangeMissingAndMistypedValuesNameTheKey() {
    assertOneLine(
        assertThrows(
            ScenarioException.class,
            () ->
                ScenarioLoader.parse(
                    "y.toml",
                    "y",
                    VALID.replace("capacitance_pf = 30.0", "capacitance_pf = -3.0"))),
        "y.toml: cell.capacitance_pf: must be in");
    assertOneLine(
        assertThrows(
            ScenarioException.class,
            () -> ScenarioLoader.parse("y.toml", "y", VALID.replace("step_mv = -5.0\n", ""))),
        "y.toml: protocol.step_mv: is required");
    assertOneLine(
        assertThrows(
            ScenarioException.class,
            () ->
                ScenarioLoader.parse(
                    "y.toml", "y", VALID.replace("period_ms = 500.0", "period_ms = \"long\""))),
        "y.toml: protocol.period_ms: must be a number");
    assertOneLine(
        assertThrows(
            ScenarioException.class,
            () ->
                ScenarioLoader.parse(
                    "y.toml", "y", VALID + "[drift]\naccess_mohm = [[5.0, 10.0], [1.0, 20.0]]\n")),
        "y.toml: drift.access_mohm: knot times must increase");
    assertOneLine(
        assertThrows(ScenarioException.class, () -> ScenarioLoader.parse("z.toml", "z", "a = = 1")),
        "z.toml: not valid TOML");
    assertOneLine(
        assertThrows(ScenarioException.class, () -> ScenarioLoader.load("no-such-scenario")),
        "no-such-scenario: no such scenario");
  }

  @Test
  void perfectSealMayBeWrittenAsInf() {
    Scenario s = ScenarioLoader.parse("s.toml", "s", VALID + "seal_gohm = inf\n");
    assertEquals(Double.POSITIVE_INFINITY, s.schedule().at(0).sealGOhm());
  }

  private static void assertOneLine(ScenarioException e, String start) {
    assertTrue(e.getMessage().startsWith(start), e.getMessage());
    assertFalse(e.getMessage().contains("\n"), e.getMessage());
  }
}
