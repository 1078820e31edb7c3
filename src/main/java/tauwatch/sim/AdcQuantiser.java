package tauwatch.sim;

/**
 * Rounds a value to the nearest code of a bipolar digitiser and clips it to the codes that exist
 * (−2^(bits−1) … 2^(bits−1) − 1 LSB).
 *
 * <p>Immutable, allocation-free. With 0 bits it passes values through unchanged.
 */
public final class AdcQuantiser {
  private final double lsb;
  private final double inverseLsb;
  private final double minCode;
  private final double maxCode;

  public AdcQuantiser(int bits, double rangePa) {
    if (bits == 0) {
      lsb = 0;
      inverseLsb = 0;
      minCode = 0;
      maxCode = 0;
    } else {
      lsb = 2 * rangePa / Math.pow(2, bits);
      inverseLsb = 1 / lsb;
      minCode = -Math.pow(2, bits - 1);
      maxCode = Math.pow(2, bits - 1) - 1;
    }
  }

  public double lsb() {
    return lsb;
  }

  public double quantise(double value) {
    if (lsb == 0) {
      return value;
    }
    double code = Math.rint(value * inverseLsb);
    if (code < minCode) {
      code = minCode;
    } else if (code > maxCode) {
      code = maxCode;
    }
    return code * lsb;
  }
}
