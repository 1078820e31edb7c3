package tauwatch.cli;

import java.time.Duration;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import picocli.CommandLine.ITypeConverter;
import picocli.CommandLine.TypeConversionException;

/**
 * Reads durations written as {@code 250ms}, {@code 20s}, {@code 5m}, {@code 2h} or plain seconds.
 */
final class DurationConverter implements ITypeConverter<Duration> {
  private static final Pattern FORM = Pattern.compile("(\\d+(?:\\.\\d+)?)\\s*(ms|s|m|min|h)?");

  @Override
  public Duration convert(String value) {
    Matcher m = FORM.matcher(value.trim());
    if (!m.matches()) {
      throw new TypeConversionException(
          "'" + value + "' is not a duration (use e.g. 500ms, 20s, 5m, 2h)");
    }
    double n = Double.parseDouble(m.group(1));
    String unit = m.group(2) == null ? "s" : m.group(2);
    double seconds;
    switch (unit) {
      case "ms":
        seconds = n / 1000;
        break;
      case "m":
      case "min":
        seconds = n * 60;
        break;
      case "h":
        seconds = n * 3600;
        break;
      default:
        seconds = n;
    }
    if (!(seconds > 0)) {
      throw new TypeConversionException("duration must be positive, got '" + value + "'");
    }
    return Duration.ofNanos(Math.round(seconds * 1e9));
  }
}
