package tauwatch.stream;

/**
 * One ring slot: a run of consecutive samples of the command and response channels.
 *
 * <p>Preallocated once per slot and reused forever. Written only by the source thread between
 * claiming and publishing its sequence, read only by consumers after publication; the ring's
 * sequence barrier gives the happens-before edge, so the fields need no volatile.
 *
 * <p>Besides samples a block carries in-band stream news, so that consumers see it in stream order:
 * samples lost before this block ({@link #lostBeforeSamples}) and signal loss or recovery ({@link
 * #flags}). A block with {@code length == 0} carries only news.
 */
public final class SampleBlock {
  /** Samples per block; 256 keeps a block within a few cache lines per channel. */
  public static final int DEFAULT_CAPACITY = 256;

  /** The source lost its signal (connection closed, port unplugged) after the previous block. */
  public static final int FLAG_SIGNAL_LOST = 1;

  /** The signal is back; samples resume with this block. */
  public static final int FLAG_SIGNAL_RESTORED = 1 << 1;

  /** The stream ended; this is the last block. */
  public static final int FLAG_END_OF_STREAM = 1 << 2;

  /** Samples before this block were lost because the ring was full (an overrun, not a gap). */
  public static final int FLAG_OVERRUN = 1 << 3;

  /** Command channel samples: mV in voltage clamp, pA in current clamp; NaN when not recorded. */
  public final double[] command;

  /** Response channel samples: pA in voltage clamp, mV in current clamp. */
  public final double[] response;

  /** Sweep trigger per sample: 1 where a sweep of the acquisition program starts, else 0. */
  public final byte[] sweepStart;

  /** Valid samples in the arrays. */
  public int length;

  /** Stream index of {@code command[0]}: the sample count since the stream began. */
  public long firstSampleIndex;

  /** Samples missing from the stream just before this block (a sequence gap or an overrun). */
  public long lostBeforeSamples;

  /** {@link System#nanoTime()} when the source received the last sample of this block. */
  public long receivedNanos;

  /** A bit set of the {@code FLAG_*} constants. */
  public int flags;

  public SampleBlock(int capacity) {
    command = new double[capacity];
    response = new double[capacity];
    sweepStart = new byte[capacity];
  }

  public SampleBlock() {
    this(DEFAULT_CAPACITY);
  }

  public int capacity() {
    return command.length;
  }

  public boolean hasFlag(int flag) {
    return (flags & flag) != 0;
  }

  /** Resets the news fields before the source fills the block. */
  public void clear() {
    length = 0;
    lostBeforeSamples = 0;
    flags = 0;
    receivedNanos = 0;
  }
}
