package tauwatch.fit;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import tauwatch.stream.ClampMode;

/**
 * The passive properties estimated from one test pulse, with their standard errors and the fit's
 * verdict.
 *
 * <p>Immutable and safe to share across threads. One is made per pulse (a modest, per-pulse
 * allocation off the sample path). A parameter the mode does not measure is NaN.
 */
public final class PulseEstimate {
  private static final int N = Parameter.values().length;

  private final long pulseNumber;
  private final double onsetTimeS;
  private final ClampMode mode;
  private final double stepAmplitude;
  private final double[] values;
  private final double[] standardErrors;
  private final String model;
  private final double rmsResidual;
  private final String rejectReason;
  private final long sweepNumber;
  private final double sweepTimeS;
  private final long pulseEndReceivedNanos;
  private final String note;
  private final List<FittedTransient> fittedTransients;

  private PulseEstimate(Builder b, String rejectReason) {
    this.pulseNumber = b.pulseNumber;
    this.onsetTimeS = b.onsetTimeS;
    this.mode = b.mode;
    this.stepAmplitude = b.stepAmplitude;
    this.values = b.values.clone();
    this.standardErrors = b.standardErrors.clone();
    this.model = b.model;
    this.rmsResidual = b.rmsResidual;
    this.rejectReason = rejectReason;
    this.sweepNumber = b.sweepNumber;
    this.sweepTimeS = b.sweepTimeS;
    this.pulseEndReceivedNanos = b.pulseEndReceivedNanos;
    this.note = b.note;
    this.fittedTransients = List.copyOf(b.fittedTransients);
  }

  public static Builder builder() {
    return new Builder();
  }

  /** A copy of this estimate marked rejected with the given reason. */
  public PulseEstimate rejected(String reason) {
    return toBuilder().reject(reason).build();
  }

  public Builder toBuilder() {
    Builder b = new Builder();
    b.pulseNumber = pulseNumber;
    b.onsetTimeS = onsetTimeS;
    b.mode = mode;
    b.stepAmplitude = stepAmplitude;
    System.arraycopy(values, 0, b.values, 0, N);
    System.arraycopy(standardErrors, 0, b.standardErrors, 0, N);
    b.model = model;
    b.rmsResidual = rmsResidual;
    b.rejectReason = rejectReason;
    b.sweepNumber = sweepNumber;
    b.sweepTimeS = sweepTimeS;
    b.pulseEndReceivedNanos = pulseEndReceivedNanos;
    b.note = note;
    b.fittedTransients.addAll(fittedTransients);
    return b;
  }

  public long pulseNumber() {
    return pulseNumber;
  }

  /** Stream time of the step onset in seconds. */
  public double onsetTimeS() {
    return onsetTimeS;
  }

  public ClampMode mode() {
    return mode;
  }

  /** The step measured from the command channel: mV in VC, pA in CC. */
  public double stepAmplitude() {
    return stepAmplitude;
  }

  /** The estimate of {@code p} in its unit ({@link Parameter#unit()}), or NaN. */
  public double value(Parameter p) {
    return values[p.ordinal()];
  }

  /** The standard error of {@link #value(Parameter)}, or NaN when not known. */
  public double standardError(Parameter p) {
    return standardErrors[p.ordinal()];
  }

  /** The transient model the estimate came from, e.g. {@code mono} or {@code bi}. */
  public String model() {
    return model;
  }

  /** Root-mean-square residual of the fit, in the response unit. */
  public double rmsResidual() {
    return rmsResidual;
  }

  public boolean accepted() {
    return rejectReason == null;
  }

  /** Why the pulse was rejected, or null when accepted. */
  public String rejectReason() {
    return rejectReason;
  }

  /** The acquisition sweep the pulse lies in, or −1 when the stream has no sweep trigger. */
  public long sweepNumber() {
    return sweepNumber;
  }

  /** Seconds from the sweep's start to the onset, or NaN. */
  public double sweepTimeS() {
    return sweepTimeS;
  }

  /** {@link System#nanoTime()} when the source received the pulse window's last sample. */
  public long pulseEndReceivedNanos() {
    return pulseEndReceivedNanos;
  }

  /**
   * A remark on how a value was read that is not a rejection (e.g. "bridge balanced: Ra not
   * measured"), or the empty string.
   */
  public String note() {
    return note;
  }

  /**
   * The fitted curves the estimate came from, in time order (on-transient, then off-transient), for
   * drawing; empty when the estimator kept none or the fit failed before any curve was found.
   */
  public List<FittedTransient> fittedTransients() {
    return fittedTransients;
  }

  @Override
  public String toString() {
    StringBuilder sb = new StringBuilder("PulseEstimate[#").append(pulseNumber);
    sb.append(" t=").append(onsetTimeS).append(' ').append(mode.code());
    for (Parameter p : Parameter.values()) {
      if (!Double.isNaN(values[p.ordinal()])) {
        sb.append(' ').append(p.key()).append('=').append(values[p.ordinal()]);
      }
    }
    sb.append(accepted() ? " accepted" : " rejected: " + rejectReason).append(']');
    return sb.toString();
  }

  /** Fills an estimate; not thread-safe, used by one estimator call. */
  public static final class Builder {
    private long pulseNumber;
    private double onsetTimeS = Double.NaN;
    private ClampMode mode = ClampMode.VOLTAGE_CLAMP;
    private double stepAmplitude = Double.NaN;
    private final double[] values = new double[N];
    private final double[] standardErrors = new double[N];
    private String model = "";
    private double rmsResidual = Double.NaN;
    private String rejectReason;
    private long sweepNumber = -1;
    private double sweepTimeS = Double.NaN;
    private long pulseEndReceivedNanos;
    private String note = "";
    private final List<FittedTransient> fittedTransients = new ArrayList<>(2);

    private Builder() {
      Arrays.fill(values, Double.NaN);
      Arrays.fill(standardErrors, Double.NaN);
    }

    public Builder pulseNumber(long n) {
      pulseNumber = n;
      return this;
    }

    public Builder onsetTimeS(double t) {
      onsetTimeS = t;
      return this;
    }

    public Builder mode(ClampMode m) {
      mode = m;
      return this;
    }

    public Builder stepAmplitude(double a) {
      stepAmplitude = a;
      return this;
    }

    public Builder value(Parameter p, double v) {
      values[p.ordinal()] = v;
      return this;
    }

    public Builder value(Parameter p, double v, double standardError) {
      values[p.ordinal()] = v;
      standardErrors[p.ordinal()] = standardError;
      return this;
    }

    public Builder model(String m) {
      model = m;
      return this;
    }

    public Builder rmsResidual(double r) {
      rmsResidual = r;
      return this;
    }

    /** Marks the estimate rejected; the first reason given is kept. */
    public Builder reject(String reason) {
      if (rejectReason == null) {
        rejectReason = reason;
      }
      return this;
    }

    public Builder sweep(long number, double timeS) {
      sweepNumber = number;
      sweepTimeS = timeS;
      return this;
    }

    public Builder pulseEndReceivedNanos(long nanos) {
      pulseEndReceivedNanos = nanos;
      return this;
    }

    /** Adds a remark (see {@link PulseEstimate#note()}); remarks are joined by "; ". */
    public Builder note(String text) {
      note = note.isEmpty() ? text : note + "; " + text;
      return this;
    }

    /** Adds a fitted curve (in time order), for drawing. */
    public Builder fitted(FittedTransient t) {
      fittedTransients.add(t);
      return this;
    }

    public PulseEstimate build() {
      return new PulseEstimate(this, rejectReason);
    }
  }
}
