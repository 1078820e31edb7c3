package tauwatch.wire;

import tauwatch.stream.StreamCounters;

/**
 * The decoder of the line-based text variant: one sample per line, comma-separated signed integers,
 * optionally led by a sample counter.
 *
 * <p>Single-threaded (the source thread); allocation-free. A line with a character other than
 * digits, a leading minus, spaces and commas, with the wrong number of fields, a value outside
 * ±2^31 or longer than {@value #MAX_LINE_BYTES} bytes is counted as a corrupt frame and skipped to
 * its newline. After construction and after {@link #reset()} the first line is skipped (its bytes
 * counted), because a link may have joined mid-line and a truncated line can still look well
 * formed. Good lines are handed on in runs of up to {@value #RUN_SAMPLES} samples, at the end of
 * each {@link #accept} and wherever the counter jumps.
 */
public final class TextLineDecoder implements StreamDecoder {
  public static final int MAX_LINE_BYTES = 120;
  static final int RUN_SAMPLES = 256;

  private final FrameSink sink;
  private final StreamCounters counters;
  private final int channels;
  private final boolean counter;
  private final int fields;
  private final long[] lineValues;
  private final DecodedFrame frame;

  private boolean skippingFirstLine = true;
  private boolean bad;
  private boolean outOfSync;
  private int lineBytes;
  private int field;
  private long value;
  private boolean negative;
  private boolean anyDigit;
  private boolean anyInField;
  private long runNextCounter = -1;
  private long skippedBytes;

  /**
   * @param channels values per line after the counter
   * @param counter whether each line starts with a sample counter
   */
  public TextLineDecoder(FrameSink sink, StreamCounters counters, int channels, boolean counter) {
    if (channels < 1 || channels > WireFormat.MAX_CHANNELS) {
      throw new IllegalArgumentException("channels must be 1–" + WireFormat.MAX_CHANNELS);
    }
    this.sink = sink;
    this.counters = counters;
    this.channels = channels;
    this.counter = counter;
    this.fields = channels + (counter ? 1 : 0);
    this.lineValues = new long[fields];
    this.frame = new DecodedFrame(channels * RUN_SAMPLES);
    frame.channels = channels;
    frame.sampleFormat = 0;
    frame.sequence = -1;
    frame.sampleRateHz = 0;
    startLine();
  }

  @Override
  public void accept(byte[] src, int off, int len) {
    for (int i = off, end = off + len; i < end; i++) {
      byte b = src[i];
      if (skippingFirstLine) {
        skippedBytes++;
        if (b == '\n') {
          skippingFirstLine = false;
          startLine();
        }
        continue;
      }
      if (b == '\n') {
        endLine();
        continue;
      }
      if (++lineBytes > MAX_LINE_BYTES) {
        bad = true;
      }
      if (bad) {
        continue;
      }
      if (b >= '0' && b <= '9') {
        value = value * 10 + (b - '0');
        anyDigit = true;
        anyInField = true;
        if (value > (1L << 31)) {
          bad = true;
        }
      } else if (b == '-' && !anyInField) {
        negative = true;
        anyInField = true;
      } else if (b == ',') {
        endField();
      } else if (b == ' ' || b == '\r' || b == '\t') {
        // Spaces around values and a CR before the newline are allowed.
      } else {
        bad = true;
      }
    }
    flushRun();
  }

  @Override
  public void reset() {
    flushRun();
    if (lineBytes > 0 && !skippingFirstLine) {
      counters.addCorruptFrame();
      outOfSync = true;
    }
    skippingFirstLine = true;
    runNextCounter = -1;
    startLine();
  }

  @Override
  public long skippedBytes() {
    return skippedBytes;
  }

  private void endField() {
    if (!anyDigit || field >= fields) {
      bad = true;
      return;
    }
    lineValues[field++] = negative ? -value : value;
    value = 0;
    negative = false;
    anyDigit = false;
    anyInField = false;
  }

  private void endLine() {
    if (!bad && lineBytes == 0) {
      return; // an empty line carries nothing
    }
    if (!bad) {
      endField();
    }
    if (bad || field != fields) {
      counters.addCorruptFrame();
      outOfSync = true;
      startLine();
      return;
    }
    if (outOfSync) {
      counters.addResync();
      outOfSync = false;
    }
    counters.addFrame();
    if (counter) {
      long c = lineValues[0] & 0xffffffffL;
      if (frame.samples > 0 && c != runNextCounter) {
        flushRun();
      }
      if (frame.samples == 0) {
        frame.firstSample = c;
      }
      runNextCounter = (c + 1) & 0xffffffffL;
    } else if (frame.samples == 0) {
      frame.firstSample = -1;
    }
    int base = frame.samples * channels;
    int from = counter ? 1 : 0;
    for (int ch = 0; ch < channels; ch++) {
      frame.values[base + ch] = lineValues[from + ch];
    }
    frame.samples++;
    if (frame.samples == RUN_SAMPLES) {
      flushRun();
    }
    startLine();
  }

  private void flushRun() {
    if (frame.samples > 0) {
      sink.onFrame(frame);
      frame.samples = 0;
    }
  }

  private void startLine() {
    bad = false;
    lineBytes = 0;
    field = 0;
    value = 0;
    negative = false;
    anyDigit = false;
    anyInField = false;
  }
}
