package tauwatch.monitor;

import java.io.IOException;
import java.util.List;
import tauwatch.event.EventKind;
import tauwatch.event.EventSink;
import tauwatch.event.StreamClock;
import tauwatch.fit.PulseEstimate;
import tauwatch.fit.PulseEstimator;
import tauwatch.health.HealthMonitor;
import tauwatch.health.HealthSnapshot;
import tauwatch.health.RecentPulseScreen;
import tauwatch.pulse.PulseListener;
import tauwatch.pulse.PulseWindow;
import tauwatch.record.ParamsLog;

/**
 * The per-pulse stage: estimate, screen against the recent pulses, judge, log, then tell the
 * listeners. The screen runs before the health rules and the log, so a pulse it rejects as an
 * isolated outlier shows as rejected in {@code params.csv} and never reaches the baseline, the
 * running average or the judges.
 *
 * <p>Runs on the analysis thread. It is the edge of the per-pulse loop: an unexpected failure of
 * the estimator is caught here, counted, logged as an event, and the next pulse goes on.
 */
final class PulseAnalysis implements PulseListener {
  private final PulseEstimator estimator;
  private final RecentPulseScreen screen;
  private final HealthMonitor health;
  private final ParamsLog params;
  private final EventSink events;
  private final StreamClock clock;
  private final List<EstimateListener> listeners;

  private long pulses;
  private long accepted;
  private long analysisErrors;
  private IOException logFailure;
  private volatile PulseEstimate latest;

  PulseAnalysis(
      PulseEstimator estimator,
      RecentPulseScreen screen,
      HealthMonitor health,
      ParamsLog params,
      EventSink events,
      StreamClock clock,
      List<EstimateListener> listeners) {
    this.estimator = estimator;
    this.screen = screen;
    this.health = health;
    this.params = params;
    this.events = events;
    this.clock = clock;
    this.listeners = List.copyOf(listeners);
  }

  @Override
  public void onPulse(PulseWindow window) {
    PulseEstimate e;
    try {
      e = estimator.estimate(window);
    } catch (RuntimeException ex) {
      analysisErrors++;
      events.onEvent(
          clock.event(
              window.onsetTimeS(),
              EventKind.ANALYSIS_ERROR,
              "pulse " + window.pulseNumber + ": estimator failed: " + ex));
      e =
          PulseEstimate.builder()
              .pulseNumber(window.pulseNumber)
              .onsetTimeS(window.onsetTimeS())
              .mode(window.mode)
              .stepAmplitude(window.stepAmplitude())
              .reject("estimator error")
              .build();
    }
    if (window.spansGap && e.accepted()) {
      e = e.rejected("samples lost inside the pulse");
    }
    e = screen.screen(e);
    pulses++;
    if (e.accepted()) {
      accepted++;
    }
    HealthSnapshot h = health.onEstimate(e);
    if (logFailure == null) {
      try {
        params.write(e, h);
      } catch (IOException ex) {
        logFailure = ex;
        events.onEvent(
            clock.event(
                e.onsetTimeS(),
                EventKind.ANALYSIS_ERROR,
                "cannot write " + params.path() + ": " + ex.getMessage()));
      }
    }
    latest = e;
    for (EstimateListener l : listeners) {
      l.onPulseEstimate(window, e, h);
    }
  }

  long pulses() {
    return pulses;
  }

  long accepted() {
    return accepted;
  }

  long analysisErrors() {
    return analysisErrors;
  }

  IOException logFailure() {
    return logFailure;
  }

  PulseEstimate latest() {
    return latest;
  }
}
