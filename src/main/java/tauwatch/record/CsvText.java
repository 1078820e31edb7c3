package tauwatch.record;

import java.util.Locale;

/**
 * Formats values for the CSV logs: locale-independent numbers, empty cells for missing values,
 * quoted text where needed.
 *
 * <p>Stateless and thread-safe.
 */
final class CsvText {
  private CsvText() {}

  /** A number with up to {@code digits} significant digits, or empty for NaN. */
  static String number(double v, int digits) {
    if (Double.isNaN(v) || Double.isInfinite(v)) {
      return "";
    }
    if (v == 0) {
      return "0";
    }
    String s = String.format(Locale.ROOT, "%." + digits + "g", v);
    if (s.indexOf('e') < 0 && s.indexOf('.') >= 0) {
      int end = s.length();
      while (s.charAt(end - 1) == '0') {
        end--;
      }
      if (s.charAt(end - 1) == '.') {
        end--;
      }
      s = s.substring(0, end);
    }
    return s;
  }

  /** A fixed-point number with {@code decimals} decimals, or empty for NaN. */
  static String fixed(double v, int decimals) {
    if (Double.isNaN(v) || Double.isInfinite(v)) {
      return "";
    }
    return String.format(Locale.ROOT, "%." + decimals + "f", v);
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
