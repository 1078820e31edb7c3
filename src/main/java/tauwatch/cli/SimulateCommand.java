package tauwatch.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.net.InetAddress;
import java.net.UnknownHostException;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.Callable;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.TimeUnit;
import picocli.CommandLine.Command;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import tauwatch.sim.ScenarioException;
import tauwatch.sim.ScenarioLoader;
import tauwatch.sim.SimulatedRecording;
import tauwatch.sim.serve.ByteOutlet;
import tauwatch.sim.serve.FaultKind;
import tauwatch.sim.serve.SerialOutlet;
import tauwatch.sim.serve.SimulatedDaq;
import tauwatch.sim.serve.TcpOutlet;
import tauwatch.source.SourceUri;
import tauwatch.wire.DeviceProfile;

/** {@code tauwatch simulate --serve URI}: the simulated cell on the wire, for rig checkout. */
@Command(
    name = "simulate",
    mixinStandardHelpOptions = true,
    description = {
      "Serves the simulated cell in the Tauwatch wire format, paced in real time, as a DAQ would:"
          + " over TCP (a server on the loopback address unless --allow-remote) or a serial port.",
      "Fault kinds for --fault KIND[:RATE]: noise (RATE = bursts per second of 20 ms, 200 pA rms;"
          + " default 0.5), corrupt (share of frames with one bit flipped; default 0.01), drop"
          + " (share of frames never sent; default 0.01), garbage (share of frames followed by"
          + " 1–64 random bytes; default 0.01), truncate (share of frames cut short; default 0.01),"
          + " disconnect (seconds of link between drops of 1.5 s; default 5)."
    })
final class SimulateCommand implements Callable<Integer> {
  @Spec CommandSpec spec;

  @Option(
      names = "--serve",
      required = true,
      paramLabel = "URI",
      description = "tcp://HOST:PORT (e.g. tcp://127.0.0.1:47800) or serial:PATH.")
  String serve;

  @Option(
      names = "--scenario",
      paramLabel = "NAME|FILE",
      description = "Scenario to play (default: ${DEFAULT-VALUE}).")
  String scenario = ScenarioLoader.DEFAULT_SCENARIO;

  @Option(names = "--seed", paramLabel = "N", description = "Noise seed for the simulated cell.")
  Long seed;

  @Option(
      names = "--duration",
      paramLabel = "TIME",
      converter = DurationConverter.class,
      description = "Stop after this much stream time (default: until Ctrl-C).")
  Duration duration;

  @Option(
      names = "--fault",
      paramLabel = "KIND[:RATE]",
      description = "Inject a fault; repeatable. Kinds are listed above.")
  List<String> faults = new ArrayList<>();

  @Option(
      names = "--fault-seed",
      paramLabel = "N",
      description = "Seed of the fault injection (default: ${DEFAULT-VALUE}).")
  long faultSeed = 7;

  @Option(
      names = "--profile",
      paramLabel = "FILE|NAME",
      description = "Device profile to encode with (default: simulator).")
  String profile;

  @Option(
      names = "--allow-remote",
      description = "Allow serving TCP on an address other than loopback (off by default).")
  boolean allowRemote;

  @Override
  public Integer call() throws Exception {
    PrintWriter out = spec.commandLine().getOut();
    SourceUri u;
    try {
      u = SourceUri.parse(serve);
    } catch (IllegalArgumentException e) {
      throw new UserInputException(e.getMessage().replace("--source", "--serve"));
    }
    if (!u.scheme().equals("tcp") && !u.scheme().equals("serial")) {
      throw new UserInputException(
          "--serve " + serve + ": expected tcp://HOST:PORT or serial:PATH");
    }
    List<FaultKind.Fault> plan = new ArrayList<>();
    for (String f : faults) {
      try {
        plan.add(FaultKind.parse(f));
      } catch (IllegalArgumentException e) {
        throw new UserInputException(e.getMessage());
      }
    }
    DeviceProfile p = SourceOpener.profile(profile);
    SimulatedRecording recording;
    try {
      var s = ScenarioLoader.load(scenario);
      recording = seed == null ? new SimulatedRecording(s) : new SimulatedRecording(s, seed);
    } catch (ScenarioException e) {
      throw new UserInputException(e.getMessage());
    }
    try (ByteOutlet outlet = openOutlet(u, p)) {
      SimulatedDaq daq;
      try {
        daq = new SimulatedDaq(recording, p, plan, faultSeed, outlet);
      } catch (IllegalArgumentException e) {
        throw new UserInputException(e.getMessage());
      }
      out.printf(
          "serving sim:%s on %s with profile %s%s%n",
          recording.scenario().name(),
          outlet.describe(),
          p.name(),
          plan.isEmpty() ? "" : ", faults " + String.join(" ", faults));
      out.flush();
      CountDownLatch finished = new CountDownLatch(1);
      Thread hook =
          new Thread(
              () -> {
                daq.stop();
                try {
                  finished.await(5, TimeUnit.SECONDS);
                } catch (InterruptedException e) {
                  Thread.currentThread().interrupt();
                }
              },
              "tauwatch-simulate-stop");
      Runtime.getRuntime().addShutdownHook(hook);
      try {
        daq.serve(duration == null ? Double.POSITIVE_INFINITY : duration.toNanos() * 1e-9);
      } finally {
        finished.countDown();
        try {
          Runtime.getRuntime().removeShutdownHook(hook);
        } catch (IllegalStateException shuttingDown) {
          // The hook is running (Ctrl-C); it waits for the latch released above.
          out.println("simulate: stopping");
        }
      }
      out.printf(
          "sent %d frames (%d corrupted, %d dropped, %d truncated), %d link drops, %d noise"
              + " bursts%n",
          daq.framesSent(),
          daq.framesCorrupted(),
          daq.framesDropped(),
          daq.framesTruncated(),
          daq.linkDrops(),
          daq.noiseBursts());
      out.flush();
    }
    return Main.EXIT_OK;
  }

  private ByteOutlet openOutlet(SourceUri u, DeviceProfile p) throws UserInputException {
    try {
      if (u.scheme().equals("tcp")) {
        InetAddress address;
        try {
          address = InetAddress.getByName(u.host());
        } catch (UnknownHostException e) {
          throw new UserInputException("--serve " + u + ": unknown host " + u.host());
        }
        if (!address.isLoopbackAddress() && !allowRemote) {
          throw new UserInputException(
              "--serve "
                  + u
                  + ": "
                  + u.host()
                  + " is not a loopback address; add --allow-remote to serve beyond this machine");
        }
        int port;
        try {
          port = u.port();
        } catch (IllegalArgumentException e) {
          throw new UserInputException("--serve " + u + ": " + e.getMessage());
        }
        return new TcpOutlet(address, port);
      }
      return new SerialOutlet(u.target(), p.serial());
    } catch (IOException e) {
      throw new UserInputException("--serve " + u + ": " + e.getMessage(), e);
    }
  }
}
