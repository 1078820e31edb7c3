package tauwatch.endtoend;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/**
 * {@code replay} of interchange CSV files the estimator was never tuned on, through the whole chain
 * (CSV reader, segmenter, estimator, logs), against the truth recorded beside each file.
 *
 * <p>Two outside references: NEURON 8.2.2 (a passive soma under SEClamp with series resistance rs;
 * {@code src/test/python/neuron/passive_seclamp.py}) and SciPy's analog 4-pole Bessel filter
 * applied to the exact RC transient ({@code src/test/python/unseen/make_unseen.py}). Tolerances
 * from the backbone issue: 2 % on clean traces, 5 % (median over pulses) with 2–3 pA rms noise and
 * a 10 kHz filter at 50 kHz.
 */
class ReplayFixturesTest {
  @TempDir Path logs;

  private static final ObjectMapper JSON = new ObjectMapper();

  @ParameterizedTest(name = "{0}")
  @CsvSource({
    "neuron/soma20_clean, soma20_clean.json, 0.02",
    "neuron/soma30_clean, soma30_clean.json, 0.02",
    "neuron/soma60_clean, soma60_clean.json, 0.02",
    "neuron/soma30_filtered_noisy, soma30_filtered_noisy.json, 0.05",
    "unseen/cellA_clean, cellA_clean.truth.json, 0.02",
    "unseen/cellB_clean, cellB_clean.truth.json, 0.02",
    "unseen/cellC_clean, cellC_clean.truth.json, 0.02",
    "unseen/cellA_noisy, cellA_noisy.truth.json, 0.05",
    "unseen/cellB_noisy, cellB_noisy.truth.json, 0.05",
    "unseen/cellC_noisy, cellC_noisy.truth.json, 0.05",
  })
  void replayRecoversTheCellWithinTolerance(String fixture, String truthFile, double tolerance)
      throws Exception {
    Path csv = Path.of("src/test/resources/fixtures/" + fixture + ".csv");
    JsonNode truth = JSON.readTree(Files.readString(csv.resolveSibling(truthFile)));
    double filterHz = truth.path("filter_cutoff_hz").asDouble(0);
    SessionFiles s =
        SessionFiles.run(
            logs, "replay", csv.toString(), "--filter-cutoff-hz", Double.toString(filterHz));
    assertEquals(0, s.exitCode, s.err);
    List<Map<String, String>> rows = s.csv("params.csv");
    assertTrue(rows.size() >= 2, "pulses found: " + rows.size());
    List<Map<String, String>> accepted =
        rows.stream().filter(r -> r.get("accepted").equals("true")).toList();
    assertTrue(
        accepted.size() >= Math.max(2, rows.size() - 1),
        "accepted " + accepted.size() + " of " + rows.size() + ": " + rows);
    check(accepted, "ra_mohm", truth.get("ra_mohm").asDouble(), tolerance);
    check(accepted, "rin_mohm", truth.get("rin_mohm").asDouble(), tolerance);
    check(accepted, "cm_pf", truth.get("cm_pf").asDouble(), tolerance);
  }

  private static void check(
      List<Map<String, String>> rows, String column, double truth, double tolerance) {
    double[] v =
        rows.stream().mapToDouble(r -> Double.parseDouble(r.get(column))).sorted().toArray();
    double median =
        v.length % 2 == 1 ? v[v.length / 2] : 0.5 * (v[v.length / 2 - 1] + v[v.length / 2]);
    double err = Math.abs(median / truth - 1);
    assertTrue(
        err <= tolerance,
        String.format(
            "%s median %.4g vs truth %.4g: error %.2f %% > %.0f %% (values %s)",
            column, median, truth, 100 * err, 100 * tolerance, Arrays.toString(v)));
  }
}
