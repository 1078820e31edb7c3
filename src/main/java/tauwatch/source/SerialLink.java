package tauwatch.source;

import com.fazecast.jSerialComm.SerialPort;
import com.fazecast.jSerialComm.SerialPortDataListener;
import com.fazecast.jSerialComm.SerialPortEvent;
import java.io.IOException;
import tauwatch.wire.DeviceProfile;

/**
 * A serial link through jSerialComm: a microcontroller DAQ on USB serial, or a pseudo-terminal.
 *
 * <p>One source thread reads; jSerialComm's event thread only reports a disconnect. Reads are
 * semi-blocking with a {@value #WAIT_MS} ms timeout. On an unplug jSerialComm fires the disconnect
 * event in a tight loop while the port still claims to be open, so the first event closes the port
 * and later reads return −1.
 */
final class SerialLink implements ByteLink {
  static final int WAIT_MS = 100;

  private final String device;
  private final DeviceProfile.SerialSettings settings;
  private volatile SerialPort port;
  private volatile boolean disconnected;

  SerialLink(String device, DeviceProfile.SerialSettings settings) {
    this.device = device;
    this.settings = settings;
  }

  @Override
  public void open() throws IOException {
    close();
    SerialPort p;
    try {
      p = SerialPort.getCommPort(device);
    } catch (RuntimeException e) {
      throw new IOException(describe() + ": no such port (" + e.getMessage() + ")", e);
    }
    int parity =
        settings.parity().equals("even")
            ? SerialPort.EVEN_PARITY
            : settings.parity().equals("odd") ? SerialPort.ODD_PARITY : SerialPort.NO_PARITY;
    p.setComPortParameters(
        settings.baud(),
        settings.dataBits(),
        settings.stopBits() == 2 ? SerialPort.TWO_STOP_BITS : SerialPort.ONE_STOP_BIT,
        parity);
    p.setFlowControl(SerialPort.FLOW_CONTROL_DISABLED);
    p.setComPortTimeouts(SerialPort.TIMEOUT_READ_SEMI_BLOCKING, WAIT_MS, 0);
    if (!p.openPort()) {
      throw new IOException(describe() + ": cannot open (error " + p.getLastErrorCode() + ")");
    }
    disconnected = false;
    p.addDataListener(new DisconnectWatch());
    port = p;
  }

  @Override
  public int read(byte[] buf, int off, int len) {
    SerialPort p = port;
    if (p == null || disconnected) {
      return -1;
    }
    int n = p.readBytes(buf, len, off);
    return n < 0 || disconnected ? -1 : n;
  }

  @Override
  public boolean isOpen() {
    return port != null;
  }

  @Override
  public void close() {
    SerialPort p = port;
    port = null;
    if (p != null) {
      p.removeDataListener();
      p.closePort();
    }
  }

  @Override
  public String describe() {
    return "serial:" + device;
  }

  /**
   * Marks the link lost on the first disconnect event. The port is closed by the source thread when
   * its read returns (within one read timeout), not here: closing it from jSerialComm's event
   * thread while the source thread sat in a read was seen to leave that read hanging for good. The
   * event repeats until then, which costs at most one read timeout of a busy event thread.
   */
  private final class DisconnectWatch implements SerialPortDataListener {
    @Override
    public int getListeningEvents() {
      return SerialPort.LISTENING_EVENT_PORT_DISCONNECTED;
    }

    @Override
    public void serialEvent(SerialPortEvent event) {
      disconnected = true;
    }
  }
}
