package tauwatch.source;

import java.io.IOException;
import java.net.InetSocketAddress;
import java.net.StandardSocketOptions;
import java.nio.ByteBuffer;
import java.nio.channels.SelectionKey;
import java.nio.channels.Selector;
import java.nio.channels.SocketChannel;

/**
 * A TCP client link to a network DAQ or an acquisition computer.
 *
 * <p>One source thread. Reads through a non-blocking channel and a selector so that a quiet link
 * returns after {@value #WAIT_MS} ms without an exception; the byte buffer view of the caller's
 * array is made once per array, so reads do not allocate.
 */
final class TcpLink implements ByteLink {
  static final int WAIT_MS = 100;
  private static final int CONNECT_TIMEOUT_MS = 1000;

  private final String host;
  private final int port;
  private SocketChannel channel;
  private Selector selector;
  private byte[] wrapped;
  private ByteBuffer view;

  TcpLink(String host, int port) {
    this.host = host;
    this.port = port;
  }

  @Override
  public void open() throws IOException {
    close();
    SocketChannel ch = SocketChannel.open();
    try {
      ch.setOption(StandardSocketOptions.SO_RCVBUF, 1 << 18);
      ch.socket().connect(new InetSocketAddress(host, port), CONNECT_TIMEOUT_MS);
      ch.configureBlocking(false);
      Selector sel = Selector.open();
      ch.register(sel, SelectionKey.OP_READ);
      channel = ch;
      selector = sel;
    } catch (IOException e) {
      ch.close();
      throw new IOException(describe() + ": cannot connect: " + e.getMessage(), e);
    }
  }

  @Override
  public int read(byte[] buf, int off, int len) throws IOException {
    if (channel == null) {
      return -1;
    }
    if (buf != wrapped) {
      wrapped = buf;
      view = ByteBuffer.wrap(buf);
    }
    view.limit(off + len).position(off);
    int n = channel.read(view);
    if (n == 0) {
      selector.select(WAIT_MS);
      selector.selectedKeys().clear();
      view.limit(off + len).position(off);
      n = channel.read(view);
    }
    return n;
  }

  @Override
  public boolean isOpen() {
    return channel != null;
  }

  @Override
  public void close() {
    closeQuietly();
  }

  private void closeQuietly() {
    try {
      if (selector != null) {
        selector.close();
      }
      if (channel != null) {
        channel.close();
      }
    } catch (IOException e) {
      // Closing a dead socket can fail; the link is gone either way, and the caller logs the loss.
      channel = null;
    }
    selector = null;
    channel = null;
  }

  @Override
  public String describe() {
    return "tcp://" + host + ":" + port;
  }
}
