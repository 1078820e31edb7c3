package tauwatch.cli;

import java.io.IOException;
import java.nio.file.Path;
import tauwatch.sim.ScenarioException;
import tauwatch.sim.ScenarioLoader;
import tauwatch.sim.SimulatedRecording;
import tauwatch.source.InterchangeCsvSource;
import tauwatch.source.SampleSource;
import tauwatch.source.SimulatedSource;
import tauwatch.source.SourceUri;

/** Opens the source a {@code --source} URI names, turning every failure into one line. */
final class SourceOpener {
  private SourceOpener() {}

  /**
   * @param paced for the simulator: real time (true) or as fast as possible
   * @param seed for the simulator: the noise seed, or null for the scenario's own
   * @param filterCutoffHz for files: the filter the recording went through, 0 if none
   */
  static SampleSource open(String uri, boolean paced, Long seed, double filterCutoffHz)
      throws UserInputException {
    SourceUri u;
    try {
      u = SourceUri.parse(uri);
    } catch (IllegalArgumentException e) {
      throw new UserInputException(e.getMessage());
    }
    switch (u.scheme()) {
      case "sim":
        try {
          var scenario = ScenarioLoader.load(u.target());
          var recording =
              seed == null
                  ? new SimulatedRecording(scenario)
                  : new SimulatedRecording(scenario, seed);
          return new SimulatedSource(recording, paced);
        } catch (ScenarioException e) {
          throw new UserInputException(e.getMessage());
        }
      case "file":
        return openFile(Path.of(u.target()), filterCutoffHz);
      default:
        throw new UserInputException(
            "--source " + u + ": " + u.scheme() + " sources are not available in this version");
    }
  }

  static SampleSource openFile(Path file, double filterCutoffHz) throws UserInputException {
    try {
      return new InterchangeCsvSource(file, filterCutoffHz);
    } catch (IOException e) {
      throw new UserInputException(e.getMessage(), e);
    }
  }
}
