package tauwatch.bench;

import java.util.concurrent.atomic.AtomicReference;
import org.HdrHistogram.Histogram;
import tauwatch.fit.Parameter;
import tauwatch.fit.PulseEstimate;
import tauwatch.health.HealthSnapshot;
import tauwatch.monitor.EstimateListener;

/**
 * Stands in for the live view's model: per pulse it builds an immutable snapshot (the estimate's
 * values and the health it left) and publishes it through an {@link AtomicReference}, as the
 * pipeline hands data to a drawing thread; then it records the pulse-end → published latency.
 *
 * <p>Called on the analysis thread only (single writer of the histogram); read the histogram after
 * the session ends. Allocates one snapshot per pulse.
 */
final class SnapshotPublisher implements EstimateListener {
  /** What a drawing thread would read. Immutable. */
  record Snapshot(long pulse, double onsetTimeS, double[] values, HealthSnapshot health) {
    Snapshot {
      values = values.clone();
    }
  }

  private static final Parameter[] PARAMETERS = Parameter.values();

  /** 1 ns to 60 s, 3 significant digits. */
  final Histogram latencyNs = new Histogram(1, 60_000_000_000L, 3);

  final AtomicReference<Snapshot> latest = new AtomicReference<>();
  private final double[] scratch = new double[PARAMETERS.length];
  volatile long analysisThreadId = -1;
  private long warmUpPulses;
  private long seen;

  /** Pulses before this many are published but not timed (JIT warm-up). */
  SnapshotPublisher(long warmUpPulses) {
    this.warmUpPulses = warmUpPulses;
  }

  /** A publisher nobody reads, for the analysis warm-up. */
  @Override
  public EstimateListener warmUpTwin() {
    return new SnapshotPublisher(0);
  }

  @Override
  public void onEstimate(PulseEstimate e, HealthSnapshot health) {
    analysisThreadId = Thread.currentThread().getId();
    for (Parameter p : PARAMETERS) {
      scratch[p.ordinal()] = e.value(p);
    }
    latest.set(new Snapshot(e.pulseNumber(), e.onsetTimeS(), scratch, health));
    long received = e.pulseEndReceivedNanos();
    if (++seen > warmUpPulses && received > 0) {
      latencyNs.recordValue(Math.max(1, System.nanoTime() - received));
    }
  }
}
