package tauwatch.sim.serve;

/**
 * The faults the serving simulator can inject, each with the meaning of its rate and a default.
 *
 * <p>Immutable.
 */
public enum FaultKind {
  NOISE("noise", 0.5, "noise bursts per second: 20 ms of 200 pA rms pickup added to the response"),
  CORRUPT("corrupt", 0.01, "share of frames sent with one bit flipped after the CRC was computed"),
  DROP("drop", 0.01, "share of frames never sent (a sequence gap)"),
  GARBAGE("garbage", 0.01, "share of frames followed by 1–64 random bytes"),
  TRUNCATE("truncate", 0.01, "share of frames cut short after a random number of bytes"),
  DISCONNECT(
      "disconnect",
      5.0,
      "seconds of link between drops; each drop lasts "
          + SimulatedDaq.OUTAGE_MS
          + " ms (TCP: the connection is closed and refused; serial: the line goes quiet)");

  private final String code;
  private final double defaultRate;
  private final String meaning;

  FaultKind(String code, double defaultRate, String meaning) {
    this.code = code;
    this.defaultRate = defaultRate;
    this.meaning = meaning;
  }

  public String code() {
    return code;
  }

  public double defaultRate() {
    return defaultRate;
  }

  public String meaning() {
    return meaning;
  }

  /** A one-paragraph list of the kinds for --help and the docs. */
  public static String describeAll() {
    StringBuilder sb = new StringBuilder();
    for (FaultKind k : values()) {
      sb.append(k.code)
          .append("[:RATE] — ")
          .append(k.meaning)
          .append(" (default ")
          .append(k.defaultRate)
          .append("). ");
    }
    return sb.toString().trim();
  }

  /** Parses {@code KIND} or {@code KIND:RATE}; the message of a failure is one line. */
  public static Fault parse(String spec) {
    int colon = spec.indexOf(':');
    String name = colon < 0 ? spec : spec.substring(0, colon);
    for (FaultKind k : values()) {
      if (k.code.equals(name)) {
        double rate = k.defaultRate;
        if (colon >= 0) {
          try {
            rate = Double.parseDouble(spec.substring(colon + 1));
          } catch (NumberFormatException e) {
            throw new IllegalArgumentException(
                "--fault " + spec + ": rate '" + spec.substring(colon + 1) + "' is not a number");
          }
        }
        boolean share = k != NOISE && k != DISCONNECT;
        if (!(rate > 0) || (share && rate > 1) || Double.isInfinite(rate)) {
          throw new IllegalArgumentException(
              "--fault "
                  + spec
                  + ": rate must be "
                  + (share ? "a share in (0, 1]" : "a positive number")
                  + ", got "
                  + rate);
        }
        return new Fault(k, rate);
      }
    }
    StringBuilder known = new StringBuilder();
    for (FaultKind k : values()) {
      known.append(known.length() == 0 ? "" : ", ").append(k.code);
    }
    throw new IllegalArgumentException("--fault " + spec + ": unknown kind (known: " + known + ")");
  }

  /** One injected fault and its rate. */
  public record Fault(FaultKind kind, double rate) {}
}
