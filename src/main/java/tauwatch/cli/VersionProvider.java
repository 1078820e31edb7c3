package tauwatch.cli;

import picocli.CommandLine.IVersionProvider;
import tauwatch.record.SessionInfo;

/** Reports the version from the jar's manifest. */
final class VersionProvider implements IVersionProvider {
  @Override
  public String[] getVersion() {
    return new String[] {"tauwatch " + SessionInfo.softwareVersion()};
  }
}
