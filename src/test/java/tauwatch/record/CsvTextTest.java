package tauwatch.record;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.Locale;
import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * The log's number cells against the reference they stand in for: {@link String#format} with {@code
 * %.Ng} and {@code %.Nf} in Locale.ROOT (the JDK's {@link java.util.Formatter}).
 */
class CsvTextTest {
  /** %.Ng with the trailing zeros of a plain decimal dropped, as the logs have always written. */
  private static String formatterNumber(double v, int digits) {
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

  private static void check(double v) {
    for (int digits : new int[] {1, 3, 4, 6}) {
      assertEquals(formatterNumber(v, digits), CsvText.number(v, digits), v + " to " + digits);
    }
    for (int decimals : new int[] {0, 3, 6}) {
      assertEquals(
          String.format(Locale.ROOT, "%." + decimals + "f", v),
          CsvText.fixed(v, decimals),
          v + " with " + decimals + " decimals");
    }
  }

  @Test
  void numbersMatchFormatterOverManyMagnitudes() {
    Random rnd = new Random(20261202);
    for (int i = 0; i < 60_000; i++) {
      double magnitude = Math.pow(10, -12 + 24 * rnd.nextDouble());
      check((rnd.nextBoolean() ? 1 : -1) * magnitude);
    }
  }

  @Test
  void numbersMatchFormatterAtRoundingAndLayoutEdges() {
    double[] edges = {
      1,
      -1,
      10,
      100,
      1e5,
      1e6,
      999999.5,
      999999.4,
      99999.95,
      9.9999995,
      0.0001,
      0.00009999995,
      0.000099999,
      1e-4,
      1e-5,
      0.5,
      1.5,
      2.5,
      0.125,
      0.0625,
      12.5,
      1234565,
      0.1234565,
      1e21,
      1e-21,
      Double.MIN_VALUE,
      Double.MAX_VALUE,
      Double.MIN_NORMAL,
      300.0,
      29.97,
      10.05,
      -70.0,
      4.9e-324,
      123456789012.0,
      0.1 + 0.2,
      1.0 / 3,
      2.0 / 3
    };
    for (double v : edges) {
      check(v);
      check(-v);
    }
    Random rnd = new Random(7);
    for (int i = 0; i < 20_000; i++) {
      // Values whose shortest decimal form ends in 5 right past a precision: half-up territory.
      long digits = 1 + rnd.nextInt(9_999_999);
      double v = (digits * 10 + 5) * Math.pow(10, rnd.nextInt(20) - 12);
      check(v);
    }
  }

  @Test
  void negativeValuesThatRoundToZeroKeepTheirSign() {
    assertEquals("-0.000000", CsvText.fixed(-1e-9, 6));
    assertEquals("-0.000", CsvText.fixed(-0.0, 3));
  }

  @Test
  void missingValuesAreEmptyCells() {
    assertEquals("", CsvText.number(Double.NaN, 6));
    assertEquals("", CsvText.number(Double.POSITIVE_INFINITY, 6));
    assertEquals("", CsvText.fixed(Double.NaN, 6));
    assertEquals("0", CsvText.number(-0.0, 6));
  }
}
