package tauwatch.sim;

import java.util.SplittableRandom;
import org.apache.commons.math3.linear.LUDecomposition;
import org.apache.commons.math3.linear.MatrixUtils;
import org.apache.commons.math3.linear.RealMatrix;
import org.apache.commons.math3.linear.RealVector;
import tauwatch.stream.ClampMode;
import tauwatch.stream.StreamFormat;

/**
 * A simulated whole-cell recording in voltage clamp or current clamp: the command and the recorded
 * response of a scenario, sample by sample, seeded and deterministic.
 *
 * <p>Single-threaded: one source thread owns an instance. {@link #fill} allocates nothing, boxes
 * nothing and takes no lock; everything else may allocate.
 *
 * <p>The cell and the amplifier's output filter form one linear system ({@link VoltageClampPlant}
 * or {@link CurrentClampPlant}, by the protocol's mode) which is discretised exactly for a command
 * held constant between samples ({@link ZeroOrderHold}). Timing follows the interchange contract:
 * the response of sample k is the output at t_k, reached under the previous command; the command of
 * sample k then acts over [t_k, t_k+1). While the schedule changes, the system is re-discretised
 * every {@value #REDISCRETISE_INTERVAL_MS} ms of stream time with the parameters at the middle of
 * the coming interval (a staircase of the schedule; nothing is recomputed while nothing changes).
 * The state carries over, so the membrane potential stays continuous. The recording starts in the
 * steady state at the holding potential.
 *
 * <p>Noise: white Gaussian current, held over each sample, enters the filter's input; its gain is
 * calibrated once from the discrete filter's noise gain Σ_j (C Ad^j Bw)² so that the output rms is
 * the configured one. Without a filter the noise is added to each sample directly. Hum is added at
 * the output, then the digitiser rounds and clips.
 *
 * <p>Contamination ({@link SynapticActivity}, {@link SpikeWaveform}) draws from its own seeded
 * generator, so a scenario without it produces exactly the samples it did before. Synaptic currents
 * enter the soma node like the command (held over each sample); a spike is added at the filter's
 * input when the soma potential crosses its threshold.
 */
public final class SimulatedRecording {
  /** Grid of stream time on which a changing schedule is re-applied. */
  public static final double REDISCRETISE_INTERVAL_MS = 10.0;

  private final Scenario scenario;
  private final StreamFormat format;
  private final ParameterSchedule schedule;
  private final ClampPlant plant;
  private final ZeroOrderHold zoh;
  private final TestPulseCommand pulses;
  private final AdcQuantiser adc;
  private final SplittableRandom random;
  private final int n;
  private final double sampleIntervalMs;
  private final int updateIntervalSamples;
  private final boolean changing;
  private final boolean filtered;

  // Continuous and discrete matrices, rebuilt in place.
  private final double[] a;
  private final double[] b;
  private final double[] c;
  private final double[] d;
  private final double[] ad;
  private final double[] bd;
  private final double[] bdCommand;
  private final double[] bdNoise;
  private final double[] bdSynaptic;
  private final double[] bias;
  private double dCommand;

  private final double[] values = new double[CellQuantity.COUNT];
  private final double[] applied = new double[CellQuantity.COUNT];

  private double[] x;
  private double[] xNext;
  private double previousCommandMv;
  private final boolean noisy;
  private final double directNoisePa;
  private final double filterNoisePa;
  private final boolean hum;
  private final double humAmplitudePa;
  private final double humStepCos;
  private final double humStepSin;
  private double humCos = 1;
  private double humSin = 0;

  private long samples;
  private int untilUpdate;

  // Synaptic events: two decaying states whose difference is the current (pA).
  private final boolean synaptic;
  private final SplittableRandom contamination;
  private final double eventProbability;
  private final double synAmplitudePa;
  private final double synSpread;
  private final double synRiseFactor;
  private final double synDecayFactor;
  private double synRise;
  private double synDecay;

  // Spikes (current clamp): the same two-state waveform, added at the output's input.
  private final boolean spiking;
  private final double spikeThresholdMv;
  private final double spikeAmplitudeMv;
  private final double spikeRiseFactor;
  private final double spikeDecayFactor;
  private final int refractorySamples;
  private double spikeRise;
  private double spikeDecay;
  private boolean spikeArmed = true;
  private int sinceSpike = Integer.MAX_VALUE;
  private long spikesFired;
  private long synapticEvents;

  /** A recording with the scenario's own seed. */
  public SimulatedRecording(Scenario scenario) {
    this(scenario, scenario.seed());
  }

  public SimulatedRecording(Scenario scenario, long seed) {
    this.scenario = scenario;
    AmplifierSettings amp = scenario.amplifier();
    ClampMode mode = scenario.protocol().mode();
    this.format =
        new StreamFormat(
            amp.sampleRateHz(), mode, amp.filterCutoffHz(), 0.0, "sim:" + scenario.name());
    this.schedule = scenario.schedule();
    this.changing = schedule.changesOverTime();
    BesselFilter filter = amp.hasFilter() ? new BesselFilter(amp.filterCutoffHz()) : null;
    this.plant =
        mode == ClampMode.CURRENT_CLAMP
            ? new CurrentClampPlant(schedule.hasDendrite(), filter, amp.bridgeBalanceMOhm())
            : new VoltageClampPlant(schedule.hasDendrite(), filter);
    this.n = plant.states();
    this.filtered = plant.filtered();
    int in = ClampPlant.INPUTS;
    this.zoh = new ZeroOrderHold(n, in);
    this.pulses = new TestPulseCommand(scenario.protocol(), amp.sampleRateHz());
    this.adc = new AdcQuantiser(amp.adcBits(), amp.adcRangePa());
    this.random = new SplittableRandom(seed);
    this.sampleIntervalMs = 1000.0 / amp.sampleRateHz();
    this.updateIntervalSamples =
        (int) Math.max(1, Math.round(REDISCRETISE_INTERVAL_MS / sampleIntervalMs));
    a = new double[n * n];
    b = new double[n * in];
    c = new double[n];
    d = new double[in];
    ad = new double[n * n];
    bd = new double[n * in];
    bdCommand = new double[n];
    bdNoise = new double[n];
    bdSynaptic = new double[n];
    bias = new double[n];
    x = new double[n];
    xNext = new double[n];

    schedule.valuesAt(midpointS(0), values);
    apply();
    previousCommandMv = scenario.protocol().holdingMv();
    startInSteadyState(previousCommandMv);

    noisy = amp.noiseRmsPa() > 0;
    if (plant.filtered()) {
      directNoisePa = 0;
      filterNoisePa = noisy ? amp.noiseRmsPa() / Math.sqrt(filterNoiseGainSquared()) : 0;
    } else {
      directNoisePa = amp.noiseRmsPa();
      filterNoisePa = 0;
    }
    hum = amp.humAmplitudePa() > 0;
    humAmplitudePa = amp.humAmplitudePa();
    double dPhase = 2 * Math.PI * amp.humFrequencyHz() / amp.sampleRateHz();
    humStepCos = Math.cos(dPhase);
    humStepSin = Math.sin(dPhase);
    untilUpdate = updateIntervalSamples;

    SynapticActivity syn = scenario.synaptic();
    synaptic = syn.active();
    contamination = new SplittableRandom(seed ^ 0x5EED_C0_17A1L);
    eventProbability = syn.rateHz() / amp.sampleRateHz();
    synAmplitudePa = syn.amplitudePa() * syn.peakNormalisation();
    synSpread = syn.amplitudeSpread();
    synRiseFactor = Math.exp(-sampleIntervalMs / syn.riseMs());
    synDecayFactor = Math.exp(-sampleIntervalMs / syn.decayMs());
    SpikeWaveform spk = scenario.spikes();
    spiking = spk.active() && mode == ClampMode.CURRENT_CLAMP;
    spikeThresholdMv = spk.thresholdMv();
    spikeAmplitudeMv = spk.amplitudeMv() * spk.peakNormalisation();
    spikeRiseFactor = Math.exp(-sampleIntervalMs / spk.riseMs());
    spikeDecayFactor = Math.exp(-sampleIntervalMs / spk.decayMs());
    refractorySamples = (int) Math.ceil(spk.refractoryMs() / sampleIntervalMs);
  }

  /** Synaptic events begun so far. */
  public long synapticEvents() {
    return synapticEvents;
  }

  /** Spikes fired so far (current clamp). */
  public long spikesFired() {
    return spikesFired;
  }

  public StreamFormat format() {
    return format;
  }

  public Scenario scenario() {
    return scenario;
  }

  public long samplesGenerated() {
    return samples;
  }

  /** Stream time of the next sample, s. */
  public double timeS() {
    return samples / format.sampleRateHz();
  }

  /** The cell's truth at stream time {@code tS}; see {@link CellTruth}. */
  public CellTruth truthAt(double tS) {
    return scenario.truthAt(tS);
  }

  /**
   * Writes the next {@code count} samples: the command (mV in VC, pA in CC) into {@code command}
   * and the recorded response (pA in VC, mV in CC) into {@code response}, from index {@code
   * offset}. Allocation-free.
   */
  public void fill(double[] command, double[] response, int offset, int count) {
    int i = offset;
    int end = offset + count;
    while (i < end) {
      if (untilUpdate == 0) {
        if (changing) {
          schedule.valuesAt(midpointS(samples), values);
          if (!sameAsApplied()) {
            apply();
          }
        }
        untilUpdate = updateIntervalSamples;
      }
      int chunk = Math.min(end - i, untilUpdate);
      run(command, response, i, chunk);
      i += chunk;
      untilUpdate -= chunk;
      samples += chunk;
    }
    // Keep the hum phasor on the unit circle against rounding drift.
    double norm = 1 / Math.sqrt(humCos * humCos + humSin * humSin);
    humCos *= norm;
    humSin *= norm;
  }

  private void run(double[] command, double[] response, int from, int count) {
    final int n = this.n;
    final double[] ad = this.ad;
    final double[] bdCommand = this.bdCommand;
    final double[] bdNoise = this.bdNoise;
    final double[] bdSynaptic = this.bdSynaptic;
    final double[] bias = this.bias;
    final double[] c = this.c;
    double[] x = this.x;
    double[] xn = this.xNext;
    double uPrev = previousCommandMv;
    for (int s = from, end = from + count; s < end; s++) {
      double g = noisy ? random.nextGaussian() : 0.0;
      double spike = 0;
      if (spiking) {
        spike = spikeAt(x[CellCircuit.SOMA]);
      }
      double y = dCommand * uPrev + directNoisePa * g;
      if (!filtered) {
        y += spike;
      }
      for (int r = 0; r < n; r++) {
        y += c[r] * x[r];
      }
      if (hum) {
        y += humAmplitudePa * humSin;
        double nc = humCos * humStepCos - humSin * humStepSin;
        humSin = humSin * humStepCos + humCos * humStepSin;
        humCos = nc;
      }
      double u = pulses.next();
      command[s] = u;
      response[s] = adc.quantise(y);
      double w = filterNoisePa * g + (filtered ? spike : 0);
      double iSyn = synaptic ? synapticCurrent() : 0;
      for (int r = 0; r < n; r++) {
        double acc = bias[r] + bdCommand[r] * u + bdNoise[r] * w + bdSynaptic[r] * iSyn;
        int row = r * n;
        for (int k = 0; k < n; k++) {
          acc += ad[row + k] * x[k];
        }
        xn[r] = acc;
      }
      double[] t = x;
      x = xn;
      xn = t;
      uPrev = u;
    }
    this.x = x;
    this.xNext = xn;
    previousCommandMv = uPrev;
  }

  /** The synaptic current over the coming sample (pA, inward positive); starts new events. */
  private double synapticCurrent() {
    if (contamination.nextDouble() < eventProbability) {
      double amp = synAmplitudePa * (1 + synSpread * (2 * contamination.nextDouble() - 1));
      synRise += amp;
      synDecay += amp;
      synapticEvents++;
    }
    double i = synDecay - synRise;
    synRise *= synRiseFactor;
    synDecay *= synDecayFactor;
    return i;
  }

  /** The spike waveform's value at this sample (mV), firing on an upward threshold crossing. */
  private double spikeAt(double somaMv) {
    if (sinceSpike < Integer.MAX_VALUE) {
      sinceSpike++;
    }
    if (somaMv < spikeThresholdMv) {
      spikeArmed = true;
    } else if (spikeArmed && sinceSpike >= refractorySamples) {
      spikeArmed = false;
      sinceSpike = 0;
      spikeRise += spikeAmplitudeMv;
      spikeDecay += spikeAmplitudeMv;
      spikesFired++;
    }
    double v = spikeDecay - spikeRise;
    spikeRise *= spikeRiseFactor;
    spikeDecay *= spikeDecayFactor;
    return v;
  }

  private double midpointS(long sampleIndex) {
    return (sampleIndex + 0.5 * updateIntervalSamples) / format.sampleRateHz();
  }

  private boolean sameAsApplied() {
    for (int i = 0; i < values.length; i++) {
      if (Double.compare(values[i], applied[i]) != 0) {
        return false;
      }
    }
    return true;
  }

  /** Rebuilds and re-discretises the system for {@link #values}. Allocation-free. */
  private void apply() {
    plant.build(values, a, b, c, d);
    zoh.discretise(a, b, sampleIntervalMs, ad, bd);
    int in = ClampPlant.INPUTS;
    double leak = values[CellQuantity.LEAK_REVERSAL_MV.ordinal()];
    for (int r = 0; r < n; r++) {
      bdCommand[r] = bd[r * in + ClampPlant.IN_COMMAND];
      bdNoise[r] = bd[r * in + ClampPlant.IN_NOISE];
      bdSynaptic[r] = bd[r * in + ClampPlant.IN_SYNAPTIC];
      bias[r] = bd[r * in + ClampPlant.IN_LEAK] * leak;
    }
    dCommand = d[ClampPlant.IN_COMMAND];
    System.arraycopy(values, 0, applied, 0, values.length);
  }

  /** x = −A⁻¹ B u for the holding command: no start-up transient. */
  private void startInSteadyState(double holdingMv) {
    int in = ClampPlant.INPUTS;
    RealMatrix am = MatrixUtils.createRealMatrix(n, n);
    RealVector rhs = MatrixUtils.createRealVector(new double[n]);
    double leak = values[CellQuantity.LEAK_REVERSAL_MV.ordinal()];
    for (int r = 0; r < n; r++) {
      for (int k = 0; k < n; k++) {
        am.setEntry(r, k, a[r * n + k]);
      }
      rhs.setEntry(
          r,
          -(b[r * in + ClampPlant.IN_COMMAND] * holdingMv + b[r * in + ClampPlant.IN_LEAK] * leak));
    }
    RealVector steady = new LUDecomposition(am).getSolver().solve(rhs);
    for (int r = 0; r < n; r++) {
      x[r] = steady.getEntry(r);
    }
  }

  /** Σ_j (C Ad^j Bw)²: the output variance per unit variance of the held noise input. */
  private double filterNoiseGainSquared() {
    double[] v = bdNoise.clone();
    double[] next = new double[n];
    double sum = 0;
    for (int j = 0; j < 10_000_000; j++) {
      double y = 0;
      for (int r = 0; r < n; r++) {
        y += c[r] * v[r];
      }
      sum += y * y;
      double size = 0;
      for (int r = 0; r < n; r++) {
        double acc = 0;
        for (int k = 0; k < n; k++) {
          acc += ad[r * n + k] * v[k];
        }
        next[r] = acc;
        size += acc * acc;
      }
      double[] t = v;
      v = next;
      next = t;
      if (j > 100 && size < 1e-30 * sum) {
        break;
      }
    }
    return sum;
  }
}
