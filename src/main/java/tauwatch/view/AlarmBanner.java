package tauwatch.view;

import java.util.EnumSet;
import java.util.List;
import java.util.Locale;
import java.util.function.Consumer;
import javafx.geometry.Insets;
import javafx.geometry.Pos;
import javafx.scene.control.Button;
import javafx.scene.control.Label;
import javafx.scene.layout.HBox;
import javafx.scene.layout.Priority;
import javafx.scene.layout.VBox;
import tauwatch.event.EventKind;
import tauwatch.event.MonitorEvent;
import tauwatch.fit.Parameter;
import tauwatch.health.HealthSnapshot;
import tauwatch.health.HealthState;
import tauwatch.health.ParameterStatus;

/**
 * The alarm banner: one line per unacknowledged breach naming the parameter, its value and the rule
 * crossed, with an acknowledge button; hidden when no alarm is pending.
 *
 * <p>View thread only. Rebuilds its lines only when the set of pending alarms changes; a newly
 * raised alarm rings the {@link AlarmTone} when sound is on.
 */
final class AlarmBanner extends VBox {
  private final Consumer<Parameter> acknowledge;
  private final AlarmTone tone;
  private EnumSet<Parameter> pending = EnumSet.noneOf(Parameter.class);
  private boolean soundOn;
  private List<MonitorEvent> history = List.of();

  AlarmBanner(Consumer<Parameter> acknowledge, AlarmTone tone) {
    this.acknowledge = acknowledge;
    this.tone = tone;
    setId("alarm-banner");
    getStyleClass().add("alarm-banner");
    setSpacing(4);
    setPadding(new Insets(6, 12, 6, 12));
    setVisible(false);
    setManaged(false);
  }

  void setSoundOn(boolean on) {
    soundOn = on;
  }

  /**
   * @param h the latest health (its pending alarms)
   * @param alarmHistory the session's alarm events, oldest first: the text of each alarm as raised
   */
  void show(HealthSnapshot h, List<MonitorEvent> alarmHistory) {
    this.history = alarmHistory;
    EnumSet<Parameter> now = EnumSet.noneOf(Parameter.class);
    if (h != null) {
      for (ParameterStatus s : h.parameters().values()) {
        if (s.alarmPending()) {
          now.add(s.parameter());
        }
      }
    }
    boolean raised = false;
    for (Parameter p : now) {
      if (!pending.contains(p)) {
        raised = true;
      }
    }
    if (!now.equals(pending) || (h != null && !now.isEmpty())) {
      rebuild(h, now);
    }
    pending = now;
    if (raised && soundOn) {
      tone.play();
    }
  }

  private void rebuild(HealthSnapshot h, EnumSet<Parameter> now) {
    if (now.isEmpty()) {
      getChildren().clear();
      setVisible(false);
      setManaged(false);
      return;
    }
    // Reuse lines for parameters still pending: only their text changes.
    if (now.equals(pending) && getChildren().size() == now.size()) {
      int i = 0;
      for (Parameter p : now) {
        ((Label) ((HBox) getChildren().get(i++)).getChildren().get(1)).setText(text(h, p));
      }
      return;
    }
    getChildren().clear();
    for (Parameter p : now) {
      Label what = new Label(text(h, p));
      what.setId("alarm-text-" + p.key());
      what.getStyleClass().add("alarm-text");
      what.setWrapText(true);
      HBox.setHgrow(what, Priority.ALWAYS);
      Button ack = new Button("Acknowledge");
      ack.setId("acknowledge-" + p.key());
      ack.getStyleClass().add("alarm-ack");
      ack.setMinWidth(javafx.scene.layout.Region.USE_PREF_SIZE);
      ack.setOnAction(e -> acknowledge.accept(p));
      HBox line = new HBox(12, StateLook.shape(HealthState.BREACH, 22), what, ack);
      line.setAlignment(Pos.CENTER_LEFT);
      getChildren().add(line);
    }
    setVisible(true);
    setManaged(true);
  }

  /** The alarm as raised (value and rule at the breach), then the value now. */
  private String text(HealthSnapshot h, Parameter p) {
    ParameterStatus s = h.parameters().get(p);
    String raised = null;
    String prefix = p.description() + " breach";
    for (int i = history.size() - 1; i >= 0; i--) {
      MonitorEvent e = history.get(i);
      if (e.kind() == EventKind.ALARM && e.detail().startsWith(prefix)) {
        raised = String.format(Locale.ROOT, "%s at %s", e.detail(), Numbers.clock(e.streamTimeS()));
        break;
      }
    }
    if (raised == null) {
      raised =
          p.description()
              + " breach"
              + (s == null || s.rule().isEmpty() ? "" : ", rule " + s.rule());
    }
    String now =
        s == null
            ? ""
            : String.format(
                Locale.ROOT,
                " · now %s %s %s, %s",
                p.symbol(),
                Numbers.value(p, s.value()),
                p.unit(),
                s.state().label());
    return "ALARM  " + capital(raised) + now;
  }

  private static String capital(String s) {
    return s.isEmpty() ? s : Character.toUpperCase(s.charAt(0)) + s.substring(1);
  }

  boolean showing() {
    return isVisible();
  }
}
