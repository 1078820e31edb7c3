package tauwatch.monitor;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.time.Duration;
import org.junit.jupiter.api.Test;

/** A session's duration in samples: exact, as counted by hand (rate × time, rounded up). */
class MonitorDurationTest {
  @Test
  void wholeDurationsGiveExactlyRateTimesTime() {
    // In doubles, 240 s · 1e-9 · 50 kHz rounds to just above 12 000 000 and the ceiling adds one.
    assertEquals(12_000_000, Monitor.samplesIn(Duration.ofSeconds(240), 50_000));
    assertEquals(250_000, Monitor.samplesIn(Duration.ofSeconds(5), 50_000));
    assertEquals(8_640_000_000L, Monitor.samplesIn(Duration.ofHours(24), 100_000));
    assertEquals(3_600_000_000_000L, Monitor.samplesIn(Duration.ofHours(1000), 1_000_000));
    for (int s = 1; s <= 3600; s++) {
      assertEquals(50_000L * s, Monitor.samplesIn(Duration.ofSeconds(s), 50_000), s + " s");
      assertEquals(20_000L * s, Monitor.samplesIn(Duration.ofSeconds(s), 20_000), s + " s");
    }
  }

  @Test
  void aPartialSampleCountsAsOne() {
    assertEquals(1, Monitor.samplesIn(Duration.ofNanos(1), 50_000));
    assertEquals(51, Monitor.samplesIn(Duration.ofMillis(1).plusNanos(1), 50_000));
    assertEquals(10_001, Monitor.samplesIn(Duration.ofMillis(1000).plusNanos(1), 10_000));
    assertEquals(3, Monitor.samplesIn(Duration.ofMillis(1), 2_500.5)); // 2.5005 samples
  }
}
