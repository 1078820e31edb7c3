package tauwatch.view;

import javafx.geometry.Insets;
import javafx.geometry.Pos;
import javafx.scene.Node;
import javafx.scene.control.Label;
import javafx.scene.layout.HBox;
import javafx.scene.layout.Priority;
import javafx.scene.layout.Region;
import javafx.scene.layout.StackPane;
import javafx.scene.layout.VBox;
import tauwatch.fit.Parameter;
import tauwatch.fit.PulseEstimate;
import tauwatch.health.HealthState;
import tauwatch.health.ParameterStatus;

/**
 * One parameter's readout, large enough to read from across the rig: value, unit, ±SE, change from
 * baseline, and the health state as shape and word.
 *
 * <p>View thread only; {@link #show} changes label texts and replaces the state shape only when the
 * state changes.
 */
final class ReadoutTile extends HBox {
  private final Parameter parameter;
  private final Region stateBar = new Region();
  private final Label value = new Label("–");
  private final Label unit;
  private final Label error = new Label("");
  private final Label change = new Label("");
  private final Label stateWord = new Label("");
  private final StackPane stateShape = new StackPane();
  private HealthState shown;

  ReadoutTile(Parameter p) {
    this.parameter = p;
    setId("readout-" + p.key());
    getStyleClass().add("readout");
    Label symbol = new Label(p.symbol());
    symbol.getStyleClass().add("readout-symbol");
    Label description = new Label(p.description());
    description.getStyleClass().add("readout-description");
    unit = new Label(p.unit());
    unit.getStyleClass().add("readout-unit");
    value.setId("value-" + p.key());
    value.getStyleClass().add("readout-value");
    value.setMinWidth(Region.USE_PREF_SIZE);
    error.getStyleClass().add("readout-detail");
    change.setId("change-" + p.key());
    change.getStyleClass().add("readout-detail");
    stateWord.setId("state-" + p.key());
    stateWord.getStyleClass().add("readout-state");
    stateShape.setMinSize(20, 20);
    stateShape.setPrefSize(20, 20);

    HBox state = new HBox(8, stateShape, stateWord);
    state.setAlignment(Pos.CENTER_LEFT);
    state.setMinWidth(Region.USE_PREF_SIZE);
    Region gap = new Region();
    HBox.setHgrow(gap, Priority.ALWAYS);
    HBox head = new HBox(8, symbol, description, gap, state);
    head.setAlignment(Pos.CENTER_LEFT);
    HBox big = new HBox(6, value, unit);
    big.setAlignment(Pos.BASELINE_LEFT);
    HBox detail = new HBox(14, error, change);
    VBox body = new VBox(0, head, big, detail);
    body.setPadding(new Insets(4, 8, 6, 10));
    HBox.setHgrow(body, Priority.ALWAYS);
    stateBar.setMinWidth(8);
    stateBar.setPrefWidth(8);
    getChildren().addAll(stateBar, body);
    setState(HealthState.NO_SIGNAL);
    stateWord.setText("waiting for pulses");
  }

  Parameter parameter() {
    return parameter;
  }

  /**
   * @param status the parameter's health, or null when not judged
   * @param lastAccepted the latest accepted estimate, or null
   */
  void show(ParameterStatus status, PulseEstimate lastAccepted, boolean latestRejected) {
    double v = lastAccepted == null ? Double.NaN : lastAccepted.value(parameter);
    double se = lastAccepted == null ? Double.NaN : lastAccepted.standardError(parameter);
    value.setText(Numbers.value(parameter, v));
    error.setText(
        Numbers.error(parameter, se) + (Double.isFinite(se) ? " " + parameter.unit() : ""));
    if (status != null && Double.isFinite(status.changePercent())) {
      change.setText(
          Numbers.percent(status.changePercent())
              + " from "
              + Numbers.value(parameter, status.baseline()));
    } else if (status != null) {
      change.setText("baseline not set yet");
    } else {
      change.setText("");
    }
    HealthState s = status == null ? HealthState.STEADY : status.state();
    if (lastAccepted == null && status == null) {
      s = HealthState.NO_SIGNAL;
    }
    setState(s);
    String word = StateLook.word(s);
    if (status == null && s != HealthState.NO_SIGNAL) {
      word = "no rule set";
    }
    if (latestRejected && s != HealthState.NO_SIGNAL) {
      word += " · last pulse rejected";
    }
    stateWord.setText(word);
  }

  private void setState(HealthState s) {
    if (s == shown) {
      return;
    }
    shown = s;
    Node shape = StateLook.shape(s, 18);
    stateShape.getChildren().setAll(shape);
    stateBar.setStyle("-fx-background-color: " + StateLook.css(s) + ";");
    stateWord.setStyle("-fx-text-fill: " + StateLook.css(s) + ";");
    value.setStyle(
        s == HealthState.BREACH
            ? "-fx-text-fill: " + StateLook.css(s) + ";"
            : "-fx-text-fill: #e8edf2;");
  }

  HealthState shownState() {
    return shown;
  }

  String valueText() {
    return value.getText();
  }
}
