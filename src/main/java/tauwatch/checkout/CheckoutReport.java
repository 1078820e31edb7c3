package tauwatch.checkout;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/**
 * The outcome of a rig checkout: one row per checked quantity, and whether all passed.
 *
 * <p>Immutable.
 *
 * @param expectation the expectation's name
 * @param pulses pulses analysed
 * @param accepted pulses accepted
 * @param rows the table rows, in order
 */
public record CheckoutReport(String expectation, long pulses, long accepted, List<Row> rows) {

  public CheckoutReport {
    rows = List.copyOf(rows);
  }

  /** One row: what was checked, against what, and the verdict. */
  public record Row(
      String quantity,
      String unit,
      String expected,
      String measured,
      String spread,
      String tolerance,
      boolean pass) {}

  public boolean allPass() {
    return accepted > 0 && rows.stream().allMatch(Row::pass);
  }

  /** Names of the failing rows, in order. */
  public List<String> failing() {
    List<String> f = new ArrayList<>();
    for (Row r : rows) {
      if (!r.pass()) {
        f.add(r.quantity());
      }
    }
    if (accepted == 0) {
      f.add("no accepted pulses");
    }
    return f;
  }

  /** The table as fixed-width text, with a verdict line. */
  public String table() {
    StringBuilder sb = new StringBuilder();
    String fmt = "%-15s %-7s %-12s %-12s %-20s %-10s %s%n";
    sb.append(
        String.format(
            Locale.ROOT,
            fmt,
            "quantity",
            "unit",
            "expected",
            "measured",
            "spread (5–95 %)",
            "tolerance",
            "result"));
    for (Row r : rows) {
      sb.append(
          String.format(
              Locale.ROOT,
              fmt,
              r.quantity(),
              r.unit(),
              r.expected(),
              r.measured(),
              r.spread(),
              r.tolerance(),
              r.pass() ? "pass" : "FAIL"));
    }
    sb.append(
        String.format(
            Locale.ROOT,
            "checkout against %s: %d pulses, %d accepted: %s%n",
            expectation,
            pulses,
            accepted,
            allPass() ? "PASS" : "FAIL (" + String.join(", ", failing()) + ")"));
    return sb.toString();
  }
}
