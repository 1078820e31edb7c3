package tauwatch.bench.naive;

/**
 * One sample of both channels as its own object, as a first version passes samples around.
 *
 * <p>Immutable. Allocated per sample by design: this is the baseline being measured against.
 *
 * @param index stream index of the sample
 * @param commandMv command channel, mV
 * @param responsePa response channel, pA
 * @param receivedNanos {@link System#nanoTime()} (or the capture's recorded time) on arrival
 */
public record Sample(long index, double commandMv, double responsePa, long receivedNanos) {
  /** Marks the end of the stream on the queue. */
  public static final Sample END = new Sample(-1, Double.NaN, Double.NaN, 0);
}
