package tauwatch.source;

import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;

/**
 * Reads rows of comma-separated decimal numbers from a byte stream without allocating per row.
 *
 * <p>Single-threaded. Numbers are parsed straight from the bytes (sign, digits, point, exponent)
 * into a caller's array; only a malformed row builds a message. Used for the interchange CSV, whose
 * rows are the per-sample path of a replay.
 */
final class CsvRowReader {
  private static final int BUFFER_BYTES = 1 << 16;
  private static final double[] POW10 = new double[23];
  private static final char[] NAN_LETTERS = {'n', 'a', 'n'};

  static {
    double p = 1;
    for (int i = 0; i < POW10.length; i++) {
      POW10[i] = p;
      p *= 10;
    }
  }

  private final InputStream in;
  private final String fileName;
  private final byte[] buf = new byte[BUFFER_BYTES];
  private int pos;
  private int end;
  private long line;
  private boolean eof;

  CsvRowReader(InputStream in, String fileName) {
    this.in = in;
    this.fileName = fileName;
  }

  /** The 1-based number of the line read last. */
  long line() {
    return line;
  }

  /** Reads a line as text (for the header); null at the end. */
  String readTextLine() throws IOException {
    StringBuilder sb = new StringBuilder();
    int b;
    boolean any = false;
    while ((b = next()) >= 0) {
      any = true;
      if (b == '\n') {
        break;
      }
      if (b != '\r') {
        sb.append((char) b);
      }
    }
    if (!any) {
      return null;
    }
    line++;
    return new String(sb.toString().getBytes(StandardCharsets.ISO_8859_1), StandardCharsets.UTF_8);
  }

  /**
   * Reads the next row of exactly {@code out.length} numbers.
   *
   * @return false at the end of the input (blank lines are skipped)
   * @throws SourceException naming the file and line for a malformed row
   */
  boolean readRow(double[] out) throws IOException {
    while (true) {
      int b = peek();
      if (b < 0) {
        return false;
      }
      if (b == '\n' || b == '\r') {
        next();
        if (b == '\n') {
          line++;
        }
        continue;
      }
      break;
    }
    line++;
    int n = out.length;
    for (int f = 0; f < n; f++) {
      out[f] = parseNumber(f, n);
      int sep = next();
      if (f < n - 1) {
        if (sep != ',') {
          throw error(
              f + 1 < n && (sep == '\n' || sep < 0)
                  ? "expected " + n + " values, found " + (f + 1)
                  : "malformed value in column " + (f + 1));
        }
      } else {
        if (sep == '\r') {
          sep = next();
        }
        if (sep == ',') {
          throw error("expected " + n + " values, found more");
        }
        if (sep != '\n' && sep >= 0) {
          throw error("malformed value in column " + n);
        }
      }
    }
    return true;
  }

  private double parseNumber(int field, int fields) throws IOException {
    while (peek() == ' ' || peek() == '\t') {
      next();
    }
    boolean negative = false;
    int b = peek();
    if (b == '-' || b == '+') {
      negative = b == '-';
      next();
    }
    long mantissa = 0;
    int digits = 0;
    int scale = 0;
    boolean point = false;
    boolean anyDigit = false;
    while (true) {
      b = peek();
      if (b >= '0' && b <= '9') {
        next();
        anyDigit = true;
        if (digits < 18) {
          mantissa = mantissa * 10 + (b - '0');
          if (mantissa != 0) {
            digits++;
          }
          if (point) {
            scale--;
          }
        } else if (!point) {
          scale++;
        }
      } else if (b == '.' && !point) {
        next();
        point = true;
      } else {
        break;
      }
    }
    if (!anyDigit) {
      if (b == 'N' || b == 'n') {
        return parseNan(field);
      }
      throw error("malformed value in column " + (field + 1) + " (expected a number)");
    }
    if (b == 'e' || b == 'E') {
      next();
      boolean expNegative = false;
      b = peek();
      if (b == '-' || b == '+') {
        expNegative = b == '-';
        next();
      }
      int exp = 0;
      boolean anyExp = false;
      while ((b = peek()) >= '0' && b <= '9') {
        next();
        anyExp = true;
        exp = Math.min(exp * 10 + (b - '0'), 10_000);
      }
      if (!anyExp) {
        throw error("malformed exponent in column " + (field + 1));
      }
      scale += expNegative ? -exp : exp;
    }
    while (peek() == ' ' || peek() == '\t') {
      next();
    }
    double v = mantissa;
    if (scale < 0) {
      v = -scale < POW10.length ? v / POW10[-scale] : v / Math.pow(10, -scale);
    } else if (scale > 0) {
      v = scale < POW10.length ? v * POW10[scale] : v * Math.pow(10, scale);
    }
    return negative ? -v : v;
  }

  private double parseNan(int field) throws IOException {
    for (int c : NAN_LETTERS) {
      int b = next();
      if (Character.toLowerCase(b) != c) {
        throw error("malformed value in column " + (field + 1) + " (expected a number)");
      }
    }
    return Double.NaN;
  }

  SourceException error(String what) {
    return new SourceException(fileName + ":" + line + ": " + what);
  }

  private int peek() throws IOException {
    if (pos == end && !fill()) {
      return -1;
    }
    return buf[pos] & 0xff;
  }

  private int next() throws IOException {
    if (pos == end && !fill()) {
      return -1;
    }
    return buf[pos++] & 0xff;
  }

  private boolean fill() throws IOException {
    if (eof) {
      return false;
    }
    int n = in.read(buf, 0, buf.length);
    if (n <= 0) {
      eof = true;
      return false;
    }
    pos = 0;
    end = n;
    return true;
  }
}
