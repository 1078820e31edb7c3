package tauwatch.record;

import java.math.BigDecimal;
import java.math.MathContext;
import java.math.RoundingMode;

/**
 * Formats values for the CSV logs: locale-independent numbers, empty cells for missing values,
 * quoted text where needed.
 *
 * <p>Stateless and thread-safe.
 */
final class CsvText {
  private CsvText() {}

  /**
   * A number with up to {@code digits} significant digits, or empty for NaN: {@code %.<digits>g} of
   * {@link java.util.Formatter} (Locale.ROOT) with the trailing zeros of a plain decimal dropped.
   *
   * <p>Built from the same decimal digits Formatter starts from (the shortest digits of {@link
   * Double#toString}), rounded half-up to the precision, and laid out by the same rule (plain from
   * 10⁻⁴ up to 10^digits, else d.ddde±XX); {@code CsvTextTest} checks it against Formatter. It
   * costs a few hundred nanoseconds where Formatter parses the pattern with a regular expression
   * for every cell, and a {@code params.csv} row has some twenty.
   */
  static String number(double v, int digits) {
    if (Double.isNaN(v) || Double.isInfinite(v)) {
      return "";
    }
    if (v == 0) {
      return "0";
    }
    BigDecimal r = BigDecimal.valueOf(v).round(new MathContext(digits, RoundingMode.HALF_UP));
    int exponent = r.precision() - r.scale() - 1; // of the leading digit
    if (exponent >= -4 && exponent < digits) {
      return r.stripTrailingZeros().toPlainString();
    }
    StringBuilder sb = new StringBuilder(digits + 8);
    if (r.signum() < 0) {
      sb.append('-');
    }
    String mantissa = r.unscaledValue().abs().toString();
    sb.append(mantissa.charAt(0));
    if (digits > 1) {
      sb.append('.');
      sb.append(mantissa, 1, Math.min(mantissa.length(), digits));
      for (int i = mantissa.length(); i < digits; i++) {
        sb.append('0');
      }
    }
    sb.append(exponent < 0 ? "e-" : "e+");
    int e = Math.abs(exponent);
    if (e < 10) {
      sb.append('0');
    }
    return sb.append(e).toString();
  }

  /**
   * A fixed-point number with {@code decimals} decimals, or empty for NaN: {@code %.<decimals>f} of
   * {@link java.util.Formatter} (Locale.ROOT), built as {@link #number} is.
   */
  static String fixed(double v, int decimals) {
    if (Double.isNaN(v) || Double.isInfinite(v)) {
      return "";
    }
    String s = BigDecimal.valueOf(v).setScale(decimals, RoundingMode.HALF_UP).toPlainString();
    // A negative value that rounds to zero keeps its sign, as Formatter writes it.
    boolean negative = v < 0 || (v == 0 && 1 / v < 0);
    return negative && s.charAt(0) != '-' ? "-" + s : s;
  }

  /** Text as one CSV cell, quoted when it holds a comma, quote or line break. */
  static String text(String s) {
    if (s == null || s.isEmpty()) {
      return "";
    }
    if (s.indexOf(',') < 0 && s.indexOf('"') < 0 && s.indexOf('\n') < 0 && s.indexOf('\r') < 0) {
      return s;
    }
    return '"' + s.replace("\"", "\"\"").replace('\n', ' ').replace('\r', ' ') + '"';
  }

  /** Splits one CSV line into cells, honouring double quotes as {@link #text} writes them. */
  static java.util.List<String> split(String line) {
    java.util.List<String> out = new java.util.ArrayList<>();
    StringBuilder cell = new StringBuilder();
    boolean quoted = false;
    for (int i = 0; i < line.length(); i++) {
      char ch = line.charAt(i);
      if (quoted) {
        if (ch == '"' && i + 1 < line.length() && line.charAt(i + 1) == '"') {
          cell.append('"');
          i++;
        } else if (ch == '"') {
          quoted = false;
        } else {
          cell.append(ch);
        }
      } else if (ch == '"') {
        quoted = true;
      } else if (ch == ',') {
        out.add(cell.toString());
        cell.setLength(0);
      } else {
        cell.append(ch);
      }
    }
    out.add(cell.toString());
    return out;
  }
}
