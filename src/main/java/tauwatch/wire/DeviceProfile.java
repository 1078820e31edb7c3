package tauwatch.wire;

import tauwatch.stream.ClampMode;

/**
 * One DAQ/amplifier wiring as a {@code drivers/*.toml} file describes it: transport, framing,
 * channel map, scaling from raw values to mV and pA, and the stream's rate, mode and filter.
 *
 * <p>Immutable; built and validated once by {@link DeviceProfileLoader}.
 *
 * @param name short name, e.g. {@code simulator}
 * @param description one line for people
 * @param origin the file or resource it was read from, for messages
 * @param text the profile's TOML text as read, kept for session.json and raw captures
 * @param tcp TCP settings, or null when the wiring has no network link
 * @param serial serial settings, or null when the wiring has no serial link
 * @param framing binary frames or text lines
 * @param sampleFormat {@link WireFormat#FORMAT_INT16} or {@link WireFormat#FORMAT_FLOAT32}; 0 for
 *     text
 * @param channels values per sample on the wire
 * @param samplesPerFrame samples per channel in one frame when Tauwatch encodes (the simulator)
 * @param lineCounter text lines start with a sample counter
 * @param sampleRateHz samples per second per channel
 * @param mode the amplifier's clamp mode
 * @param filterCutoffHz the amplifier's Bessel filter cutoff, 0 if none or unknown
 * @param commandChannel index of the command channel
 * @param responseChannel index of the response channel
 * @param triggerChannel index of the sweep-trigger channel, or −1
 * @param triggerThreshold a sweep starts where the trigger channel's raw value rises through this
 * @param values what raw values are: {@code counts}, {@code volts} or {@code units}
 * @param adcBits digitiser resolution (counts only)
 * @param adcRangeV digitiser full scale ±V (counts and volts)
 * @param commandPerVolt command unit (mV in VC, pA in CC) per volt at the digitiser
 * @param responsePerVolt response unit (pA in VC, mV in CC) per volt at the digitiser
 * @param commandOffset added to the command after scaling, in its unit
 * @param responseOffset added to the response after scaling, in its unit
 */
public record DeviceProfile(
    String name,
    String description,
    String origin,
    String text,
    TcpSettings tcp,
    SerialSettings serial,
    Framing framing,
    int sampleFormat,
    int channels,
    int samplesPerFrame,
    boolean lineCounter,
    double sampleRateHz,
    ClampMode mode,
    double filterCutoffHz,
    int commandChannel,
    int responseChannel,
    int triggerChannel,
    double triggerThreshold,
    String values,
    int adcBits,
    double adcRangeV,
    double commandPerVolt,
    double responsePerVolt,
    double commandOffset,
    double responseOffset) {

  /** How samples are framed on the wire. */
  public enum Framing {
    BINARY,
    TEXT
  }

  /** A network link. */
  public record TcpSettings(String host, int port) {}

  /** A serial link; parity is {@code none}, {@code even} or {@code odd}. */
  public record SerialSettings(
      String device, int baud, int dataBits, String parity, int stopBits) {}

  /** A decoder for this profile's framing. */
  public StreamDecoder newDecoder(FrameSink sink, tauwatch.stream.StreamCounters counters) {
    return framing == Framing.BINARY
        ? new FrameDecoder(sink, counters)
        : new TextLineDecoder(sink, counters, channels, lineCounter);
  }

  /** The stream format the profile promises, for a source named {@code description}. */
  public tauwatch.stream.StreamFormat streamFormat(String description) {
    return new tauwatch.stream.StreamFormat(sampleRateHz, mode, filterCutoffHz, 0.0, description);
  }

  public boolean hasTrigger() {
    return triggerChannel >= 0;
  }

  /** Volts at the digitiser per raw value. */
  public double voltsPerRaw() {
    switch (values) {
      case "counts":
        return adcRangeV / Math.pow(2, adcBits - 1);
      case "volts":
        return 1;
      default:
        return Double.NaN;
    }
  }

  /** Command unit per raw value. */
  public double commandScale() {
    return values.equals("units") ? 1 : voltsPerRaw() * commandPerVolt;
  }

  /** Response unit per raw value. */
  public double responseScale() {
    return values.equals("units") ? 1 : voltsPerRaw() * responsePerVolt;
  }

  /**
   * The largest raw magnitude the wiring can produce: the ADC's codes for counts, its full scale
   * for volts (a little slack for float rounding); infinite for values already in units.
   */
  public double rawLimit() {
    switch (values) {
      case "counts":
        return Math.pow(2, adcBits - 1);
      case "volts":
        return adcRangeV * 1.001;
      default:
        return Double.POSITIVE_INFINITY;
    }
  }
}
