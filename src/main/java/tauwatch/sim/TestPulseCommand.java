package tauwatch.sim;

/**
 * Generates the command potential of a {@link TestPulseProtocol} sample by sample.
 *
 * <p>Single-threaded, allocation-free. Onset, width and period are rounded to whole samples, so
 * that the step edges fall on sample instants as a DAQ's output would.
 */
public final class TestPulseCommand {
  private final double holdingMv;
  private final double stepMv;
  private final long onsetSamples;
  private final long widthSamples;
  private final long periodSamples;
  private long index;
  private long phase;

  public TestPulseCommand(TestPulseProtocol protocol, double sampleRateHz) {
    this.holdingMv = protocol.holdingMv();
    this.stepMv = protocol.stepMv();
    this.onsetSamples = Math.round(protocol.firstOnsetMs() * sampleRateHz / 1000.0);
    this.widthSamples = Math.round(protocol.stepWidthMs() * sampleRateHz / 1000.0);
    this.periodSamples = Math.round(protocol.periodMs() * sampleRateHz / 1000.0);
    if (widthSamples < 1 || periodSamples <= widthSamples) {
      throw new IllegalArgumentException(
          "test pulse of "
              + protocol.stepWidthMs()
              + " ms every "
              + protocol.periodMs()
              + " ms does not fit the sample rate "
              + sampleRateHz
              + " Hz");
    }
  }

  /** The command of the next sample, mV. */
  public double next() {
    long i = index++;
    if (i < onsetSamples) {
      return holdingMv;
    }
    long p = phase;
    phase = p + 1 == periodSamples ? 0 : p + 1;
    return p < widthSamples ? holdingMv + stepMv : holdingMv;
  }

  public long onsetSamples() {
    return onsetSamples;
  }

  public long widthSamples() {
    return widthSamples;
  }

  public long periodSamples() {
    return periodSamples;
  }
}
