package tauwatch.wire;

/**
 * The layout of a Tauwatch sample frame (TWSF, version 1); {@code drivers/WIRE-FORMAT.md} is the
 * specification a firmware author works from.
 *
 * <p>All fields little-endian. Header (24 bytes): sync {@code A7 5C 54 57}, version u8, sample
 * format u8, channel count u8, flags u8 (0), frame sequence u32, first sample index u32, sample
 * rate float32 (0 = not carried), samples per channel u16, reserved u16 (0). Then the samples,
 * interleaved by channel, then a CRC-32/ISO-HDLC u32 over header and samples. Constants only.
 */
public final class WireFormat {
  /** The sync word as it appears on the wire, byte by byte. */
  public static final byte SYNC0 = (byte) 0xA7;

  public static final byte SYNC1 = (byte) 0x5C;
  public static final byte SYNC2 = (byte) 0x54;
  public static final byte SYNC3 = (byte) 0x57;

  public static final int VERSION = 1;
  public static final int HEADER_BYTES = 24;
  public static final int CRC_BYTES = 4;

  /** Sample format code: signed 16-bit ADC counts. */
  public static final int FORMAT_INT16 = 1;

  /** Sample format code: IEEE 754 single precision. */
  public static final int FORMAT_FLOAT32 = 2;

  public static final int MAX_CHANNELS = 8;
  public static final int MAX_SAMPLES_PER_FRAME = 1024;

  /** The largest legal frame: 8 float32 channels of 1024 samples, header and CRC. */
  public static final int MAX_FRAME_BYTES =
      HEADER_BYTES + MAX_CHANNELS * MAX_SAMPLES_PER_FRAME * 4 + CRC_BYTES;

  // Field offsets within the header.
  static final int OFF_VERSION = 4;
  static final int OFF_FORMAT = 5;
  static final int OFF_CHANNELS = 6;
  static final int OFF_FLAGS = 7;
  static final int OFF_SEQUENCE = 8;
  static final int OFF_FIRST_SAMPLE = 12;
  static final int OFF_RATE = 16;
  static final int OFF_SAMPLES = 20;
  static final int OFF_RESERVED = 22;

  private WireFormat() {}

  /** Bytes per sample value of a format code, or 0 for an unknown code. */
  public static int bytesPerValue(int format) {
    return format == FORMAT_INT16 ? 2 : format == FORMAT_FLOAT32 ? 4 : 0;
  }

  /** Total bytes of a frame with this shape. */
  public static int frameBytes(int format, int channels, int samples) {
    return HEADER_BYTES + bytesPerValue(format) * channels * samples + CRC_BYTES;
  }

  static int u16(byte[] b, int p) {
    return (b[p] & 0xff) | (b[p + 1] & 0xff) << 8;
  }

  static int i32(byte[] b, int p) {
    return (b[p] & 0xff)
        | (b[p + 1] & 0xff) << 8
        | (b[p + 2] & 0xff) << 16
        | (b[p + 3] & 0xff) << 24;
  }

  static void putI32(byte[] b, int p, int v) {
    b[p] = (byte) v;
    b[p + 1] = (byte) (v >>> 8);
    b[p + 2] = (byte) (v >>> 16);
    b[p + 3] = (byte) (v >>> 24);
  }

  static void putU16(byte[] b, int p, int v) {
    b[p] = (byte) v;
    b[p + 1] = (byte) (v >>> 8);
  }
}
