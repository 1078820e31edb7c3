package tauwatch.cli;

import java.io.IOException;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.Map;
import tauwatch.record.RawCaptureReader;
import tauwatch.record.RawCaptureWriter;
import tauwatch.sim.ScenarioException;
import tauwatch.sim.ScenarioLoader;
import tauwatch.sim.SimulatedRecording;
import tauwatch.source.CaptureFileSource;
import tauwatch.source.DeviceStreamSource;
import tauwatch.source.InterchangeCsvSource;
import tauwatch.source.SampleSource;
import tauwatch.source.SimulatedSource;
import tauwatch.source.SourceUri;
import tauwatch.wire.DeviceProfile;
import tauwatch.wire.DeviceProfileLoader;
import tauwatch.wire.ProfileException;

/** Opens the source a {@code --source} URI names, turning every failure into one line. */
final class SourceOpener {
  private SourceOpener() {}

  /** An opened source, the device profile it reads by (or null) and its raw capture (or null). */
  record Opened(SampleSource source, DeviceProfile profile, RawCaptureWriter capture)
      implements AutoCloseable {
    /** The profile as session.json records it. */
    Map<String, Object> profileField() {
      Map<String, Object> m = new LinkedHashMap<>();
      m.put("name", profile.name());
      m.put("origin", profile.origin());
      m.put("text", profile.text());
      return m;
    }

    @Override
    public void close() throws UserInputException {
      if (capture != null) {
        try {
          capture.close();
        } catch (IOException e) {
          throw new UserInputException("capture " + capture.file() + ": " + e.getMessage(), e);
        }
      }
    }
  }

  /**
   * @param paced for the simulator: real time (true) or as fast as possible
   * @param seed for the simulator: the noise seed, or null for the scenario's own
   * @param filterCutoffHz for CSV files: the filter the recording went through, 0 if none
   */
  static SampleSource open(String uri, boolean paced, Long seed, double filterCutoffHz)
      throws UserInputException {
    return open(uri, paced, seed, filterCutoffHz, null, null).source();
  }

  /**
   * @param profileName for tcp and serial: a device profile name or file; null for the simulator's
   * @param capture for tcp and serial: a raw capture file to record into, or null
   */
  static Opened open(
      String uri, boolean paced, Long seed, double filterCutoffHz, String profileName, Path capture)
      throws UserInputException {
    SourceUri u;
    try {
      u = SourceUri.parse(uri);
    } catch (IllegalArgumentException e) {
      throw new UserInputException(e.getMessage());
    }
    boolean device = u.scheme().equals("tcp") || u.scheme().equals("serial");
    if (capture != null && !device) {
      throw new UserInputException(
          "--capture records a device stream (tcp:// or serial:), not " + u.scheme() + " sources");
    }
    if (profileName != null && !device) {
      throw new UserInputException(
          "--profile applies to tcp:// and serial: sources, not " + u.scheme() + " sources");
    }
    switch (u.scheme()) {
      case "sim":
        try {
          var scenario = ScenarioLoader.load(u.target());
          var recording =
              seed == null
                  ? new SimulatedRecording(scenario)
                  : new SimulatedRecording(scenario, seed);
          return new Opened(new SimulatedSource(recording, paced), null, null);
        } catch (ScenarioException e) {
          throw new UserInputException(e.getMessage());
        }
      case "file":
        return openFile(Path.of(u.target()), filterCutoffHz);
      default:
        DeviceProfile profile = profile(profileName);
        RawCaptureWriter writer = null;
        try {
          if (capture != null) {
            writer = new RawCaptureWriter(capture, u.toString(), profile.text());
          }
          SampleSource s =
              u.scheme().equals("tcp")
                  ? DeviceStreamSource.tcp(u.host(), u.port(), profile, writer)
                  : DeviceStreamSource.serial(u.target(), profile, writer);
          return new Opened(s, profile, writer);
        } catch (IllegalArgumentException e) {
          closeQuietly(writer);
          throw new UserInputException("--source " + u + ": " + e.getMessage());
        } catch (IOException e) {
          throw new UserInputException("--capture " + capture + ": " + e.getMessage(), e);
        }
    }
  }

  static DeviceProfile profile(String nameOrPath) throws UserInputException {
    try {
      return DeviceProfileLoader.load(
          nameOrPath == null ? DeviceProfileLoader.DEFAULT_PROFILE : nameOrPath);
    } catch (ProfileException e) {
      throw new UserInputException(e.getMessage(), e);
    }
  }

  /** The source URI a profile's own transport names (tcp first), for watch without --source. */
  static String uriOf(DeviceProfile p) throws UserInputException {
    if (p.tcp() != null && p.tcp().port() > 0) {
      return "tcp://" + p.tcp().host() + ":" + p.tcp().port();
    }
    if (p.serial() != null && !p.serial().device().isEmpty()) {
      return "serial:" + p.serial().device();
    }
    throw new UserInputException(
        "profile "
            + p.name()
            + " names no device address; give --source tcp://HOST:PORT or serial:DEVICE");
  }

  /** A recorded file: a raw capture or an interchange CSV, told apart by its first bytes. */
  static Opened openFile(Path file, double filterCutoffHz) throws UserInputException {
    try {
      if (java.nio.file.Files.isRegularFile(file) && RawCaptureReader.isCapture(file)) {
        CaptureFileSource c = new CaptureFileSource(file);
        return new Opened(c, c.profile(), null);
      }
      return new Opened(new InterchangeCsvSource(file, filterCutoffHz), null, null);
    } catch (IOException e) {
      throw new UserInputException(e.getMessage(), e);
    }
  }

  private static void closeQuietly(RawCaptureWriter w) {
    if (w != null) {
      try {
        w.close();
      } catch (IOException e) {
        // Already reporting the reason the source could not open; this one is secondary.
        System.err.println("capture " + w.file() + ": " + e.getMessage());
      }
    }
  }
}
