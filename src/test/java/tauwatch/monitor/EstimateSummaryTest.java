package tauwatch.monitor;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;
import tauwatch.fit.Parameter;
import tauwatch.fit.PulseEstimate;
import tauwatch.stream.ClampMode;

/** The closing summary stays exact for short sessions and bounded for day-long ones. */
class EstimateSummaryTest {
  private static PulseEstimate pulse(long n, double raMOhm) {
    return PulseEstimate.builder()
        .pulseNumber(n)
        .onsetTimeS(n * 0.5)
        .mode(ClampMode.VOLTAGE_CLAMP)
        .stepAmplitude(-5)
        .value(Parameter.ACCESS_RESISTANCE, raMOhm, 0.1)
        .build();
  }

  @Test
  void quantilesAreExactWhileEveryValueIsKept() {
    EstimateSummary s = new EstimateSummary();
    for (int i = 1; i <= 101; i++) {
      s.onEstimate(pulse(i, i), null);
    }
    // Linear-interpolation quantiles of 1..101 (the definition in EstimateSummary): exact values.
    assertEquals(51.0, s.median(Parameter.ACCESS_RESISTANCE), 0);
    assertEquals(6.0, s.quantile(Parameter.ACCESS_RESISTANCE, 0.05), 0);
    assertEquals(101, s.count(Parameter.ACCESS_RESISTANCE));
  }

  @Test
  void aDayOfPulsesKeepsABoundedUniformSample() {
    EstimateSummary s = new EstimateSummary();
    int n = 172_800; // 24 h at two pulses a second
    for (int i = 1; i <= n; i++) {
      s.onEstimate(pulse(i, i), null);
    }
    assertEquals(n, s.count(Parameter.ACCESS_RESISTANCE));
    assertEquals(EstimateSummary.CAPACITY, s.values(Parameter.ACCESS_RESISTANCE).length);
    assertTrue(s.retained() <= EstimateSummary.CAPACITY * Parameter.values().length);
    // A uniform sample of 8192 from 1..n: the sample median's sd is ≈ n/(2·sqrt(8192)) ≈ 0.55 % of
    // n (order-statistic asymptotics); 3 % is > 5 sd, and the seed is fixed.
    double median = s.median(Parameter.ACCESS_RESISTANCE);
    assertEquals(n / 2.0, median, 0.03 * n, "median of the sample");
    double p95 = s.quantile(Parameter.ACCESS_RESISTANCE, 0.95);
    assertEquals(0.95 * n, p95, 0.03 * n, "95th percentile of the sample");
  }
}
