package tauwatch.bench.naive;

import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.List;
import java.util.function.Consumer;

/**
 * Finds test pulses sample by sample the plain way: command edges against the first command level,
 * the last few milliseconds kept in an {@link ArrayDeque}, each window collected in a fresh {@link
 * ArrayList} and handed to the {@link NaiveEstimator} when its off-transient is complete.
 *
 * <p>Single-threaded (the naive consumer thread). Without an estimator (null) windows are only cut,
 * for timing the segmenting alone. Windows follow the product's defaults: 3 ms of baseline, steps
 * up to 200 ms, 20 ms after the step ({@code SegmenterOptions.defaults()}).
 */
public final class NaivePulseFinder {
  private final int baselineSamples;
  private final int maxStepSamples;
  private final int offSamples;
  private final double thresholdMv;
  private final double sampleIntervalS;
  private final NaiveEstimator estimator;
  private final Consumer<NaiveEstimate> out;

  private final ArrayDeque<Sample> recent = new ArrayDeque<>();
  private List<Sample> window;
  private int onset;
  private int offset;
  private Double holdingMv;
  private long pulses;

  public NaivePulseFinder(
      double sampleRateHz,
      double thresholdMv,
      double baselineMs,
      double maxStepMs,
      double offWindowMs,
      NaiveEstimator estimator,
      Consumer<NaiveEstimate> out) {
    this.baselineSamples = (int) Math.round(baselineMs * 1e-3 * sampleRateHz);
    this.maxStepSamples = (int) Math.round(maxStepMs * 1e-3 * sampleRateHz);
    this.offSamples = (int) Math.round(offWindowMs * 1e-3 * sampleRateHz);
    this.thresholdMv = thresholdMv;
    this.sampleIntervalS = 1 / sampleRateHz;
    this.estimator = estimator;
    this.out = out;
  }

  public void onSample(Sample s) {
    if (holdingMv == null) {
      holdingMv = s.commandMv();
    }
    boolean away = Math.abs(s.commandMv() - holdingMv) > thresholdMv;
    if (window == null) {
      if (away && recent.size() >= baselineSamples / 2) {
        window = new ArrayList<>(recent);
        onset = window.size();
        offset = -1;
        window.add(s);
      }
    } else if (offset < 0) {
      window.add(s);
      if (!away) {
        offset = window.size() - 1;
      } else if (window.size() - onset > maxStepSamples) {
        window = null; // too long for a test pulse
      }
    } else {
      window.add(s);
      if (window.size() - offset == offSamples) {
        ++pulses;
        out.accept(
            estimator == null
                ? new NaiveEstimate(
                    pulses,
                    Double.NaN,
                    Double.NaN,
                    Double.NaN,
                    Double.NaN,
                    Double.NaN,
                    Double.NaN,
                    Double.NaN,
                    false,
                    s.receivedNanos())
                : estimator.estimate(pulses, window, onset, offset, sampleIntervalS));
        window = null;
      }
    }
    recent.addLast(s);
    if (recent.size() > baselineSamples) {
      recent.removeFirst();
    }
  }

  public long pulses() {
    return pulses;
  }
}
