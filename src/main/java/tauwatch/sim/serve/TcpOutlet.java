package tauwatch.sim.serve;

import java.io.IOException;
import java.io.OutputStream;
import java.net.InetAddress;
import java.net.InetSocketAddress;
import java.net.ServerSocket;
import java.net.Socket;

/**
 * A TCP server for one client at a time; a new client replaces the old one.
 *
 * <p>An accept thread takes connections; the serving thread writes. The client's socket crosses
 * threads through a volatile field. Bound to the loopback address unless the caller asked for
 * another.
 */
public final class TcpOutlet implements ByteOutlet {
  private final ServerSocket server;
  private final Thread acceptor;
  private volatile Socket client;
  private volatile OutputStream out;
  private volatile long refuseUntilNanos;
  private volatile boolean closed;

  /**
   * @param address where to listen; {@code InetAddress.getLoopbackAddress()} by default
   * @param port TCP port, 0 for any free one
   */
  public TcpOutlet(InetAddress address, int port) throws IOException {
    server = new ServerSocket();
    server.setReuseAddress(true);
    server.bind(new InetSocketAddress(address, port), 4);
    acceptor = new Thread(this::acceptLoop, "tauwatch-serve-accept");
    acceptor.setDaemon(true);
    acceptor.start();
  }

  public int localPort() {
    return server.getLocalPort();
  }

  private void acceptLoop() {
    while (!closed) {
      try {
        Socket s = server.accept();
        if (System.nanoTime() - refuseUntilNanos < 0) {
          s.close();
          continue;
        }
        s.setTcpNoDelay(true);
        dropClient();
        out = s.getOutputStream();
        client = s;
      } catch (IOException e) {
        if (!closed) {
          System.err.println("simulate: accept failed: " + e.getMessage());
        }
      }
    }
  }

  /** Whether a client is connected now. */
  public boolean connected() {
    return client != null;
  }

  @Override
  public boolean write(byte[] buf, int len) {
    OutputStream o = out;
    if (o == null) {
      return false;
    }
    try {
      o.write(buf, 0, len);
      return true;
    } catch (IOException e) {
      // The client went away; the next one that connects gets the stream from then on.
      dropClient();
      return false;
    }
  }

  @Override
  public void dropLink(long outageMs) {
    refuseUntilNanos = System.nanoTime() + outageMs * 1_000_000;
    dropClient();
  }

  private synchronized void dropClient() {
    Socket s = client;
    client = null;
    out = null;
    if (s != null) {
      try {
        s.close();
      } catch (IOException e) {
        System.err.println("simulate: closing a client failed: " + e.getMessage());
      }
    }
  }

  @Override
  public String describe() {
    return "tcp://" + server.getInetAddress().getHostAddress() + ":" + localPort();
  }

  @Override
  public void close() throws IOException {
    closed = true;
    dropClient();
    server.close();
  }
}
