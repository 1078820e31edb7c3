package tauwatch.bench.naive;

import java.io.ByteArrayOutputStream;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.util.function.Consumer;
import java.util.zip.CRC32;
import tauwatch.wire.DeviceProfile;

/**
 * Reads binary sample frames (drivers/WIRE-FORMAT.md) the plain way: bytes appended to a growing
 * buffer, each frame parsed through a little-endian {@link ByteBuffer}, checked with {@link CRC32},
 * and every sample scaled and handed on as a new {@link Sample}.
 *
 * <p>Single-threaded. Allocates per chunk and per sample; the baseline of the decoder benchmark.
 * Corrupt frames are skipped from the next byte, as the product does; gaps are not accounted (the
 * benchmark's captures have none).
 */
public final class NaiveFrameReader {
  private static final int HEADER = 24;

  private final DeviceProfile profile;
  private final Consumer<Sample> out;
  private ByteArrayOutputStream pending = new ByteArrayOutputStream();
  private long nextIndex;
  private long corruptFrames;

  public NaiveFrameReader(DeviceProfile profile, Consumer<Sample> out) {
    this.profile = profile;
    this.out = out;
  }

  /** Feeds received bytes; emits every sample of every complete, valid frame. */
  public void accept(byte[] bytes, int off, int len, long receivedNanos) {
    pending.write(bytes, off, len);
    byte[] buf = pending.toByteArray();
    ByteBuffer bb = ByteBuffer.wrap(buf).order(ByteOrder.LITTLE_ENDIAN);
    int pos = 0;
    while (buf.length - pos >= HEADER) {
      if (!(buf[pos] == (byte) 0xA7
          && buf[pos + 1] == 0x5C
          && buf[pos + 2] == 0x54
          && buf[pos + 3] == 0x57)) {
        pos++;
        continue;
      }
      int format = buf[pos + 5];
      int channels = buf[pos + 6];
      int samples = bb.getShort(pos + 20) & 0xffff;
      int bytesPer = format == 1 ? 2 : 4;
      int frameLen = HEADER + samples * channels * bytesPer + 4;
      if (channels < 1 || channels > 8 || samples < 1 || samples > 1024) {
        corruptFrames++;
        pos++;
        continue;
      }
      if (buf.length - pos < frameLen) {
        break;
      }
      CRC32 crc = new CRC32();
      crc.update(buf, pos, frameLen - 4);
      if ((int) crc.getValue() != bb.getInt(pos + frameLen - 4)) {
        corruptFrames++;
        pos++;
        continue;
      }
      double cmdScale = profile.commandScale();
      double respScale = profile.responseScale();
      int base = pos + HEADER;
      for (int s = 0; s < samples; s++) {
        double[] raw = new double[channels];
        for (int c = 0; c < channels; c++) {
          int at = base + (s * channels + c) * bytesPer;
          raw[c] = format == 1 ? bb.getShort(at) : bb.getFloat(at);
        }
        out.accept(
            new Sample(
                nextIndex++,
                raw[profile.commandChannel()] * cmdScale + profile.commandOffset(),
                raw[profile.responseChannel()] * respScale + profile.responseOffset(),
                receivedNanos));
      }
      pos += frameLen;
    }
    ByteArrayOutputStream rest = new ByteArrayOutputStream();
    rest.write(buf, pos, buf.length - pos);
    pending = rest;
  }

  public long corruptFrames() {
    return corruptFrames;
  }
}
