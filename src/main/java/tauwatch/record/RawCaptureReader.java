package tauwatch.record;

import java.io.BufferedInputStream;
import java.io.EOFException;
import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;

/**
 * Reads a Tauwatch raw capture (see {@link RawCaptureWriter}): its header, then record by record.
 *
 * <p>Single-threaded. Records are read in large chunks into one reused buffer (grown when a record
 * is larger) and handed out in place, at {@link #payloadOffset()} in {@link #payload()}, so reading
 * neither allocates nor copies per record. A malformed header or a record cut short is an {@link
 * IOException} with one line naming the file.
 */
public final class RawCaptureReader implements AutoCloseable {
  public static final String MAGIC = "tauwatch-capture 1";

  /** Record type: bytes as received. */
  public static final int BYTES = RawCaptureWriter.TYPE_BYTES;

  /** Record type: the link closed or fell silent. */
  public static final int LINK_LOST = RawCaptureWriter.TYPE_LINK_LOST;

  /**
   * Longest payload taken as a record: far beyond any single read a link hands over (kilobytes), so
   * that a corrupt length field is a clear error rather than an attempt to buffer gigabytes.
   */
  static final int MAX_RECORD_BYTES = 64 << 20;

  private final Path file;
  private final InputStream in;
  private final String sourceName;
  private final String profileToml;

  /** Records as read, {@code [pos, lim)} not yet handed out. */
  private byte[] buf = new byte[1 << 20];

  private int pos;
  private int lim;
  private int payloadOffset;
  private int type;
  private long nanos;
  private int length;

  public RawCaptureReader(Path file) throws IOException {
    this.file = file;
    this.in = new BufferedInputStream(Files.newInputStream(file), 1 << 16);
    if (!MAGIC.equals(line())) {
      in.close();
      throw new IOException(
          file + ": not a Tauwatch raw capture (first line is not " + MAGIC + ")");
    }
    String source = line();
    String profile = line();
    if (source == null
        || !source.startsWith("source ")
        || profile == null
        || !profile.startsWith("profile ")) {
      in.close();
      throw new IOException(file + ": capture header lacks its source or profile line");
    }
    sourceName = source.substring(7);
    int n;
    try {
      n = Integer.parseInt(profile.substring(8).trim());
    } catch (NumberFormatException e) {
      in.close();
      throw new IOException(file + ": capture header: bad profile length '" + profile + "'");
    }
    byte[] text = in.readNBytes(n);
    if (text.length != n || !"".equals(line()) || !"data".equals(line())) {
      in.close();
      throw new IOException(file + ": capture header cut short or malformed");
    }
    profileToml = new String(text, StandardCharsets.UTF_8);
  }

  /** Whether the file starts like a raw capture (as opposed to an interchange CSV). */
  public static boolean isCapture(Path file) throws IOException {
    try (InputStream in = Files.newInputStream(file)) {
      byte[] b = in.readNBytes(MAGIC.length());
      return new String(b, StandardCharsets.ISO_8859_1).equals(MAGIC);
    }
  }

  public String sourceName() {
    return sourceName;
  }

  public String profileToml() {
    return profileToml;
  }

  /**
   * Reads the next record.
   *
   * @return false at the clean end of the file
   */
  public boolean next() throws IOException {
    final int headBytes = RawCaptureWriter.RECORD_HEADER_BYTES;
    if (!buffered(headBytes)) {
      if (lim == pos) {
        return false;
      }
      throw new EOFException(file + ": last record cut short (a capture that was not closed)");
    }
    byte[] b = buf;
    int p = pos;
    type = b[p];
    long t = 0;
    for (int i = 7; i >= 0; i--) {
      t = t << 8 | (b[p + 1 + i] & 0xff);
    }
    nanos = t;
    int len = 0;
    for (int i = 3; i >= 0; i--) {
      len = len << 8 | (b[p + 9 + i] & 0xff);
    }
    if (len < 0 || len > MAX_RECORD_BYTES || (type != BYTES && type != LINK_LOST)) {
      throw new IOException(file + ": malformed record (type " + type + ", length " + len + ")");
    }
    pos = p + headBytes;
    if (!buffered(len)) {
      throw new EOFException(file + ": last record cut short (a capture that was not closed)");
    }
    payloadOffset = pos;
    pos += len;
    length = len;
    return true;
  }

  /**
   * Makes at least {@code n} unread bytes available from {@link #pos}, reading (and moving the
   * unread rest to the front, or growing the buffer) as needed; false at the end of the file.
   */
  private boolean buffered(int n) throws IOException {
    if (lim - pos >= n) {
      return true;
    }
    int rest = lim - pos;
    if (n > buf.length) {
      byte[] bigger = new byte[Math.max(n, 2 * buf.length)];
      System.arraycopy(buf, pos, bigger, 0, rest);
      buf = bigger;
    } else {
      System.arraycopy(buf, pos, buf, 0, rest);
    }
    pos = 0;
    lim = rest;
    while (lim < n) {
      int got = in.read(buf, lim, buf.length - lim);
      if (got < 0) {
        return false;
      }
      lim += got;
    }
    return true;
  }

  public int type() {
    return type;
  }

  /** Receive time of the record, ns since the capture began. */
  public long nanos() {
    return nanos;
  }

  /** The array holding the current record's payload, from {@link #payloadOffset()}. */
  public byte[] payload() {
    return buf;
  }

  /** Where the current record's payload starts in {@link #payload()}. */
  public int payloadOffset() {
    return payloadOffset;
  }

  public int length() {
    return length;
  }

  private String line() throws IOException {
    StringBuilder sb = new StringBuilder();
    int b;
    while ((b = in.read()) >= 0 && b != '\n') {
      sb.append((char) b);
    }
    return b < 0 && sb.length() == 0
        ? null
        : new String(sb.toString().getBytes(StandardCharsets.ISO_8859_1), StandardCharsets.UTF_8);
  }

  @Override
  public void close() throws IOException {
    in.close();
  }
}
