package tauwatch.bench;

import tauwatch.pulse.PulseWindow;
import tauwatch.sim.CellTruth;
import tauwatch.sim.Scenario;
import tauwatch.sim.SimulatedRecording;
import tauwatch.sim.TestPulseProtocol;

/**
 * Cuts the test pulses of a simulated recording into windows, each with the cell's truth at its
 * onset, without the segmenter: the pulse times are known from the protocol.
 *
 * <p>Single-threaded. Each {@link #next()} allocates a fresh window (benchmarks and tests, not the
 * sample path). A window holds {@code baselineMs} before the onset, the step, and {@code offMs}
 * after it; the timing follows the interchange contract (the onset row is the first that shows the
 * step and is still sampled before it acts).
 */
public final class SimulatedPulseTrain {
  private final SimulatedRecording recording;
  private final TestPulseProtocol protocol;
  private final double rateHz;
  private final int before;
  private final int width;
  private final int after;
  private final long period;
  private final long firstOnset;
  private final double[] cmd;
  private final double[] resp;
  private long pulse;
  private CellTruth truth;

  public SimulatedPulseTrain(Scenario scenario, long seed, double baselineMs, double offMs) {
    this.recording = new SimulatedRecording(scenario, seed);
    this.protocol = scenario.protocol();
    this.rateHz = scenario.amplifier().sampleRateHz();
    this.before = (int) Math.round(baselineMs * 1e-3 * rateHz);
    this.width = (int) Math.round(protocol.stepWidthMs() * 1e-3 * rateHz);
    this.after = (int) Math.round(offMs * 1e-3 * rateHz);
    this.period = Math.round(protocol.periodMs() * 1e-3 * rateHz);
    this.firstOnset = Math.round(protocol.firstOnsetMs() * 1e-3 * rateHz);
    if (before > firstOnset || before + width + after > period) {
      throw new IllegalArgumentException(
          "baseline and off window must fit between pulses (period "
              + protocol.periodMs()
              + " ms)");
    }
    int n = before + width + after;
    cmd = new double[n];
    resp = new double[n];
  }

  /** The next pulse's window. */
  public PulseWindow next() {
    long onset = firstOnset + pulse * period;
    long from = onset - before;
    long skip = from - recording.samplesGenerated();
    double[] scratch = new double[(int) Math.min(skip, 65_536)];
    double[] scratch2 = new double[scratch.length];
    while (skip > 0) {
      int k = (int) Math.min(skip, scratch.length);
      recording.fill(scratch, scratch2, 0, k);
      skip -= k;
    }
    int n = cmd.length;
    recording.fill(cmd, resp, 0, n);
    PulseWindow w = new PulseWindow(n);
    System.arraycopy(cmd, 0, w.command, 0, n);
    System.arraycopy(resp, 0, w.response, 0, n);
    w.length = n;
    w.onsetIndex = before;
    w.offsetIndex = before + width;
    w.firstSampleIndex = from;
    w.sampleIntervalS = 1 / rateHz;
    w.streamStartS = 0;
    w.holdingLevel = protocol.holdingLevel();
    w.stepLevel = protocol.holdingLevel() + protocol.stepLevel();
    w.mode = protocol.mode();
    w.filterCutoffHz = recording.scenario().amplifier().filterCutoffHz();
    pulse++;
    w.pulseNumber = pulse;
    truth = recording.truthAt(onset / rateHz);
    return w;
  }

  /** The truth at the onset of the pulse {@link #next()} returned last. */
  public CellTruth truth() {
    return truth;
  }

  public SimulatedRecording recording() {
    return recording;
  }
}
