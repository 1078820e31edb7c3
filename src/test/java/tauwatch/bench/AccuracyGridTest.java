package tauwatch.bench;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * The accuracy benchmark's grids are well formed, and a tiny grid runs end to end: every
 * (condition, cell) pair once, filters at or above Nyquist left out, and the table has a row per
 * condition. The full run is the {@code accuracy} command's job, not a unit test's.
 */
class AccuracyGridTest {
  @Test
  void theQuickGridHasTwoConditionsAndSixteenCornerCells() {
    AccuracyBenchmark b = new AccuracyBenchmark(AccuracyBenchmark.Grid.quick(), 1);
    List<AccuracyBenchmark.Condition> conds = b.conditions();
    assertEquals(
        List.of(
            new AccuracyBenchmark.Condition(2, 10_000, 50_000),
            new AccuracyBenchmark.Condition(2, 0, 50_000)),
        conds);
    List<AccuracyBenchmark.Cell> cells = b.cells();
    assertEquals(16, cells.size());
    assertEquals(16, cells.stream().distinct().count(), "no cell twice");
    assertEquals(8, cells.stream().filter(AccuracyBenchmark.Cell::dendrite).count());
    // The quick grid holds the headline condition (10 kHz filter at 50 kHz sampling).
    assertTrue(conds.stream().anyMatch(AccuracyTable::isHeadline));
  }

  @Test
  void aFilterAtOrAboveNyquistIsNotACondition() {
    AccuracyBenchmark.Grid g =
        new AccuracyBenchmark.Grid(
            new double[] {0},
            new double[] {10_000, 25_000, 0},
            new double[] {50_000},
            new double[] {10},
            new double[] {500},
            new double[] {30},
            new boolean[] {false},
            2);
    assertEquals(
        List.of(
            new AccuracyBenchmark.Condition(0, 10_000, 50_000),
            new AccuracyBenchmark.Condition(0, 0, 50_000)),
        new AccuracyBenchmark(g, 1).conditions());
  }

  @Test
  void aTinyGridRunsEveryPairAndPrintsARowPerCondition() throws InterruptedException {
    // One noisy condition, a compact cell and one with a dendrite, 3 pulses each.
    AccuracyBenchmark.Grid g =
        new AccuracyBenchmark.Grid(
            new double[] {2},
            new double[] {10_000},
            new double[] {50_000},
            new double[] {10},
            new double[] {500},
            new double[] {30},
            new boolean[] {false, true},
            3);
    List<AccuracyBenchmark.Result> results = new AccuracyBenchmark(g, 1).run();
    assertEquals(2, results.size());
    for (AccuracyBenchmark.Result r : results) {
      assertEquals(3, r.pulses);
      assertEquals(3, r.accepted, "a well-resolved cell is accepted: " + r.cell);
      // Ra within 5 % of the circuit's truth at 2 pA (the backbone issue's noisy tolerance).
      assertTrue(r.tauwatch.absQuantile(0, 1.0) < 0.05, "Ra error " + r.tauwatch.absQuantile(0, 1));
    }
    assertEquals(3, results.get(1).twoExponential, "the dendrite's transient is two-exponential");
    StringWriter sw = new StringWriter();
    AccuracyTable.write(results, false, new PrintWriter(sw, true));
    String table = sw.toString();
    assertTrue(table.contains("Ra TW") && table.contains("Ra peak"), table);
    assertEquals(
        1,
        table.lines().filter(l -> l.matches("\\s+2\\s+10k\\s+50k\\s+6/6.*")).count(),
        "one row for the condition:\n" + table);
  }
}
