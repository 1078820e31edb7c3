package tauwatch.health;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.junit.jupiter.api.Test;
import tauwatch.fit.Parameter;
import tauwatch.health.RuleReading.Rule;

/** The words of each rule, as events and the alarm banner show them. */
class RuleReadingTest {
  private static final ParameterLimits RA =
      new ParameterLimits(Parameter.ACCESS_RESISTANCE, 2, 25, 20, 4);

  @Test
  void absoluteRulesNameTheirLimit() {
    assertEquals("max 25.00 MΩ", new RuleReading(Rule.MAX, RA, 26, 10).text());
    assertEquals("min 2.000 MΩ", new RuleReading(Rule.MIN, RA, 1.5, 10).text());
  }

  @Test
  void changeRulesGiveTheChangeFromBaselineAndTheAllowance() {
    assertEquals(
        "change +15.0 % from baseline 10.00 MΩ (allowed ±20.00 %)",
        new RuleReading(Rule.CHANGE_PERCENT, RA, 11.5, 10).text());
    assertEquals(
        "change -3.000 MΩ from baseline 10.00 MΩ (allowed ±4.000 MΩ)",
        new RuleReading(Rule.CHANGE_ABS, RA, 7, 10).text());
  }

  @Test
  void noRuleOrNoValueReadsEmpty() {
    assertEquals("", new RuleReading(Rule.NONE, RA, 10, 10).text());
    assertEquals("", RuleReading.none(RA).text());
  }
}
