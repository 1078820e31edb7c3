package tauwatch.monitor.live;

import java.util.List;
import tauwatch.event.MonitorEvent;
import tauwatch.fit.PulseEstimate;
import tauwatch.health.HealthSnapshot;

/**
 * Everything the live view shows of the latest pulse and the session's recent events.
 *
 * <p>Immutable; published by {@link LiveModel} on the analysis thread (after each pulse) or on the
 * thread that raised an event, and read by the view thread.
 *
 * @param version increases with every publication; the view redraws when it changes
 * @param latest the latest estimate, accepted or not, or null before the first pulse
 * @param lastAccepted the latest accepted estimate, or null
 * @param health the health after the latest pulse, or null before the first
 * @param trace the latest pulse's command and response, or null
 * @param baselineTrace the pulse at which the baseline was last set, or null
 * @param pulses pulses analysed
 * @param acceptedPulses pulses accepted
 * @param recentEvents the latest events, oldest first (at most {@link LiveModel#RECENT_EVENTS})
 * @param alarmHistory alarms raised and acknowledged, oldest first (at most {@link
 *     LiveModel#ALARM_HISTORY})
 */
public record LiveSnapshot(
    long version,
    PulseEstimate latest,
    PulseEstimate lastAccepted,
    HealthSnapshot health,
    PulseTrace trace,
    PulseTrace baselineTrace,
    long pulses,
    long acceptedPulses,
    List<MonitorEvent> recentEvents,
    List<MonitorEvent> alarmHistory) {

  /** Before the first pulse. */
  public static LiveSnapshot empty() {
    return new LiveSnapshot(0, null, null, null, null, null, 0, 0, List.of(), List.of());
  }
}
