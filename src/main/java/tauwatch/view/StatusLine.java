package tauwatch.view;

import java.nio.file.Path;
import java.util.Locale;
import javafx.geometry.Pos;
import javafx.scene.control.Label;
import javafx.scene.layout.HBox;
import javafx.scene.layout.Priority;
import javafx.scene.layout.Region;
import javafx.scene.layout.StackPane;
import tauwatch.health.HealthState;
import tauwatch.monitor.live.SourceStatus;

/**
 * The source status along the bottom of the window: receiving or {@code no signal}, the source, the
 * sample rate, what arrived and what was lost, and where the session logs.
 *
 * <p>View thread only; updated a few times a second.
 */
final class StatusLine extends HBox {
  private final StackPane shape = new StackPane();
  private final Label signal = new Label("starting");
  private final Label source = new Label();
  private final Label rate = new Label();
  private final Label received = new Label();
  private final Label losses = new Label();
  private final Label pulses = new Label();
  private final Label folder = new Label();
  private Boolean shownReceiving;

  StatusLine() {
    getStyleClass().add("status-line");
    setAlignment(Pos.CENTER_LEFT);
    signal.setId("status-signal");
    signal.getStyleClass().add("status-signal");
    losses.setId("status-losses");
    folder.setId("status-folder");
    shape.setMinSize(14, 14);
    for (Label l : new Label[] {signal, source, rate, received, losses, pulses}) {
      l.setMinWidth(Region.USE_PREF_SIZE);
    }
    folder.setTextOverrun(javafx.scene.control.OverrunStyle.LEADING_ELLIPSIS);
    folder.setMinWidth(120);
    Region grow = new Region();
    HBox.setHgrow(grow, Priority.ALWAYS);
    HBox sig = new HBox(6, shape, signal);
    sig.setAlignment(Pos.CENTER_LEFT);
    getChildren().addAll(sig, source, rate, received, losses, pulses, grow, folder);
  }

  void show(SourceStatus s, boolean running, long pulseCount, long acceptedCount, Path sessionDir) {
    boolean receiving = running && s.receiving();
    if (!Boolean.valueOf(receiving).equals(shownReceiving)) {
      shownReceiving = receiving;
      HealthState look = receiving ? HealthState.STEADY : HealthState.NO_SIGNAL;
      shape.getChildren().setAll(StateLook.shape(look, 12));
      signal.setStyle("-fx-text-fill: " + StateLook.css(look) + ";");
    }
    signal.setText(receiving ? "connected, receiving" : running ? "no signal" : "stopped");
    source.setText("source " + s.sourceName());
    rate.setText(String.format(Locale.ROOT, "%.0f Hz", s.sampleRateHz()));
    received.setText(
        "samples "
            + Numbers.count(s.samples())
            + (s.frames() > 0 ? "   frames " + Numbers.count(s.frames()) : "   frames –"));
    losses.setText(
        "gaps "
            + s.gaps()
            + "   corrupt frames "
            + s.corruptFrames()
            + "   ring overruns "
            + Numbers.count(s.overrunSamples())
            + " samples");
    pulses.setText("pulses " + pulseCount + " (" + acceptedCount + " accepted)");
    folder.setText(
        sessionDir == null
            ? ""
            : (running ? "logging to " : "logs closed in ") + sessionDir.toString());
  }

  String signalText() {
    return signal.getText();
  }
}
