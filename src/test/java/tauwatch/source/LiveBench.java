package tauwatch.source;

import java.io.IOException;
import java.net.InetAddress;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.atomic.AtomicReference;
import tauwatch.event.EventKind;
import tauwatch.event.MonitorEvent;
import tauwatch.fit.Parameter;
import tauwatch.monitor.EstimateSummary;
import tauwatch.monitor.Monitor;
import tauwatch.monitor.MonitorConfig;
import tauwatch.monitor.MonitorResult;
import tauwatch.monitor.PulseEstimators;
import tauwatch.sim.ScenarioLoader;
import tauwatch.sim.SimulatedRecording;
import tauwatch.sim.serve.FaultKind;
import tauwatch.sim.serve.SimulatedDaq;
import tauwatch.sim.serve.TcpOutlet;
import tauwatch.wire.DeviceProfile;

/** A simulated DAQ serving on a loopback TCP port, and helpers to watch it. Test code only. */
final class LiveBench implements AutoCloseable {
  final TcpOutlet outlet;
  final SimulatedDaq daq;
  private Thread serving;

  LiveBench(String scenario, long seed, List<FaultKind.Fault> faults, DeviceProfile p, int port)
      throws IOException {
    outlet = new TcpOutlet(InetAddress.getLoopbackAddress(), port);
    daq =
        new SimulatedDaq(
            new SimulatedRecording(ScenarioLoader.load(scenario), seed), p, faults, 7, outlet);
  }

  int port() {
    return outlet.localPort();
  }

  /** Waits (bounded) for a client, then serves {@code seconds} of stream on a thread. */
  LiveBench serveWhenConnected(double seconds) throws InterruptedException {
    long deadline = System.nanoTime() + 5_000_000_000L;
    while (!outlet.connected() && System.nanoTime() < deadline) {
      Thread.sleep(5);
    }
    serving = new Thread(() -> daq.serve(seconds), "test-daq");
    serving.setDaemon(true);
    serving.start();
    return this;
  }

  void awaitServed() throws InterruptedException {
    serving.join(60_000);
  }

  @Override
  public void close() throws IOException, InterruptedException {
    daq.stop();
    if (serving != null) {
      serving.join(5_000);
    }
    outlet.close();
  }

  /** A session that runs on its own thread until stopped. */
  static final class Watching {
    final Monitor monitor;
    final EstimateSummary summary = new EstimateSummary();
    final AtomicReference<MonitorResult> result = new AtomicReference<>();
    final AtomicReference<Throwable> failure = new AtomicReference<>();

    /** Events as they were raised, with System.nanoTime() on arrival. */
    final List<MonitorEvent> raised = java.util.Collections.synchronizedList(new ArrayList<>());

    final List<Long> raisedNanos = java.util.Collections.synchronizedList(new ArrayList<>());
    private final Thread thread;

    Watching(SampleSource source, Path logDir, Duration duration) {
      MonitorConfig config = MonitorConfig.defaults();
      monitor =
          new Monitor(source, config, PulseEstimators.forFormat(source.format(), config), logDir);
      monitor.addListener(summary);
      monitor.addEventListener(
          e -> {
            synchronized (raised) {
              raised.add(e);
              raisedNanos.add(System.nanoTime());
            }
          });
      thread =
          new Thread(
              () -> {
                try {
                  result.set(monitor.run(duration));
                } catch (Throwable t) {
                  failure.set(t);
                }
              },
              "test-monitor");
      thread.setDaemon(true);
      thread.start();
    }

    MonitorResult stopAndWait() throws Exception {
      monitor.stop();
      return await();
    }

    MonitorResult await() throws Exception {
      thread.join(60_000);
      if (failure.get() != null) {
        throw new AssertionError("monitor failed", failure.get());
      }
      return result.get();
    }

    /** Arrival time of the first event of a kind at or after {@code afterNanos}, or −1. */
    long firstNanos(EventKind kind, long afterNanos) {
      synchronized (raised) {
        for (int i = 0; i < raised.size(); i++) {
          if (raised.get(i).kind() == kind && raisedNanos.get(i) >= afterNanos) {
            return raisedNanos.get(i);
          }
        }
      }
      return -1;
    }

    long count(EventKind kind) {
      synchronized (raised) {
        return raised.stream().filter(e -> e.kind() == kind).count();
      }
    }

    List<String[]> events() throws IOException {
      return readCsv(result.get().sessionDir().resolve("events.csv"));
    }
  }

  static List<String[]> readCsv(Path file) throws IOException {
    List<String[]> rows = new ArrayList<>();
    for (String line : Files.readAllLines(file, StandardCharsets.UTF_8)) {
      rows.add(line.split(",", -1));
    }
    return rows;
  }

  /** Event kinds in log order. */
  static List<String> kinds(List<String[]> events) {
    List<String> k = new ArrayList<>();
    for (String[] e : events.subList(1, events.size())) {
      k.add(e[2]);
    }
    return k;
  }

  static double relativeError(EstimateSummary s, Parameter p, double truth) {
    return Math.abs(s.median(p) - truth) / truth;
  }
}
