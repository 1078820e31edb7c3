package tauwatch.source;

/**
 * A parsed {@code --source} value: {@code sim}, {@code sim:SCENARIO}, {@code tcp://HOST:PORT},
 * {@code serial:DEVICE} or {@code file:PATH}.
 *
 * <p>Immutable.
 *
 * @param scheme one of {@code sim}, {@code tcp}, {@code serial}, {@code file}
 * @param target the scenario, host:port, device or path; empty for plain {@code sim}
 */
public record SourceUri(String scheme, String target) {
  /** The scenario the simulator plays when none is named. */
  public static final String DEFAULT_SCENARIO = "steady-cell";

  /** Parses a source URI; the message of the exception is one line for the user. */
  public static SourceUri parse(String s) {
    if (s == null || s.isBlank()) {
      throw new IllegalArgumentException("empty --source");
    }
    if (s.equals("sim")) {
      return new SourceUri("sim", DEFAULT_SCENARIO);
    }
    if (s.startsWith("sim:")) {
      return new SourceUri("sim", requireTarget(s, s.substring(4)));
    }
    if (s.startsWith("tcp://")) {
      String t = requireTarget(s, s.substring(6));
      int colon = t.lastIndexOf(':');
      if (colon <= 0 || colon == t.length() - 1) {
        throw new IllegalArgumentException("--source " + s + ": expected tcp://HOST:PORT");
      }
      return new SourceUri("tcp", t);
    }
    if (s.startsWith("serial:")) {
      return new SourceUri("serial", requireTarget(s, s.substring(7)));
    }
    if (s.startsWith("file:")) {
      return new SourceUri("file", requireTarget(s, s.substring(5)));
    }
    throw new IllegalArgumentException(
        "--source "
            + s
            + ": expected sim, sim:SCENARIO, tcp://HOST:PORT, serial:DEVICE or file:PATH");
  }

  private static String requireTarget(String whole, String target) {
    if (target.isEmpty()) {
      throw new IllegalArgumentException("--source " + whole + ": nothing after the scheme");
    }
    return target;
  }

  /** For TCP: the host part. */
  public String host() {
    return target.substring(0, target.lastIndexOf(':'));
  }

  /** For TCP: the port, validated. */
  public int port() {
    String p = target.substring(target.lastIndexOf(':') + 1);
    try {
      int port = Integer.parseInt(p);
      if (port < 1 || port > 65535) {
        throw new IllegalArgumentException("port " + p + " out of range 1–65535");
      }
      return port;
    } catch (NumberFormatException e) {
      throw new IllegalArgumentException("port '" + p + "' is not a number");
    }
  }

  @Override
  public String toString() {
    return scheme.equals("tcp") ? "tcp://" + target : scheme + ":" + target;
  }
}
