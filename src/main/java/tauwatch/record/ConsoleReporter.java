package tauwatch.record;

import java.io.PrintStream;
import java.util.Locale;
import tauwatch.event.EventKind;
import tauwatch.event.EventSink;
import tauwatch.event.MonitorEvent;
import tauwatch.fit.Parameter;
import tauwatch.fit.PulseEstimate;
import tauwatch.health.HealthSnapshot;
import tauwatch.health.HealthState;
import tauwatch.stream.ClampMode;

/**
 * Prints one line per pulse estimate, with the health state, and one line per notable event.
 *
 * <p>Estimates come on the analysis thread, events from any thread; printing is synchronised on the
 * stream. Meant for live watching at a few pulses per second, not for fast replays.
 */
public final class ConsoleReporter implements EventSink {
  private final PrintStream out;
  private final boolean everyPulse;

  /**
   * @param everyPulse print every estimate; otherwise only events
   */
  public ConsoleReporter(PrintStream out, boolean everyPulse) {
    this.out = out;
    this.everyPulse = everyPulse;
  }

  /** Prints an estimate line. */
  public void onEstimate(PulseEstimate e, HealthSnapshot h) {
    if (!everyPulse) {
      return;
    }
    String line = format(e, h);
    synchronized (out) {
      out.println(line);
    }
  }

  /** The console line of one estimate. */
  public static String format(PulseEstimate e, HealthSnapshot h) {
    StringBuilder sb = new StringBuilder(160);
    sb.append(
        String.format(
            Locale.ROOT, "%9.2f s  #%-5d %s ", e.onsetTimeS(), e.pulseNumber(), e.mode().code()));
    if (!e.accepted()) {
      return sb.append(" rejected: ").append(e.rejectReason()).toString();
    }
    if (e.mode() == ClampMode.VOLTAGE_CLAMP) {
      item(sb, e, Parameter.ACCESS_RESISTANCE, "%.1f");
      item(sb, e, Parameter.INPUT_RESISTANCE, "%.0f");
      item(sb, e, Parameter.MEMBRANE_CAPACITANCE, "%.1f");
      item(sb, e, Parameter.TIME_CONSTANT, "%.3f");
      item(sb, e, Parameter.HOLDING_CURRENT, "%.1f");
    } else {
      item(sb, e, Parameter.ACCESS_RESISTANCE, "%.1f");
      item(sb, e, Parameter.INPUT_RESISTANCE, "%.0f");
      item(sb, e, Parameter.MEMBRANE_CAPACITANCE, "%.1f");
      item(sb, e, Parameter.TIME_CONSTANT, "%.2f");
      item(sb, e, Parameter.RESTING_POTENTIAL, "%.1f");
    }
    sb.append("  ").append(h.overall().label());
    if (!h.baselineSet()) {
      sb.append(" (baseline ").append(h.baselinePulses()).append(" pulses)");
    }
    for (var s : h.parameters().values()) {
      if (s.state() != HealthState.STEADY && s.state() != h.overall()) {
        sb.append(' ').append(s.parameter().key()).append('=').append(s.state().label());
      } else if (s.state() != HealthState.STEADY) {
        sb.append(' ').append(s.parameter().key());
      }
    }
    return sb.toString();
  }

  private static void item(StringBuilder sb, PulseEstimate e, Parameter p, String fmt) {
    double v = e.value(p);
    sb.append("  ").append(p.symbol()).append(' ');
    sb.append(Double.isNaN(v) ? "–" : String.format(Locale.ROOT, fmt, v));
    sb.append(' ').append(p.unit());
  }

  @Override
  public void onEvent(MonitorEvent e) {
    if (e.kind() == EventKind.BASELINE_SET && !everyPulse) {
      return;
    }
    String mark = e.kind() == EventKind.ALARM ? "ALARM" : "event";
    String line =
        String.format(
            Locale.ROOT, "%9.2f s  %s %s: %s", e.streamTimeS(), mark, e.kind().code(), e.detail());
    synchronized (out) {
      out.println(line);
    }
  }
}
