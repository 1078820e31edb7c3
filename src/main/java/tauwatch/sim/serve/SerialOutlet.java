package tauwatch.sim.serve;

import com.fazecast.jSerialComm.SerialPort;
import java.io.IOException;
import tauwatch.wire.DeviceProfile;

/**
 * Writes the stream to a serial port (on a test bench, one end of a pseudo-terminal pair).
 *
 * <p>Serving thread only. jSerialComm copies the whole array on every write, so the caller passes
 * its small per-frame buffer, never a large one. A link drop makes the port quiet for the outage.
 */
public final class SerialOutlet implements ByteOutlet {
  private final SerialPort port;
  private final String device;
  private long quietUntilNanos;

  public SerialOutlet(String device, DeviceProfile.SerialSettings settings) throws IOException {
    this.device = device;
    SerialPort p;
    try {
      p = SerialPort.getCommPort(device);
    } catch (RuntimeException e) {
      throw new IOException("serial:" + device + ": no such port (" + e.getMessage() + ")", e);
    }
    int baud = settings == null ? 921_600 : settings.baud();
    p.setComPortParameters(baud, 8, SerialPort.ONE_STOP_BIT, SerialPort.NO_PARITY);
    p.setFlowControl(SerialPort.FLOW_CONTROL_DISABLED);
    p.setComPortTimeouts(SerialPort.TIMEOUT_WRITE_BLOCKING, 0, 1000);
    if (!p.openPort()) {
      throw new IOException(
          "serial:" + device + ": cannot open (error " + p.getLastErrorCode() + ")");
    }
    this.port = p;
  }

  @Override
  public boolean write(byte[] buf, int len) {
    if (System.nanoTime() - quietUntilNanos < 0) {
      return false;
    }
    return port.writeBytes(buf, len) == len;
  }

  @Override
  public void dropLink(long outageMs) {
    quietUntilNanos = System.nanoTime() + outageMs * 1_000_000;
  }

  @Override
  public String describe() {
    return "serial:" + device;
  }

  @Override
  public void close() {
    port.closePort();
  }
}
