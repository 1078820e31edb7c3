package tauwatch.health;

import tauwatch.fit.Parameter;

/**
 * The acceptance criteria of one parameter: an absolute range and the change allowed from baseline.
 *
 * <p>Immutable. A NaN bound means "no such rule".
 *
 * @param parameter the parameter judged
 * @param min lowest acceptable value, in the parameter's unit, or NaN
 * @param max highest acceptable value, or NaN
 * @param maxChangePercent largest allowed change from baseline in percent of the baseline, or NaN
 * @param maxChangeAbs largest allowed change from baseline in the parameter's unit, or NaN
 */
public record ParameterLimits(
    Parameter parameter, double min, double max, double maxChangePercent, double maxChangeAbs) {

  public ParameterLimits {
    if (!Double.isNaN(min) && !Double.isNaN(max) && min >= max) {
      throw new IllegalArgumentException(
          parameter.key() + ": min (" + min + ") must be below max (" + max + ")");
    }
    if (!Double.isNaN(maxChangePercent) && !(maxChangePercent > 0)) {
      throw new IllegalArgumentException(
          parameter.key() + ": max_change_percent must be positive, got " + maxChangePercent);
    }
    if (!Double.isNaN(maxChangeAbs) && !(maxChangeAbs > 0)) {
      throw new IllegalArgumentException(
          parameter.key() + ": max_change must be positive, got " + maxChangeAbs);
    }
  }

  public static ParameterLimits none(Parameter p) {
    return new ParameterLimits(p, Double.NaN, Double.NaN, Double.NaN, Double.NaN);
  }

  public boolean hasAnyRule() {
    return !Double.isNaN(min)
        || !Double.isNaN(max)
        || !Double.isNaN(maxChangePercent)
        || !Double.isNaN(maxChangeAbs);
  }
}
