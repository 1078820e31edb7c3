package tauwatch.record;

import java.io.BufferedOutputStream;
import java.io.IOException;
import java.io.OutputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;

/**
 * Records a device stream as received, in the Tauwatch raw capture format, so that a session can be
 * replayed and re-analysed byte for byte.
 *
 * <p>Format ({@code drivers/WIRE-FORMAT.md}, "Raw capture"): a text header — the line {@value
 * RawCaptureReader#MAGIC}, {@code source NAME}, {@code profile LENGTH}, the device profile's TOML
 * text of that many UTF-8 bytes, a newline and {@code data} — then records of type u8, receive time
 * u64 (ns since the capture began), payload length u32 (little-endian) and the payload: type 1
 * bytes as received, type 2 the link closed or fell silent. Single writer (the source thread);
 * writes go through a 64 KiB buffer flushed at least every {@value #FLUSH_INTERVAL_MS} ms, so a
 * crash loses at most that much; the record header is assembled in a reusable array.
 */
public final class RawCaptureWriter implements AutoCloseable {
  static final int TYPE_BYTES = 1;
  static final int TYPE_LINK_LOST = 2;
  static final int RECORD_HEADER_BYTES = 13;
  private static final long FLUSH_INTERVAL_MS = 200;

  private final Path file;
  private final OutputStream out;
  private final byte[] header = new byte[RECORD_HEADER_BYTES];
  private final long startNanos;
  private long lastFlushNanos;

  public RawCaptureWriter(Path file, String sourceName, String profileToml) throws IOException {
    this.file = file;
    Path parent = file.toAbsolutePath().getParent();
    if (parent != null) {
      Files.createDirectories(parent);
    }
    out = new BufferedOutputStream(Files.newOutputStream(file), 1 << 16);
    byte[] profile = profileToml.getBytes(StandardCharsets.UTF_8);
    String head =
        RawCaptureReader.MAGIC
            + "\nsource "
            + sourceName.replace('\n', ' ')
            + "\nprofile "
            + profile.length
            + "\n";
    out.write(head.getBytes(StandardCharsets.UTF_8));
    out.write(profile);
    out.write("\ndata\n".getBytes(StandardCharsets.UTF_8));
    out.flush();
    startNanos = System.nanoTime();
    lastFlushNanos = startNanos;
  }

  public Path file() {
    return file;
  }

  /** Records bytes as received at {@code receivedNanos} (System.nanoTime()). */
  public void bytes(byte[] buf, int off, int len, long receivedNanos) throws IOException {
    record(TYPE_BYTES, receivedNanos, len);
    out.write(buf, off, len);
    maybeFlush(receivedNanos);
  }

  /** Records that the link closed or fell silent at {@code nanos}. */
  public void linkLost(long nanos) throws IOException {
    record(TYPE_LINK_LOST, nanos, 0);
    out.flush();
    lastFlushNanos = nanos;
  }

  private void record(int type, long nanos, int len) throws IOException {
    long t = nanos - startNanos;
    header[0] = (byte) type;
    for (int i = 0; i < 8; i++) {
      header[1 + i] = (byte) (t >>> (8 * i));
    }
    for (int i = 0; i < 4; i++) {
      header[9 + i] = (byte) (len >>> (8 * i));
    }
    out.write(header, 0, RECORD_HEADER_BYTES);
  }

  private void maybeFlush(long nanos) throws IOException {
    if (nanos - lastFlushNanos > FLUSH_INTERVAL_MS * 1_000_000) {
      out.flush();
      lastFlushNanos = nanos;
    }
  }

  @Override
  public void close() throws IOException {
    out.close();
  }
}
