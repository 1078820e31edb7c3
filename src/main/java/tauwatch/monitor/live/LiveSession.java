package tauwatch.monitor.live;

import java.io.IOException;
import java.nio.file.Path;
import java.time.Duration;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.TimeUnit;
import tauwatch.fit.Parameter;
import tauwatch.fit.PulseEstimator;
import tauwatch.health.HealthMonitor;
import tauwatch.health.HealthSnapshot;
import tauwatch.monitor.Monitor;
import tauwatch.monitor.MonitorConfig;
import tauwatch.monitor.MonitorResult;
import tauwatch.source.SampleSource;
import tauwatch.stream.StreamCounters;

/**
 * One monitoring session run in the background for the live view: a {@link Monitor} feeding a
 * {@link LiveModel}, with the user's actions passed through.
 *
 * <p>{@link #start} returns at once; the session runs on its own thread ({@code tauwatch-session})
 * until the stream ends, its duration is reached or {@link #stop()} is called. All methods may be
 * called from any thread. Logging is the session: it logs from start to stop, so "stop logging"
 * ends the session and "start logging" starts a new one in a new folder.
 */
public final class LiveSession implements SessionControl {
  private final Monitor monitor;
  private final LiveModel model;
  private final CountDownLatch ended = new CountDownLatch(1);
  private volatile MonitorResult result;
  private volatile Exception failure;

  private LiveSession(Monitor monitor, LiveModel model) {
    this.monitor = monitor;
    this.model = model;
  }

  /**
   * Starts a session.
   *
   * @param duration stream time to run, or null until stopped or the stream ends
   */
  public static LiveSession start(
      SampleSource source,
      MonitorConfig config,
      PulseEstimator estimator,
      Path logDir,
      Duration duration) {
    LiveModel model = new LiveModel(source.name(), source.format(), config.health());
    Monitor m = new Monitor(source, config, estimator, logDir);
    m.addListener(model).addEventListener(model);
    LiveSession s = new LiveSession(m, model);
    Thread t = new Thread(() -> s.runToEnd(duration), "tauwatch-session");
    t.setDaemon(true);
    t.start();
    return s;
  }

  private void runToEnd(Duration duration) {
    try {
      result = monitor.run(duration);
    } catch (IOException | RuntimeException e) {
      failure = e;
    } catch (InterruptedException e) {
      failure = e;
      Thread.currentThread().interrupt();
    } finally {
      ended.countDown();
    }
  }

  public LiveModel model() {
    return model;
  }

  public Monitor monitor() {
    return monitor;
  }

  /** Waits for the session to end; true when it did within the time. */
  public boolean awaitEnd(long timeout, TimeUnit unit) throws InterruptedException {
    return ended.await(timeout, unit);
  }

  /** The session's result once it ended normally, else null. */
  public MonitorResult result() {
    return result;
  }

  /** Why the session failed, or null. */
  public Exception failure() {
    return failure;
  }

  @Override
  public void acknowledge(Parameter p) {
    HealthMonitor h = monitor.health();
    if (h != null) {
      h.acknowledge(p);
    }
  }

  @Override
  public void requestBaselineNow() {
    HealthMonitor h = monitor.health();
    if (h != null) {
      h.requestBaselineNow();
    }
  }

  @Override
  public void mark(String note) {
    monitor.mark(note);
  }

  @Override
  public HealthSnapshot health() {
    HealthMonitor h = monitor.health();
    return h == null ? null : h.snapshot();
  }

  @Override
  public StreamCounters counters() {
    return monitor.counters();
  }

  @Override
  public Path sessionDir() {
    return monitor.sessionDir();
  }

  @Override
  public boolean running() {
    return ended.getCount() > 0;
  }

  @Override
  public void stop() {
    monitor.stop();
  }
}
