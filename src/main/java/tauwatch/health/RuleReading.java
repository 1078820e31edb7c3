package tauwatch.health;

/**
 * Which of a parameter's rules is nearest to (or past) its limit at one pulse, with the value and
 * baseline it was judged at; worded only when someone reads it.
 *
 * <p>Immutable. The health snapshot carries one per parameter and pulse, but the words are needed
 * only by an event or the view, so {@link #text()} formats on demand rather than on the analysis
 * thread at every pulse.
 *
 * @param rule the rule, {@link Rule#NONE} when no rule is in use
 * @param limits the parameter's limits
 * @param value the value judged
 * @param baseline the baseline it was judged against, NaN while none
 */
public record RuleReading(Rule rule, ParameterLimits limits, double value, double baseline) {
  /** The kinds of rule a limit can set. */
  public enum Rule {
    NONE,
    MAX,
    MIN,
    CHANGE_PERCENT,
    CHANGE_ABS
  }

  /** A reading naming no rule (no value yet, or no limits). */
  public static RuleReading none(ParameterLimits limits) {
    return new RuleReading(Rule.NONE, limits, Double.NaN, Double.NaN);
  }

  /** The rule in words with its limit (and the change for a change rule); empty for none. */
  public String text() {
    if (Double.isNaN(value)) {
      return "";
    }
    String unit = limits.parameter().unit();
    double v = value;
    double b = baseline;
    switch (rule) {
      case MAX:
        return String.format("max %.4g %s", limits.max(), unit);
      case MIN:
        return String.format("min %.4g %s", limits.min(), unit);
      case CHANGE_PERCENT:
        return String.format(
            "change %+.1f %% from baseline %.4g %s (allowed ±%.4g %%)",
            100 * (v - b) / Math.abs(b), b, unit, limits.maxChangePercent());
      case CHANGE_ABS:
        return String.format(
            "change %+.4g %s from baseline %.4g %s (allowed ±%.4g %s)",
            v - b, unit, b, unit, limits.maxChangeAbs(), unit);
      default:
        return "";
    }
  }
}
