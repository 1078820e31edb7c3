package tauwatch.bench;

import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import tauwatch.fit.Parameter;
import tauwatch.fit.PeakReadout;
import tauwatch.fit.PulseEstimate;
import tauwatch.fit.VoltageClampEstimator;
import tauwatch.pulse.PulseWindow;
import tauwatch.sim.AmplifierSettings;
import tauwatch.sim.CellParameters;
import tauwatch.sim.CellTruth;
import tauwatch.sim.ParameterSchedule;
import tauwatch.sim.Scenario;
import tauwatch.sim.TestPulseProtocol;

/**
 * Runs Tauwatch's voltage-clamp estimator and the naive raw-peak readout side by side over a grid
 * of simulated cells and recording conditions, and collects each one's relative errors against the
 * simulator's truth.
 *
 * <p>Used from one thread; {@link #run} fans the (condition, cell) tasks out over its own worker
 * pool, one estimator pair per task, and allocates freely (a benchmark, not the sample path).
 *
 * <p>Truth (see {@link CellTruth}): Ra and Rin are the apparent resistances at the pipette, τ the
 * transient's area over its initial amplitude (exactly τ = Ra·Rm·Cm/(Ra + Rm) for one compartment),
 * and Cm the capacitance the clamp charges as stored charge, {@link
 * CellTruth#storedChargeCapacitancePf} (Cm for a compact cell) — the quantity the issue asks the
 * estimator to report on a cell with a dendrite. Errors of both readouts are taken over the pulses
 * Tauwatch accepted; the fraction accepted is reported beside them.
 */
public final class AccuracyBenchmark {
  /** The parameters whose errors are tabulated, in table order. */
  public static final Parameter[] PARAMETERS = {
    Parameter.ACCESS_RESISTANCE,
    Parameter.INPUT_RESISTANCE,
    Parameter.MEMBRANE_CAPACITANCE,
    Parameter.TIME_CONSTANT
  };

  /** Dendrite of the benchmark's non-compact cells: Cd = 1.5·Cm, uniform τ_m, through 50 MΩ. */
  static final double DENDRITE_CAPACITANCE_RATIO = 1.5;

  static final double AXIAL_MOHM = 50;

  /** The recording conditions and cells of one run. */
  public record Grid(
      double[] noisePa,
      double[] filterHz,
      double[] rateHz,
      double[] accessMOhm,
      double[] inputMOhm,
      double[] capacitancePf,
      boolean[] dendrite,
      int pulsesPerCell) {

    /** The whole grid: 3 noise levels × 3 filters × 3 rates, 72 cells. */
    public static Grid full() {
      return new Grid(
          new double[] {0, 2, 5},
          new double[] {5000, 10000, 0},
          new double[] {20000, 50000, 100000},
          new double[] {5, 10, 20, 40},
          new double[] {100, 500, 2000},
          new double[] {5, 30, 200},
          new boolean[] {false, true},
          12);
    }

    /** A quick look: 2 pA, 10 kHz and no filter, 50 kHz; 16 cells over the corners. */
    public static Grid quick() {
      return new Grid(
          new double[] {2},
          new double[] {10000, 0},
          new double[] {50000},
          new double[] {5, 40},
          new double[] {100, 2000},
          new double[] {5, 200},
          new boolean[] {false, true},
          8);
    }
  }

  /** One recording condition. {@code filterHz} 0 = no filter. */
  public record Condition(double noisePa, double filterHz, double rateHz) {}

  /** One simulated cell, by its soma-equivalent targets (Rin is the cell's, access excluded). */
  public record Cell(double accessMOhm, double inputMOhm, double capacitancePf, boolean dendrite) {
    /**
     * The circuit: a soma, or a soma with a dendrite of 1.5× its capacitance on a membrane with one
     * time constant (Rd·Cd = Rm·Cm, Rall's uniform model) whose Rm is solved so that Rm ∥ (Rax +
     * Rd) is the target Rin. Perfect seal, leak reversal −65 mV.
     */
    CellParameters parameters() {
      if (!dendrite) {
        return CellParameters.soma(accessMOhm, inputMOhm, capacitancePf, -65);
      }
      double k = DENDRITE_CAPACITANCE_RATIO;
      // Rin = Rm·(Rax + Rm/k)/(Rm + Rax + Rm/k) is increasing in Rm: bisect.
      double lo = inputMOhm;
      double hi = inputMOhm * 10 + 10 * AXIAL_MOHM;
      for (int i = 0; i < 200; i++) {
        double rm = 0.5 * (lo + hi);
        double branch = AXIAL_MOHM + rm / k;
        if (rm * branch / (rm + branch) < inputMOhm) {
          lo = rm;
        } else {
          hi = rm;
        }
      }
      double rm = 0.5 * (lo + hi);
      return CellParameters.soma(accessMOhm, rm, capacitancePf, -65)
          .withDendrite(AXIAL_MOHM, rm / k, capacitancePf * k);
    }
  }

  /** Relative errors (signed, value/truth − 1) of one readout over the accepted pulses. */
  public static final class Errors {
    final double[][] values = new double[PARAMETERS.length][];
    final int[] counts = new int[PARAMETERS.length];

    Errors(int capacity) {
      for (int k = 0; k < PARAMETERS.length; k++) {
        values[k] = new double[capacity];
      }
    }

    void add(PulseEstimate e, double[] truth) {
      for (int k = 0; k < PARAMETERS.length; k++) {
        double v = e.value(PARAMETERS[k]);
        // A readout that gives no number counts as a total miss, not as a skipped pulse.
        double err = Double.isFinite(v) ? v / truth[k] - 1 : Double.POSITIVE_INFINITY;
        values[k][counts[k]++] = err;
      }
    }

    void addAll(Errors o) {
      for (int k = 0; k < PARAMETERS.length; k++) {
        if (counts[k] + o.counts[k] > values[k].length) {
          values[k] = java.util.Arrays.copyOf(values[k], 2 * (counts[k] + o.counts[k]));
        }
        System.arraycopy(o.values[k], 0, values[k], counts[k], o.counts[k]);
        counts[k] += o.counts[k];
      }
    }

    /**
     * The {@code q}-quantile (nearest rank) of |error| for parameter index {@code k}; NaN if none.
     */
    public double absQuantile(int k, double q) {
      int n = counts[k];
      if (n == 0) {
        return Double.NaN;
      }
      double[] a = new double[n];
      for (int i = 0; i < n; i++) {
        a[i] = Math.abs(values[k][i]);
      }
      java.util.Arrays.sort(a);
      int rank = (int) Math.ceil(q * n);
      return a[Math.max(0, Math.min(n - 1, rank - 1))];
    }

    public int count() {
      return counts[0];
    }
  }

  /** The outcome for one condition and one cell (or, merged, for one condition). */
  public static final class Result {
    public final Condition condition;
    public final Cell cell;
    public final Errors tauwatch;
    public final Errors peak;
    public int pulses;
    public int accepted;
    public int twoExponential;

    Result(Condition condition, Cell cell, int capacity) {
      this.condition = condition;
      this.cell = cell;
      this.tauwatch = new Errors(capacity);
      this.peak = new Errors(capacity);
    }

    void merge(Result r) {
      tauwatch.addAll(r.tauwatch);
      peak.addAll(r.peak);
      pulses += r.pulses;
      accepted += r.accepted;
      twoExponential += r.twoExponential;
    }
  }

  private final Grid grid;
  private final int threads;

  public AccuracyBenchmark(Grid grid, int threads) {
    this.grid = grid;
    this.threads = Math.max(1, threads);
  }

  public List<Condition> conditions() {
    List<Condition> out = new ArrayList<>();
    for (double noise : grid.noisePa()) {
      for (double filter : grid.filterHz()) {
        for (double rate : grid.rateHz()) {
          // A filter at or above Nyquist is not a condition anyone records with.
          if (filter == 0 || filter < rate / 2) {
            out.add(new Condition(noise, filter, rate));
          }
        }
      }
    }
    return out;
  }

  public List<Cell> cells() {
    List<Cell> out = new ArrayList<>();
    for (boolean d : grid.dendrite()) {
      for (double ra : grid.accessMOhm()) {
        for (double rin : grid.inputMOhm()) {
          for (double cm : grid.capacitancePf()) {
            out.add(new Cell(ra, rin, cm, d));
          }
        }
      }
    }
    return out;
  }

  /** Every (condition, cell) result, in condition-major order. */
  public List<Result> run() throws InterruptedException {
    List<Condition> conds = conditions();
    List<Cell> cells = cells();
    ExecutorService pool = Executors.newFixedThreadPool(threads);
    try {
      List<Future<Result>> futures = new ArrayList<>();
      long seed = 1;
      for (Condition c : conds) {
        for (Cell cell : cells) {
          long s = seed++;
          futures.add(pool.submit(() -> runOne(c, cell, s)));
        }
      }
      List<Result> out = new ArrayList<>();
      for (Future<Result> f : futures) {
        try {
          out.add(f.get());
        } catch (ExecutionException e) {
          throw new IllegalStateException("benchmark task failed: " + e.getCause(), e.getCause());
        }
      }
      return out;
    } finally {
      pool.shutdownNow();
    }
  }

  /** The results of one condition merged over its cells (in {@link #conditions()} order). */
  public static List<Result> byCondition(List<Result> results) {
    List<Result> out = new ArrayList<>();
    for (Result r : results) {
      Result last = out.isEmpty() ? null : out.get(out.size() - 1);
      if (last == null || !last.condition.equals(r.condition)) {
        last = new Result(r.condition, null, 16);
        out.add(last);
      }
      last.merge(r);
    }
    return out;
  }

  /**
   * One cell under one condition: pulses long enough for the slowest time constant to decay ten
   * times over (the estimator asks for several), with a 3 ms baseline; without noise one pulse, as
   * every pulse is then the same.
   */
  Result runOne(Condition c, Cell cell, long seed) {
    CellParameters p = cell.parameters();
    CellTruth t0 = CellTruth.of(0, p, -70);
    double slowestMs = Double.isNaN(t0.slowTauMs()) ? t0.tauMs() : t0.slowTauMs();
    double widthMs = Math.max(10, Math.ceil(10 * slowestMs));
    double baselineMs = 3;
    double periodMs = 2 * widthMs + 2 * baselineMs + 1;
    TestPulseProtocol protocol = new TestPulseProtocol(-70, -5, widthMs, periodMs, 2 * baselineMs);
    AmplifierSettings amp =
        new AmplifierSettings(c.rateHz(), c.filterHz(), c.noisePa(), 0, 50, 16, 2000);
    Scenario s =
        new Scenario("accuracy", "", 60, seed, protocol, amp, ParameterSchedule.constant(p));
    SimulatedPulseTrain train = new SimulatedPulseTrain(s, seed, baselineMs, widthMs);
    VoltageClampEstimator tauwatch = new VoltageClampEstimator();
    PeakReadout peak = new PeakReadout();
    int pulses = c.noisePa() == 0 ? 1 : grid.pulsesPerCell();
    Result r = new Result(c, cell, pulses);
    for (int i = 0; i < pulses; i++) {
      PulseWindow w = train.next();
      CellTruth t = train.truth();
      double[] truth = {t.accessMOhm(), t.inputMOhm(), t.storedChargeCapacitancePf(), t.tauMs()};
      PulseEstimate e = tauwatch.estimate(w);
      r.pulses++;
      if (!e.accepted()) {
        continue;
      }
      r.accepted++;
      if ("bi".equals(e.model())) {
        r.twoExponential++;
      }
      r.tauwatch.add(e, truth);
      r.peak.add(peak.estimate(w), truth);
    }
    return r;
  }
}
