package tauwatch.monitor;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import tauwatch.stream.ClampMode;
import tauwatch.stream.StreamFormat;

/**
 * The warm-up must exercise the path real pulses take — pulses cut by the segmenter and accepted by
 * the estimator, screen and health rules — at the stream's own rate, filter and mode, or it warms
 * the wrong branches.
 */
class AnalysisWarmUpTest {
  @ParameterizedTest
  @CsvSource({
    "VOLTAGE_CLAMP, 50000, 10000",
    "VOLTAGE_CLAMP, 20000, 0",
    "VOLTAGE_CLAMP, 100000, 5000",
    "CURRENT_CLAMP, 50000, 10000"
  })
  void simulatedPulsesAreCutAndAcceptedAtTheStreamsFormat(
      ClampMode mode, double rateHz, double cutoffHz) {
    StreamFormat format = new StreamFormat(rateHz, mode, cutoffHz, 0, "test");
    AnalysisWarmUp.Outcome o =
        AnalysisWarmUp.analyse(format, MonitorConfig.defaults(), 200, java.util.List.of());
    assertEquals(200, o.pulses());
    assertTrue(o.accepted() >= 190, "accepted " + o.accepted() + " of 200");
  }
}
