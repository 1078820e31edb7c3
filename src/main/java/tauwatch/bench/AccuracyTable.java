package tauwatch.bench;

import java.io.PrintWriter;
import java.util.List;
import java.util.Locale;
import tauwatch.bench.AccuracyBenchmark.Cell;
import tauwatch.bench.AccuracyBenchmark.Condition;
import tauwatch.bench.AccuracyBenchmark.Errors;
import tauwatch.bench.AccuracyBenchmark.Result;

/**
 * Writes an accuracy benchmark's results as fixed-width text: one row per condition with the median
 * and 95th percentile of |relative error| of Ra, Rin, Cm and τ for Tauwatch and for the raw-peak
 * readout, a summary line per condition, and the headline ratio of Ra errors at a 10 kHz filter and
 * 50 kHz sampling.
 *
 * <p>Stateless; allocates the text it writes.
 */
public final class AccuracyTable {
  private AccuracyTable() {}

  /** The condition the done-when names: 10 kHz filter, 50 kHz sampling. */
  static boolean isHeadline(Condition c) {
    return c.filterHz() == 10000 && c.rateHz() == 50000;
  }

  /** The table of conditions, the summary lines and the headline. */
  public static void write(List<Result> perCell, boolean detail, PrintWriter out) {
    List<Result> rows = AccuracyBenchmark.byCondition(perCell);
    out.println(
        "|relative error| in %, median/95th percentile, over the pulses Tauwatch accepted;"
            + " TW = Tauwatch, peak = raw-peak readout");
    out.println(header("noise pA filter  rate    "));
    for (Result r : rows) {
      out.println(row(conditionText(r.condition), r));
    }
    out.println();
    for (Result r : rows) {
      out.println(summary(r));
    }
    if (detail) {
      out.println();
      out.println(header("condition              cell                           "));
      for (Result r : perCell) {
        out.println(row(conditionText(r.condition) + " " + cellText(r.cell), r));
      }
    }
    out.println();
    out.println(headline(rows));
  }

  static String header(String lead) {
    StringBuilder sb = new StringBuilder(lead);
    sb.append(" accepted");
    for (String p : new String[] {"Ra", "Rin", "Cm", "tau"}) {
      sb.append(String.format(Locale.ROOT, " %13s %13s", p + " TW", p + " peak"));
    }
    return sb.toString();
  }

  static String row(String lead, Result r) {
    StringBuilder sb = new StringBuilder(lead);
    sb.append(String.format(Locale.ROOT, " %4d/%-4d", r.accepted, r.pulses));
    for (int k = 0; k < AccuracyBenchmark.PARAMETERS.length; k++) {
      sb.append(' ').append(pair(r.tauwatch, k)).append(' ').append(pair(r.peak, k));
    }
    return sb.toString();
  }

  static String pair(Errors e, int k) {
    return String.format(
        Locale.ROOT, "%13s", pct(e.absQuantile(k, 0.5)) + "/" + pct(e.absQuantile(k, 0.95)));
  }

  static String pct(double v) {
    if (Double.isNaN(v)) {
      return "-";
    }
    if (Double.isInfinite(v)) {
      return "miss";
    }
    double p = 100 * v;
    return p >= 99.5
        ? String.format(Locale.ROOT, "%.0f", p)
        : p >= 0.995
            ? String.format(Locale.ROOT, "%.1f", p)
            : String.format(Locale.ROOT, "%.2f", p);
  }

  static String conditionText(Condition c) {
    return String.format(
        Locale.ROOT,
        "%5.0f    %-7s %-7s",
        c.noisePa(),
        c.filterHz() == 0 ? "none" : String.format(Locale.ROOT, "%.0fk", c.filterHz() / 1000),
        String.format(Locale.ROOT, "%.0fk", c.rateHz() / 1000));
  }

  static String cellText(Cell c) {
    return String.format(
        Locale.ROOT,
        "Ra %2.0f Rin %4.0f Cm %3.0f %-8s",
        c.accessMOhm(),
        c.inputMOhm(),
        c.capacitancePf(),
        c.dendrite() ? "dendrite" : "soma");
  }

  /** Ra's median error, raw peak over Tauwatch; infinite when Tauwatch's is exactly 0. */
  static double raRatio(Result r) {
    return r.peak.absQuantile(0, 0.5) / r.tauwatch.absQuantile(0, 0.5);
  }

  static String summary(Result r) {
    Condition c = r.condition;
    return String.format(
        Locale.ROOT,
        "%.0f pA, %s, %.0f kHz: accepted %d of %d pulses (two exponentials on %d); Ra median error"
            + " Tauwatch %s %%, raw peak %s %% (ratio %s); Cm median error Tauwatch %s %%, τ/Ra"
            + " readout %s %%",
        c.noisePa(),
        c.filterHz() == 0
            ? "no filter"
            : String.format(Locale.ROOT, "%.0f kHz filter", c.filterHz() / 1000),
        c.rateHz() / 1000,
        r.accepted,
        r.pulses,
        r.twoExponential,
        pct(r.tauwatch.absQuantile(0, 0.5)),
        pct(r.peak.absQuantile(0, 0.5)),
        ratioText(raRatio(r)),
        pct(r.tauwatch.absQuantile(2, 0.5)),
        pct(r.peak.absQuantile(2, 0.5)));
  }

  static String ratioText(double ratio) {
    return Double.isNaN(ratio)
        ? "-"
        : Double.isInfinite(ratio)
            ? "inf"
            : String.format(Locale.ROOT, ratio >= 100 ? "%.0f" : "%.1f", ratio);
  }

  /** The done-when line: Ra error ratio at 10 kHz / 50 kHz, per noise level, against 10. */
  static String headline(List<Result> rows) {
    StringBuilder sb =
        new StringBuilder(
            "Ra error ratio (raw peak / Tauwatch, medians) at 10 kHz"
                + " filter, 50 kHz sampling:");
    boolean any = false;
    double worst = Double.POSITIVE_INFINITY;
    for (Result r : rows) {
      if (isHeadline(r.condition)) {
        double q = raRatio(r);
        sb.append(String.format(Locale.ROOT, " %.0f pA %s;", r.condition.noisePa(), ratioText(q)));
        worst = Math.min(worst, q);
        any = true;
      }
    }
    if (!any) {
      return sb.append(" not in this grid").toString();
    }
    return sb.append(worst >= 10 ? " at least 10 everywhere" : " BELOW 10").toString();
  }

  /** The smallest Ra error ratio at the headline condition over the grid's noise levels. */
  public static double worstHeadlineRatio(List<Result> perCell) {
    double worst = Double.NaN;
    for (Result r : AccuracyBenchmark.byCondition(perCell)) {
      if (isHeadline(r.condition)) {
        double q = raRatio(r);
        worst = Double.isNaN(worst) ? q : Math.min(worst, q);
      }
    }
    return worst;
  }
}
