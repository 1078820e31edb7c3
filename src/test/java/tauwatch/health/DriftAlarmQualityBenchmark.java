package tauwatch.health;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.EnumMap;
import java.util.List;
import java.util.Locale;
import java.util.Random;
import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.Test;
import tauwatch.fit.Parameter;
import tauwatch.monitor.Monitor;
import tauwatch.monitor.MonitorConfig;
import tauwatch.monitor.PulseEstimators;
import tauwatch.sim.ScenarioLoader;
import tauwatch.sim.SimulatedRecording;
import tauwatch.source.SimulatedSource;

/**
 * Alarm quality of the change detector per setting: detection delay for steps and ramps of 10, 20
 * and 50 % in Ra, Rin and Cm, and false alarms per 24 h on a stationary cell. A benchmark, not a
 * test: excluded from the test run (tag {@code bench}); run with {@code mvn -B -q -o test
 * -Dtest=DriftAlarmQualityBenchmark -Dsurefire.excludedGroups=none}. Prints a Markdown table (the
 * one in {@code docs/drift.md}) and writes it to {@code target/drift-benchmark.md}.
 *
 * <p>The per-pulse noise of each parameter is measured once from the real chain (the simulated
 * steady cell, 300 pulses through segmenter and estimator); the detector then runs on long
 * synthetic Gaussian series with that noise, which is what makes 24-hour runs cheap.
 */
@Tag("bench")
class DriftAlarmQualityBenchmark {
  private static final Parameter[] CHANGED = {
    Parameter.ACCESS_RESISTANCE, Parameter.INPUT_RESISTANCE, Parameter.MEMBRANE_CAPACITANCE
  };
  private static final Parameter[] STATIONARY = {
    Parameter.ACCESS_RESISTANCE,
    Parameter.INPUT_RESISTANCE,
    Parameter.MEMBRANE_CAPACITANCE,
    Parameter.HOLDING_CURRENT
  };
  private static final double[] SIZES = {0.10, 0.20, 0.50};
  private static final int CHANGE_INDEX = 300; // 0-based: pulse 301, t = 150.1 s
  private static final int RAMP_PULSES = 600; // the ramp reaches its size in 5 minutes
  private static final int SERIES = 1500;
  private static final int REPS = 20;
  private static final int DAYS = 5;
  private static final int PULSES_PER_DAY = 172_800;
  private static final double PULSE_S = 0.5;

  private final EnumMap<Parameter, double[]> meanAndSd = new EnumMap<>(Parameter.class);

  @Test
  void printAlarmQualityTable() throws Exception {
    measureNoise();
    StringBuilder md = new StringBuilder();
    md.append("Measured per-pulse noise (steady-cell, 300 pulses, real chain):\n\n");
    md.append("| parameter | mean | sd | sd % |\n|---|---|---|---|\n");
    for (Parameter p : STATIONARY) {
      double[] m = meanAndSd.get(p);
      md.append(
          String.format(
              Locale.ROOT,
              "| %s | %.4g %s | %.3g | %.2f %% |%n",
              p.symbol(),
              m[0],
              p.unit(),
              m[1],
              100 * m[1] / Math.abs(m[0])));
    }
    md.append(
        "\nDelay = pulses from the true change to `drifting` (median over Ra, Rin, Cm × "
            + REPS
            + " seeds; worst parameter median in brackets); 2 pulses/s. Ramps reach their size in"
            + " 5 min. False alarms: per cell (Ra, Rin, Cm, holding) per 24 h, over "
            + DAYS
            + " simulated days.\n\n");
    md.append(
        "| k (σ) | h (σ) | false alarms / 24 h | step 10 % | step 20 % | step 50 % | ramp 10 % |"
            + " ramp 20 % | ramp 50 % | ramp 10 %: change at detection |\n");
    md.append("|---|---|---|---|---|---|---|---|---|---|\n");
    double[][] grid = {
      {0.5, 8}, {0.5, 12}, {0.5, 16}, {0.75, 8}, {0.75, 12}, {1.0, 6}, {1.0, 8}, {1.0, 12}
    };
    for (double[] g : grid) {
      DriftDetection s = DriftDetection.defaults().with(g[0], g[1]);
      double fa = falseAlarmsPerDay(s);
      md.append(String.format(Locale.ROOT, "| %.2f | %.0f | %.2f |", g[0], g[1], fa));
      double rampChange = Double.NaN;
      for (boolean ramp : new boolean[] {false, true}) {
        for (double size : SIZES) {
          double[] medians = new double[CHANGED.length];
          List<Double> all = new ArrayList<>();
          List<Double> changeAt = new ArrayList<>();
          for (int pi = 0; pi < CHANGED.length; pi++) {
            double[] d = delays(s, CHANGED[pi], ramp, size, changeAt);
            medians[pi] = median(d);
            for (double v : d) {
              all.add(v);
            }
          }
          double worst = Arrays.stream(medians).max().orElse(Double.NaN);
          md.append(
              String.format(
                  Locale.ROOT,
                  " %.0f (%.0f) |",
                  median(all.stream().mapToDouble(Double::doubleValue).toArray()),
                  worst));
          if (ramp && size == 0.10) {
            rampChange = median(changeAt.stream().mapToDouble(Double::doubleValue).toArray());
          }
        }
      }
      md.append(String.format(Locale.ROOT, " %+.1f %% |%n", rampChange));
    }
    md.append("\nDefault setting, per parameter (median over ").append(REPS).append(" seeds):\n\n");
    md.append(
        "| parameter | change | delay (pulses) | delay (s) | change point − true start (pulses)"
            + " |\n|---|---|---|---|---|\n");
    DriftDetection s = DriftDetection.defaults();
    for (Parameter p : CHANGED) {
      for (boolean ramp : new boolean[] {false, true}) {
        for (double size : SIZES) {
          List<Double> cp = new ArrayList<>();
          double[] d = delays(s, p, ramp, size, null, cp);
          double med = median(d);
          md.append(
              String.format(
                  Locale.ROOT,
                  "| %s | %s %.0f %% | %.0f | %.1f | %+.0f |%n",
                  p.symbol(),
                  ramp ? "ramp" : "step",
                  100 * size,
                  med,
                  med * PULSE_S,
                  median(cp.stream().mapToDouble(Double::doubleValue).toArray())));
        }
      }
    }
    System.out.println(md);
    Files.createDirectories(Path.of("target"));
    Files.writeString(Path.of("target/drift-benchmark.md"), md.toString());
  }

  private void measureNoise() throws Exception {
    Path dir = Files.createTempDirectory("drift-bench");
    MonitorConfig config = MonitorConfig.defaults();
    SimulatedSource src =
        new SimulatedSource(
            new SimulatedRecording(ScenarioLoader.loadBuiltIn("steady-cell"), 1), false);
    EnumMap<Parameter, List<Double>> values = new EnumMap<>(Parameter.class);
    Monitor m =
        new Monitor(src, config, PulseEstimators.forFormat(src.format(), config), dir)
            .addListener(
                (e, h) -> {
                  if (e.accepted()) {
                    for (Parameter p : STATIONARY) {
                      values.computeIfAbsent(p, k -> new ArrayList<>()).add(e.value(p));
                    }
                  }
                });
    m.run(java.time.Duration.ofSeconds(150));
    for (Parameter p : STATIONARY) {
      double[] v = values.get(p).stream().mapToDouble(Double::doubleValue).toArray();
      double mean = Arrays.stream(v).average().orElseThrow();
      double ss = 0;
      for (double x : v) {
        ss += (x - mean) * (x - mean);
      }
      meanAndSd.put(p, new double[] {mean, Math.sqrt(ss / (v.length - 1))});
    }
  }

  /** Runs a detector the way the monitor does: baseline = median of the first 20 pulses. */
  private static final class Run {
    final ChangeDetector d;
    final double[] first = new double[HealthCriteria.DEFAULT_BASELINE_PULSES];
    int n;
    double baseline = Double.NaN;

    Run(DriftDetection s, boolean up, boolean down) {
      d = new ChangeDetector(s, up, down);
    }

    boolean step(long pulse, double x) {
      if (n < first.length) {
        first[n++] = x;
        if (n == first.length) {
          baseline = median(first.clone());
        }
      }
      d.update(pulse, 0.1 + (pulse - 1) * PULSE_S, x, Double.NaN, baseline);
      return d.flagged() != ChangeDetector.NONE;
    }
  }

  private double falseAlarmsPerDay(DriftDetection s) {
    long alarms = 0;
    for (int day = 0; day < DAYS; day++) {
      for (Parameter p : STATIONARY) {
        double[] m = meanAndSd.get(p);
        Random rnd = new Random(1000L * day + p.ordinal());
        // Holding current is limited only from below (common-practice default).
        Run r = new Run(s, p != Parameter.HOLDING_CURRENT, true);
        for (int i = 1; i <= PULSES_PER_DAY; i++) {
          if (r.step(i, m[0] + m[1] * rnd.nextGaussian())) {
            alarms++;
            r.d.restart(); // as if the user set a new baseline after the alarm
          }
        }
      }
    }
    return alarms / (double) DAYS;
  }

  private double[] delays(
      DriftDetection s, Parameter p, boolean ramp, double size, List<Double> changeAt) {
    return delays(s, p, ramp, size, changeAt, null);
  }

  private double[] delays(
      DriftDetection s,
      Parameter p,
      boolean ramp,
      double size,
      List<Double> changeAt,
      List<Double> changePoints) {
    double[] m = meanAndSd.get(p);
    double[] out = new double[REPS];
    for (int rep = 0; rep < REPS; rep++) {
      Random rnd = new Random(77L * rep + 13 * p.ordinal() + (ramp ? 5 : 0));
      Run r = new Run(s, true, true);
      out[rep] = Double.POSITIVE_INFINITY;
      for (int i = 0; i < SERIES; i++) {
        double shift =
            i < CHANGE_INDEX
                ? 0
                : size * (ramp ? Math.min(1, (i - CHANGE_INDEX) / (double) RAMP_PULSES) : 1);
        double x = m[0] * (1 + shift) + m[1] * rnd.nextGaussian();
        if (r.step(i + 1, x)) {
          out[rep] = i - CHANGE_INDEX; // negative: a false alarm before the change
          if (changeAt != null) {
            changeAt.add(100 * shift);
          }
          if (changePoints != null) {
            changePoints.add((double) (r.d.changePulse() - (CHANGE_INDEX + 1)));
          }
          break;
        }
      }
    }
    return out;
  }

  private static double median(double[] v) {
    double[] s = v.clone();
    Arrays.sort(s);
    int n = s.length;
    return n == 0 ? Double.NaN : n % 2 == 1 ? s[n / 2] : 0.5 * (s[n / 2 - 1] + s[n / 2]);
  }
}
