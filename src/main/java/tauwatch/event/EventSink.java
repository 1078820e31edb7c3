package tauwatch.event;

/**
 * Receives events from any part of the monitor.
 *
 * <p>Implementations must be safe to call from any thread; events are rare, so they may lock.
 */
@FunctionalInterface
public interface EventSink {
  void onEvent(MonitorEvent event);
}
