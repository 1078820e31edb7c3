package tauwatch.checkout;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import tauwatch.fit.PulseEstimate;
import tauwatch.health.HealthSnapshot;
import tauwatch.health.Medians;
import tauwatch.monitor.EstimateListener;
import tauwatch.monitor.EstimateSummary;
import tauwatch.stream.StreamCounters;

/**
 * Judges a checkout run: compares the session's accepted estimates and stream counts with an
 * expectation and builds the pass/fail table.
 *
 * <p>As an {@link EstimateListener} it runs on the analysis thread, keeping the noise (fit residual
 * rms) of accepted pulses and every pulse's receive time, from which the sample rate is measured
 * against the wall clock ({@link WallClockRate}). {@link #judge} is called once after the session.
 */
public final class RigCheckout implements EstimateListener {
  private final CheckoutExpectation expectation;
  private final EstimateSummary summary = new EstimateSummary();
  private double[] noise = new double[64];
  private int noiseCount;
  private final WallClockRate rate = new WallClockRate();

  public RigCheckout(CheckoutExpectation expectation) {
    this.expectation = expectation;
  }

  @Override
  public void onEstimate(PulseEstimate e, HealthSnapshot health) {
    summary.onEstimate(e, health);
    if (e.pulseEndReceivedNanos() != 0) {
      rate.add(e.onsetTimeS(), e.pulseEndReceivedNanos());
    }
    if (e.accepted() && Double.isFinite(e.rmsResidual())) {
      if (noiseCount == noise.length) {
        noise = Arrays.copyOf(noise, noise.length * 2);
      }
      noise[noiseCount++] = e.rmsResidual();
    }
  }

  public EstimateSummary summary() {
    return summary;
  }

  /**
   * Builds the table.
   *
   * @param counters the session's stream counts
   * @param nominalRateHz the stream's nominal sample rate
   * @param live whether samples arrived in real time (else the rate is not measured)
   */
  public CheckoutReport judge(StreamCounters counters, double nominalRateHz, boolean live) {
    List<CheckoutReport.Row> rows = new ArrayList<>();
    for (CheckoutExpectation.Expected x : expectation.expected()) {
      int n = summary.count(x.parameter());
      double median = summary.median(x.parameter());
      rows.add(
          new CheckoutReport.Row(
              x.parameter().symbol(),
              x.parameter().unit(),
              fmt(x.nominal()),
              n == 0 ? "none" : fmt(median),
              n == 0
                  ? ""
                  : fmt(summary.quantile(x.parameter(), 0.05))
                      + "–"
                      + fmt(summary.quantile(x.parameter(), 0.95)),
              "±" + fmt(x.tolerancePercent()) + " %",
              n > 0 && median >= x.low() && median <= x.high()));
    }
    double noiseMedian = median(noise, noiseCount);
    rows.add(
        new CheckoutReport.Row(
            "noise",
            "pA rms",
            "≤ " + fmt(expectation.maxNoiseRmsPa()),
            noiseCount == 0 ? "none" : fmt(noiseMedian),
            "fit residual",
            "",
            noiseCount > 0 && noiseMedian <= expectation.maxNoiseRmsPa()));
    double measuredRate = Double.NaN;
    if (live && rate.spanNanos() > 1_000_000_000L) {
      measuredRate = rate.rateHz(nominalRateHz);
    }
    double tol = expectation.sampleRateTolerancePercent();
    rows.add(
        new CheckoutReport.Row(
            "sample rate",
            "Hz",
            fmt(nominalRateHz),
            Double.isNaN(measuredRate) ? "not paced" : fmt(measuredRate),
            live ? "vs wall clock" : "",
            "±" + fmt(tol) + " %",
            Double.isNaN(measuredRate)
                ? !live
                : Math.abs(measuredRate - nominalRateHz) <= nominalRateHz * tol / 100));
    rows.add(countRow("dropped frames", counters.droppedFrames(), expectation.maxDroppedFrames()));
    rows.add(countRow("corrupt frames", counters.corruptFrames(), expectation.maxCorruptFrames()));
    long lost = counters.gapSamples() + counters.overrunSamples();
    rows.add(countRow("lost samples", lost, expectation.maxLostSamples()));
    return new CheckoutReport(expectation.name(), summary.pulses(), summary.accepted(), rows);
  }

  private static CheckoutReport.Row countRow(String what, long count, long max) {
    return new CheckoutReport.Row(what, "", "≤ " + max, Long.toString(count), "", "", count <= max);
  }

  private static double median(double[] v, int n) {
    return Medians.inPlace(Arrays.copyOf(v, n), n);
  }

  static String fmt(double v) {
    return String.format(Locale.ROOT, "%.4g", v);
  }
}
