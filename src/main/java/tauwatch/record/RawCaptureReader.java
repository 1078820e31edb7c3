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
 * <p>Single-threaded. The payload array is reused (grown when a record is larger), so reading does
 * not allocate per record. A malformed header or a record cut short is an {@link IOException} with
 * one line naming the file.
 */
public final class RawCaptureReader implements AutoCloseable {
  public static final String MAGIC = "tauwatch-capture 1";

  /** Record type: bytes as received. */
  public static final int BYTES = RawCaptureWriter.TYPE_BYTES;

  /** Record type: the link closed or fell silent. */
  public static final int LINK_LOST = RawCaptureWriter.TYPE_LINK_LOST;

  private final Path file;
  private final InputStream in;
  private final String sourceName;
  private final String profileToml;
  private final byte[] head = new byte[RawCaptureWriter.RECORD_HEADER_BYTES];
  private byte[] payload = new byte[1 << 16];
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
    int got = in.readNBytes(head, 0, head.length);
    if (got == 0) {
      return false;
    }
    if (got < head.length) {
      throw new EOFException(file + ": last record cut short (a capture that was not closed)");
    }
    type = head[0];
    long t = 0;
    for (int i = 7; i >= 0; i--) {
      t = t << 8 | (head[1 + i] & 0xff);
    }
    nanos = t;
    int len = 0;
    for (int i = 3; i >= 0; i--) {
      len = len << 8 | (head[9 + i] & 0xff);
    }
    if (len < 0 || (type != BYTES && type != LINK_LOST)) {
      throw new IOException(file + ": malformed record (type " + type + ", length " + len + ")");
    }
    if (len > payload.length) {
      payload = new byte[len];
    }
    if (in.readNBytes(payload, 0, len) != len) {
      throw new EOFException(file + ": last record cut short (a capture that was not closed)");
    }
    length = len;
    return true;
  }

  public int type() {
    return type;
  }

  /** Receive time of the record, ns since the capture began. */
  public long nanos() {
    return nanos;
  }

  public byte[] payload() {
    return payload;
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
