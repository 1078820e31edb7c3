package tauwatch.record;

/**
 * Chooses round tick values (1, 2 or 5 times a power of ten) for a plot axis.
 *
 * <p>Stateless; allocates the returned array.
 */
final class AxisTicks {
  private AxisTicks() {}

  /** The step between about {@code count} ticks over [lo, hi]. */
  static double step(double lo, double hi, int count) {
    double raw = (hi - lo) / Math.max(1, count);
    if (!(raw > 0) || Double.isInfinite(raw)) {
      return 1;
    }
    double pow = Math.pow(10, Math.floor(Math.log10(raw)));
    double m = raw / pow;
    double nice = m < 1.5 ? 1 : m < 3 ? 2 : m < 7 ? 5 : 10;
    return nice * pow;
  }

  /** Round tick values inside [lo, hi], about {@code count} of them. */
  static double[] ticks(double lo, double hi, int count) {
    double step = step(lo, hi, count);
    double first = Math.ceil(lo / step - 1e-9) * step;
    int n = (int) Math.floor((hi - first) / step + 1e-9) + 1;
    double[] t = new double[Math.max(0, n)];
    for (int i = 0; i < t.length; i++) {
      // Snap to the step so labels read 0.3, not 0.30000000000000004.
      t[i] = Math.round((first + i * step) / step) * step;
    }
    return t;
  }

  /** A label with no more decimals than the step needs. */
  static String label(double v, double step) {
    int decimals = Math.max(0, (int) -Math.floor(Math.log10(step) + 1e-9));
    return String.format(java.util.Locale.ROOT, "%." + decimals + "f", v);
  }
}
