package tauwatch.record;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTimeoutPreemptively;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.Writer;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import tauwatch.event.StreamClock;
import tauwatch.fit.Parameter;
import tauwatch.fit.PulseEstimate;
import tauwatch.health.HealthSnapshot;
import tauwatch.health.HealthState;
import tauwatch.stream.ClampMode;

/** The params log's writer thread: every row, in order, and failures reported, never swallowed. */
class ParamsLogTest {
  private static PulseEstimate estimate(long pulse) {
    return PulseEstimate.builder()
        .pulseNumber(pulse)
        .onsetTimeS(0.5 * pulse)
        .mode(ClampMode.VOLTAGE_CLAMP)
        .stepAmplitude(-5)
        .value(Parameter.ACCESS_RESISTANCE, 10 + 1e-3 * pulse, 0.1)
        .build();
  }

  private static HealthSnapshot health(long pulse) {
    return new HealthSnapshot(pulse, 0.5 * pulse, HealthState.STEADY, Map.of(), false, 0);
  }

  @Test
  void everyRowArrivesInOrderEvenWhenTheQueueFills(@TempDir Path dir) throws IOException {
    Path file = dir.resolve("params.csv");
    int n = 3 * ParamsLog.QUEUE_ROWS;
    try (ParamsLog log = new ParamsLog(file, new StreamClock(0), false)) {
      for (long p = 1; p <= n; p++) {
        log.write(estimate(p), health(p));
      }
    }
    List<String> lines = Files.readAllLines(file);
    assertEquals(ParamsLog.header(false), lines.get(0));
    assertEquals(n + 1, lines.size());
    for (int p = 1; p <= n; p++) {
      assertEquals(String.valueOf(p), CsvText.split(lines.get(p)).get(2), "row " + p);
    }
  }

  @Test
  void aWriteFailureIsReportedOnceAndTheAnalysisNeverBlocks() throws IOException {
    // A disk that fails after the header and a few rows.
    Writer failing =
        new Writer() {
          private int chars;

          @Override
          public void write(char[] b, int off, int len) throws IOException {
            chars += len;
            if (chars > 2000) {
              throw new IOException("disk full");
            }
          }

          @Override
          public void flush() {}

          @Override
          public void close() {}
        };
    ParamsLog log = new ParamsLog(Path.of("params.csv"), failing, new StreamClock(0), false);
    int[] reported = {0};
    assertTimeoutPreemptively(
        Duration.ofSeconds(20),
        () -> {
          for (long p = 1; p <= 3 * ParamsLog.QUEUE_ROWS; p++) {
            try {
              log.write(estimate(p), health(p));
            } catch (IOException e) {
              assertEquals("disk full", e.getMessage());
              reported[0]++;
            }
          }
        });
    if (reported[0] == 0) {
      // The failure came after the last write: close reports it.
      IOException e = assertThrows(IOException.class, log::close);
      assertEquals("disk full", e.getMessage());
    } else {
      assertEquals(1, reported[0]);
      log.close();
    }
    assertTrue(log.rows() < 3 * ParamsLog.QUEUE_ROWS);
  }
}
