package tauwatch.sim.serve;

import java.io.IOException;

/**
 * Where the serving simulator writes its byte stream: a TCP server's client, a serial port.
 *
 * <p>Called by the serving thread only. {@link #write} drops the bytes (returns false) while no
 * peer is connected, as a DAQ's output goes nowhere with nothing attached.
 */
public interface ByteOutlet extends AutoCloseable {
  boolean write(byte[] buf, int len);

  /** Breaks the link for {@code outageMs}: closes and refuses (TCP), or stays quiet (serial). */
  void dropLink(long outageMs);

  /** E.g. {@code tcp://127.0.0.1:47800}. */
  String describe();

  @Override
  void close() throws IOException;
}
