package tauwatch.view;

import java.util.Locale;
import tauwatch.fit.Parameter;

/**
 * How the view writes numbers: a fixed number of decimals per parameter, chosen for the values a
 * whole-cell recording gives, so readouts do not jump in width from pulse to pulse.
 *
 * <p>Stateless.
 */
final class Numbers {
  private Numbers() {}

  static int decimals(Parameter p) {
    return switch (p) {
      case ACCESS_RESISTANCE -> 1;
      case INPUT_RESISTANCE, TOTAL_RESISTANCE -> 0;
      case MEMBRANE_CAPACITANCE, CHARGE_CAPACITANCE -> 1;
      case TIME_CONSTANT, FAST_TIME_CONSTANT, SLOW_TIME_CONSTANT -> 3;
      case HOLDING_CURRENT, FAST_AMPLITUDE, SLOW_AMPLITUDE -> 0;
      case RESTING_POTENTIAL -> 1;
    };
  }

  static String value(Parameter p, double v) {
    if (!Double.isFinite(v)) {
      return "–";
    }
    return String.format(Locale.ROOT, "%." + decimals(p) + "f", v);
  }

  /** One more decimal than the value, for standard errors. */
  static String error(Parameter p, double se) {
    if (!Double.isFinite(se)) {
      return "";
    }
    return String.format(Locale.ROOT, "± %." + (decimals(p) + 1) + "f", se);
  }

  static String percent(double pct) {
    if (!Double.isFinite(pct)) {
      return "";
    }
    return String.format(Locale.ROOT, "%+.1f %%", pct);
  }

  /** An axis tick: as few decimals as the step needs. */
  static String tick(double v, double step) {
    int d = step >= 1 ? 0 : (int) Math.min(4, Math.ceil(-Math.log10(step) - 1e-9));
    // Snap to the step so that accumulated rounding never prints "-0".
    double snapped = Math.round(v / step) * step + 0.0;
    return String.format(Locale.ROOT, "%." + d + "f", snapped);
  }

  /** A count with a thousands suffix: 1234567 → 1.23 M. */
  static String count(long n) {
    if (n < 10_000) {
      return Long.toString(n);
    }
    if (n < 10_000_000) {
      return String.format(Locale.ROOT, "%.1f k", n / 1e3);
    }
    return String.format(Locale.ROOT, "%.2f M", n / 1e6);
  }

  /** Recording time as h:mm:ss or m:ss. */
  static String clock(double s) {
    long t = Math.round(s);
    long h = t / 3600;
    long m = (t / 60) % 60;
    long sec = Math.abs(t % 60);
    return h > 0
        ? String.format(Locale.ROOT, "%d:%02d:%02d", h, m, sec)
        : String.format(Locale.ROOT, "%d:%02d", t / 60, sec);
  }

  /** A "nice" axis step (1, 2 or 5 × 10^k) giving about {@code ticks} ticks over {@code span}. */
  static double niceStep(double span, int ticks) {
    if (!(span > 0)) {
      return 1;
    }
    double raw = span / ticks;
    double mag = Math.pow(10, Math.floor(Math.log10(raw)));
    double f = raw / mag;
    double nice = f < 1.5 ? 1 : f < 3.5 ? 2 : f < 7.5 ? 5 : 10;
    return nice * mag;
  }
}
