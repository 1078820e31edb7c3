package tauwatch.source;

import java.io.IOException;

/**
 * A byte link to a device (a TCP connection, a serial port) that can be opened again after it
 * closes.
 *
 * <p>Used by one source thread only. {@link #read} waits at most a short, fixed time (about 100 ms)
 * so that the source notices silence and stop requests; it must not allocate per call.
 */
interface ByteLink {
  /** Opens the link; the message of a failure is one line naming the device. */
  void open() throws IOException;

  /**
   * Reads what has arrived into {@code buf[off..off+len)}.
   *
   * @return bytes read, 0 when nothing arrived within the wait, −1 when the link has closed
   */
  int read(byte[] buf, int off, int len) throws IOException;

  boolean isOpen();

  /** Closes the link; harmless when it is closed already. */
  void close();

  /** E.g. {@code tcp://127.0.0.1:47800}. */
  String describe();
}
