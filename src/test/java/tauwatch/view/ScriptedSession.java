package tauwatch.view;

import java.io.IOException;
import java.nio.file.Path;
import tauwatch.event.EventKind;
import tauwatch.event.StreamClock;
import tauwatch.fit.Parameter;
import tauwatch.fit.PulseEstimate;
import tauwatch.health.HealthCriteria;
import tauwatch.health.HealthMonitor;
import tauwatch.health.HealthSnapshot;
import tauwatch.monitor.live.LiveModel;
import tauwatch.monitor.live.SessionControl;
import tauwatch.pulse.PulseWindow;
import tauwatch.record.EventLog;
import tauwatch.stream.ClampMode;
import tauwatch.stream.StreamCounters;
import tauwatch.stream.StreamFormat;

/**
 * A session driven by a test script instead of a source: the real health rules and the real event
 * log (in a temporary folder), fed with scripted estimates on the test thread, which plays the
 * analysis thread.
 */
final class ScriptedSession implements SessionControl, AutoCloseable {
  static final StreamFormat FORMAT =
      new StreamFormat(50_000, ClampMode.VOLTAGE_CLAMP, 10_000, 0, "scripted");

  final Path dir;
  final StreamClock clock = new StreamClock(0);
  final EventLog events;
  final HealthMonitor health;
  final LiveModel model;
  final StreamCounters counters = new StreamCounters();
  private volatile boolean running = true;
  private long pulse;

  ScriptedSession(Path dir) throws IOException {
    this.dir = dir;
    events = new EventLog(dir.resolve("events.csv"));
    health = new HealthMonitor(HealthCriteria.defaults(), events, clock);
    model = new LiveModel("sim:scripted", FORMAT, HealthCriteria.defaults());
    events.addListener(model);
    events.onEvent(clock.event(0, EventKind.SESSION_START, "scripted session"));
  }

  /** One pulse every 0.5 s with the given access resistance; other values fixed. */
  HealthSnapshot pulse(double raMOhm, boolean accepted) {
    return pulse(raMOhm, accepted, true);
  }

  /** As {@link #pulse}, without the samples (to fill hours of trend quickly). */
  HealthSnapshot pulseFast(double raMOhm, boolean accepted) {
    return pulse(raMOhm, accepted, false);
  }

  private HealthSnapshot pulse(double raMOhm, boolean accepted, boolean withTrace) {
    pulse++;
    double t = 0.5 * pulse;
    clock.advanceTo(t);
    PulseEstimate.Builder b =
        PulseEstimate.builder()
            .pulseNumber(pulse)
            .onsetTimeS(t)
            .mode(ClampMode.VOLTAGE_CLAMP)
            .stepAmplitude(-5)
            .model("mono")
            .value(Parameter.ACCESS_RESISTANCE, raMOhm, 0.05)
            .value(Parameter.INPUT_RESISTANCE, 300, 2)
            .value(Parameter.TOTAL_RESISTANCE, 300 + raMOhm, 2)
            .value(Parameter.MEMBRANE_CAPACITANCE, 30, 0.1)
            .value(Parameter.TIME_CONSTANT, 0.29, 0.001)
            .value(Parameter.HOLDING_CURRENT, -20, 0.2);
    if (!accepted) {
      b.reject("scripted rejection");
    }
    PulseEstimate e = b.build();
    HealthSnapshot h = health.onEstimate(e);
    if (withTrace) {
      model.onPulseEstimate(window(raMOhm), e, h);
    } else {
      model.onEstimate(e, h);
    }
    return h;
  }

  /**
   * A pulse window holding the textbook RC transient (Gillis 1995 in Sakmann &amp; Neher; from
   * memory): I(t) = I_∞ + (I₀ − I_∞)·e^(−t/τ) after a −5 mV step, Rm 300 MΩ, Cm 30 pF.
   */
  private PulseWindow window(double raMOhm) {
    int onset = 150;
    int steps = 500;
    int n = onset + steps + 1000;
    double dtMs = 0.02;
    double rm = 300;
    double tau = raMOhm * rm / (raMOhm + rm) * 30 * 1e-3;
    double i0 = 1000 * -5 / raMOhm;
    double iInf = 1000 * -5 / (raMOhm + rm);
    PulseWindow w = new PulseWindow(n);
    w.length = n;
    w.onsetIndex = onset;
    w.offsetIndex = onset + steps;
    w.sampleIntervalS = dtMs * 1e-3;
    w.holdingLevel = -70;
    w.stepLevel = -75;
    w.pulseNumber = pulse;
    for (int i = 0; i < n; i++) {
      double ton = (i - onset) * dtMs;
      double toff = (i - onset - steps) * dtMs;
      double on = ton <= 0 ? 0 : iInf + (i0 - iInf) * Math.exp(-ton / tau);
      double off = toff <= 0 ? 0 : iInf + (i0 - iInf) * Math.exp(-toff / tau);
      w.command[i] = i >= onset && i < onset + steps ? -75 : -70;
      w.response[i] = -20 + on - off;
    }
    return w;
  }

  @Override
  public void acknowledge(Parameter p) {
    health.acknowledge(p);
  }

  @Override
  public void requestBaselineNow() {
    health.requestBaselineNow();
  }

  @Override
  public void mark(String note) {
    events.onEvent(clock.eventNow(EventKind.MARK, note));
  }

  @Override
  public HealthSnapshot health() {
    return health.snapshot();
  }

  @Override
  public StreamCounters counters() {
    return counters;
  }

  @Override
  public Path sessionDir() {
    return dir;
  }

  @Override
  public boolean running() {
    return running;
  }

  @Override
  public void stop() {
    running = false;
  }

  @Override
  public void close() throws IOException {
    events.close();
  }
}
