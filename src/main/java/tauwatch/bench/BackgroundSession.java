package tauwatch.bench;

import java.time.Duration;
import java.util.concurrent.atomic.AtomicReference;
import tauwatch.monitor.Monitor;
import tauwatch.monitor.MonitorResult;

/**
 * Runs one monitoring session on a thread of its own, so that a benchmark can sample counters and
 * memory while it runs.
 *
 * <p>Started and joined by one benchmark thread.
 */
final class BackgroundSession {
  private final Thread thread;
  private final AtomicReference<MonitorResult> result = new AtomicReference<>();
  private final AtomicReference<Throwable> failure = new AtomicReference<>();

  /** Starts {@code m} for {@code seconds} of stream time on a thread called {@code name}. */
  BackgroundSession(Monitor m, double seconds, String name) {
    thread =
        new Thread(
            () -> {
              try {
                result.set(m.run(Duration.ofNanos((long) (seconds * 1e9))));
              } catch (Throwable ex) {
                failure.set(ex);
              }
            },
            name);
    thread.start();
  }

  boolean isAlive() {
    return thread.isAlive();
  }

  void join(long millis) throws InterruptedException {
    thread.join(millis);
  }

  /** Waits for the end; a session that failed throws, naming {@code what}. */
  MonitorResult await(String what) throws InterruptedException {
    thread.join();
    if (failure.get() != null) {
      throw new IllegalStateException(what + " failed", failure.get());
    }
    return result.get();
  }
}
