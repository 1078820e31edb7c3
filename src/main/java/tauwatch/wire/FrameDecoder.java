package tauwatch.wire;

import java.util.zip.CRC32;
import tauwatch.stream.StreamCounters;

/**
 * The streaming decoder of binary sample frames ({@link WireFormat}): finds the sync word, checks
 * the header and the CRC-32, and hands each good frame to its sink.
 *
 * <p>Single-threaded (the source thread). Allocation-free after construction: whole frames are
 * parsed where the caller's bytes lie, and only a frame split between calls is copied into one
 * buffer that holds two largest frames; the CRC object is reused, and frames are decoded into one
 * {@link DecodedFrame}. A header that fails its checks or a frame whose CRC does not match is
 * counted corrupt and the search resumes one byte after its sync word, so a truncated frame
 * followed by a good one loses only itself. The first good frame after skipped bytes or a corrupt
 * frame counts as a resynchronisation.
 */
public final class FrameDecoder implements StreamDecoder {
  private final FrameSink sink;
  private final StreamCounters counters;
  private final byte[] own = new byte[2 * WireFormat.MAX_FRAME_BYTES];

  /** The bytes being parsed: {@link #own}, or the caller's while nothing was left buffered. */
  private byte[] buf = own;

  private final CRC32 crc = new CRC32();
  private final DecodedFrame frame =
      new DecodedFrame(WireFormat.MAX_CHANNELS * WireFormat.MAX_SAMPLES_PER_FRAME);
  private int start;
  private int end;
  private boolean outOfSync;
  private long skippedBytes;

  /**
   * @param counters where frames, corrupt frames and resyncs are counted
   */
  public FrameDecoder(FrameSink sink, StreamCounters counters) {
    this.sink = sink;
    this.counters = counters;
  }

  @Override
  public void accept(byte[] src, int off, int len) {
    if (start == end && len > 0) {
      // Nothing buffered: parse the caller's bytes where they lie and keep only an incomplete tail.
      buf = src;
      start = off;
      end = off + len;
      try {
        parse();
        off = start;
        len = end - start;
      } finally {
        // Never keep the caller's array, even when the sink threw: it is theirs to reuse.
        buf = own;
        start = 0;
        end = 0;
      }
    }
    while (len > 0) {
      if (end == buf.length) {
        compact();
      }
      int n = Math.min(len, buf.length - end);
      System.arraycopy(src, off, buf, end, n);
      end += n;
      off += n;
      len -= n;
      parse();
    }
  }

  @Override
  public void reset() {
    // An incomplete frame at the head may be a corrupt length field hiding complete frames behind
    // it: count it and search on through what is buffered before forgetting the rest.
    while (end > start) {
      if (end - start >= 4 && syncAt(start)) {
        counters.addCorruptFrame();
      } else {
        skippedBytes++;
      }
      outOfSync = true;
      start++;
      parse();
    }
    start = 0;
    end = 0;
  }

  @Override
  public long skippedBytes() {
    return skippedBytes;
  }

  private void parse() {
    while (true) {
      int avail = end - start;
      if (avail < 4) {
        break;
      }
      if (!syncAt(start)) {
        skipToNextSyncCandidate();
        continue;
      }
      if (avail < WireFormat.HEADER_BYTES) {
        break;
      }
      int frameBytes = checkedFrameBytes(start);
      if (frameBytes < 0) {
        rejectAtStart();
        continue;
      }
      if (avail < frameBytes) {
        break;
      }
      int payloadEnd = start + frameBytes - WireFormat.CRC_BYTES;
      crc.reset();
      crc.update(buf, start, payloadEnd - start);
      if ((int) crc.getValue() != WireFormat.i32(buf, payloadEnd)) {
        rejectAtStart();
        continue;
      }
      if (outOfSync) {
        counters.addResync();
        outOfSync = false;
      }
      counters.addFrame();
      decode(start);
      start += frameBytes;
      sink.onFrame(frame);
    }
    if (start == end) {
      start = 0;
      end = 0;
    }
  }

  /** Counts the frame at {@code start} corrupt and searches on from the next byte. */
  private void rejectAtStart() {
    counters.addCorruptFrame();
    outOfSync = true;
    start++;
  }

  private void skipToNextSyncCandidate() {
    int p = start + 1;
    while (p < end && buf[p] != WireFormat.SYNC0) {
      p++;
    }
    skippedBytes += p - start;
    outOfSync = true;
    start = p;
  }

  private boolean syncAt(int p) {
    return buf[p] == WireFormat.SYNC0
        && buf[p + 1] == WireFormat.SYNC1
        && buf[p + 2] == WireFormat.SYNC2
        && buf[p + 3] == WireFormat.SYNC3;
  }

  /** The frame's length if its header is well formed, else −1. */
  private int checkedFrameBytes(int p) {
    int version = buf[p + WireFormat.OFF_VERSION] & 0xff;
    int format = buf[p + WireFormat.OFF_FORMAT] & 0xff;
    int channels = buf[p + WireFormat.OFF_CHANNELS] & 0xff;
    int flags = buf[p + WireFormat.OFF_FLAGS] & 0xff;
    int samples = WireFormat.u16(buf, p + WireFormat.OFF_SAMPLES);
    int reserved = WireFormat.u16(buf, p + WireFormat.OFF_RESERVED);
    float rate = Float.intBitsToFloat(WireFormat.i32(buf, p + WireFormat.OFF_RATE));
    if (version != WireFormat.VERSION
        || WireFormat.bytesPerValue(format) == 0
        || channels < 1
        || channels > WireFormat.MAX_CHANNELS
        || flags != 0
        || reserved != 0
        || samples < 1
        || samples > WireFormat.MAX_SAMPLES_PER_FRAME
        || !(rate >= 0)
        || Float.isInfinite(rate)) {
      return -1;
    }
    return WireFormat.frameBytes(format, channels, samples);
  }

  /** Little-endian int16 straight from the byte array: one load instead of two and a shift. */
  private static final java.lang.invoke.VarHandle INT16_LE =
      java.lang.invoke.MethodHandles.byteArrayViewVarHandle(
          short[].class, java.nio.ByteOrder.LITTLE_ENDIAN);

  private void decode(int p) {
    DecodedFrame f = frame;
    f.sampleFormat = buf[p + WireFormat.OFF_FORMAT] & 0xff;
    f.channels = buf[p + WireFormat.OFF_CHANNELS] & 0xff;
    f.samples = WireFormat.u16(buf, p + WireFormat.OFF_SAMPLES);
    f.sequence = WireFormat.i32(buf, p + WireFormat.OFF_SEQUENCE) & 0xffffffffL;
    f.firstSample = WireFormat.i32(buf, p + WireFormat.OFF_FIRST_SAMPLE) & 0xffffffffL;
    f.sampleRateHz = Float.intBitsToFloat(WireFormat.i32(buf, p + WireFormat.OFF_RATE));
    int n = f.channels * f.samples;
    int q = p + WireFormat.HEADER_BYTES;
    double[] v = f.values;
    if (f.sampleFormat == WireFormat.FORMAT_INT16) {
      for (int i = 0; i < n; i++, q += 2) {
        v[i] = (short) INT16_LE.get(buf, q);
      }
    } else {
      for (int i = 0; i < n; i++, q += 4) {
        v[i] = Float.intBitsToFloat(WireFormat.i32(buf, q));
      }
    }
  }

  private void compact() {
    int n = end - start;
    System.arraycopy(buf, start, buf, 0, n);
    start = 0;
    end = n;
  }
}
