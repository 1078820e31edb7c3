package tauwatch.view;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.function.Consumer;
import java.util.function.Supplier;
import javafx.animation.AnimationTimer;
import javafx.geometry.Insets;
import javafx.geometry.Orientation;
import javafx.geometry.Pos;
import javafx.scene.Parent;
import javafx.scene.control.Button;
import javafx.scene.control.CheckBox;
import javafx.scene.control.ComboBox;
import javafx.scene.control.Control;
import javafx.scene.control.Label;
import javafx.scene.control.ListCell;
import javafx.scene.control.ListView;
import javafx.scene.control.Separator;
import javafx.scene.control.SplitPane;
import javafx.scene.control.TextField;
import javafx.scene.control.ToggleButton;
import javafx.scene.control.ToggleGroup;
import javafx.scene.control.Tooltip;
import javafx.scene.layout.BorderPane;
import javafx.scene.layout.HBox;
import javafx.scene.layout.Priority;
import javafx.scene.layout.Region;
import javafx.scene.layout.StackPane;
import javafx.scene.layout.VBox;
import tauwatch.event.MonitorEvent;
import tauwatch.fit.Parameter;
import tauwatch.health.HealthSnapshot;
import tauwatch.health.HealthState;
import tauwatch.monitor.live.LiveModel;
import tauwatch.monitor.live.LiveSession;
import tauwatch.monitor.live.LiveSessionFactory;
import tauwatch.monitor.live.LiveSnapshot;
import tauwatch.monitor.live.PulseAverage;
import tauwatch.monitor.live.SessionControl;
import tauwatch.monitor.live.SourceStatus;
import tauwatch.stream.ClampMode;
import tauwatch.wire.DeviceProfileLoader;

/**
 * Tauwatch's main window: alarm banner and controls on top, the latest transient above the trends
 * on the left, the readouts and the alarm and event lists on the right, the source status below.
 *
 * <p>View thread only. An {@link AnimationTimer} calls {@link #refresh} once per frame: it loads
 * the model's version and the session's health (volatile reads), and touches the scene only when
 * either changed; the source counters are read four times a second. Nothing here blocks the
 * pipeline or computes an estimate.
 */
public final class WatchWindow {
  static final List<Parameter> VC_ROWS =
      List.of(
          Parameter.ACCESS_RESISTANCE,
          Parameter.INPUT_RESISTANCE,
          Parameter.MEMBRANE_CAPACITANCE,
          Parameter.TIME_CONSTANT,
          Parameter.HOLDING_CURRENT);
  static final List<Parameter> CC_ROWS =
      List.of(
          Parameter.ACCESS_RESISTANCE,
          Parameter.INPUT_RESISTANCE,
          Parameter.MEMBRANE_CAPACITANCE,
          Parameter.TIME_CONSTANT,
          Parameter.RESTING_POTENTIAL);

  /** Sources offered in the source box; any other URI may be typed. */
  static final List<String> OFFERED_SOURCES =
      List.of(
          "sim:steady-cell",
          "sim:ra-creep",
          "sim:seal-failing",
          "sim:sudden-reseal",
          "sim:model-circuit",
          "sim:dendritic-cell",
          "sim:cc-steady-cell",
          "tcp://127.0.0.1:5577",
          "serial:/dev/ttyACM0",
          "file:PATH.csv");

  private static final long STATUS_PERIOD_NS = 250_000_000L;

  private final LiveSessionFactory factory;
  private final Consumer<Path> folderOpener;
  private final BorderPane root = new BorderPane();
  private final AlarmTone tone = new AlarmTone();
  private final AlarmBanner banner;
  private final TransientPanel transientPanel = new TransientPanel();
  private final TrendPanel trendPanel = new TrendPanel();
  private final VBox readoutBox = new VBox(6);
  private final List<ReadoutTile> tiles = new ArrayList<>();
  private final StackPane overallShape = new StackPane();
  private final Label overallWord = new Label("waiting for pulses");
  private final ListView<String> alarmList = new ListView<>();
  private final ListView<String> eventList = new ListView<>();
  private final StatusLine status = new StatusLine();
  private final ComboBox<String> sourceBox = new ComboBox<>();
  private final Button switchSource = new Button("Switch source");
  private final ComboBox<String> profileBox = new ComboBox<>();
  private final Button profileFile = new Button("Profile file…");
  private Supplier<String> profileFileChooser;
  private final Button logging = new Button("Stop logging");
  private final Button baseline = new Button("Set baseline now");
  private final TextField markNote = new TextField();
  private final Button addMark = new Button("Add mark");
  private final Button openFolder = new Button("Open session folder");
  private final CheckBox sound = new CheckBox("Alarm sound");
  private final CheckBox average =
      new CheckBox(
          "Overlay the mean of the last " + PulseAverage.DEFAULT_PULSES + " accepted pulses");
  private final Label message = new Label();

  private SessionControl control;
  private LiveModel model;
  private long shownVersion = -1;
  private HealthSnapshot shownHealth;
  private HealthState shownOverall;
  private List<MonitorEvent> shownEvents;
  private List<MonitorEvent> shownAlarms;
  private SourceStatus lastStatus;
  private long lastStatusNanos;
  private Boolean shownRunning;
  private boolean transientFirst = true;
  private final AnimationTimer pump =
      new AnimationTimer() {
        @Override
        public void handle(long now) {
          refresh(now);
        }
      };

  /**
   * @param factory starts sessions for "start logging" and "switch source", or null to offer
   *     neither (a view driven by a test)
   * @param folderOpener shows a session folder to the user, or null to show its path only
   */
  public WatchWindow(LiveSessionFactory factory, Consumer<Path> folderOpener) {
    this.factory = factory;
    this.folderOpener = folderOpener;
    this.banner = new AlarmBanner(this::acknowledge, tone);
    root.setId("watch-window");
    root.getStylesheets().add(WatchWindow.class.getResource("watch.css").toExternalForm());
    root.setTop(new VBox(banner, controls()));
    root.setCenter(centre());
    root.setBottom(status);
  }

  /** Selects the device profile for tcp:// and serial: sources; null keeps the default. */
  public void chooseProfile(String nameOrFile) {
    if (nameOrFile == null || nameOrFile.isBlank()) {
      return;
    }
    if (!profileBox.getItems().contains(nameOrFile)) {
      profileBox.getItems().add(nameOrFile);
    }
    profileBox.setValue(nameOrFile);
    profileBox.getEditor().setText(nameOrFile);
  }

  /** How "Profile file…" asks the user for a file (a path, or null when cancelled). */
  public void setProfileFileChooser(Supplier<String> chooser) {
    profileFileChooser = chooser;
    profileFile.setDisable(chooser == null || !isDeviceUri(sourceBox.getEditor().getText()));
  }

  public Parent root() {
    return root;
  }

  /** Shows a session: its model and its controls. */
  public void bind(SessionControl control, LiveModel model) {
    this.control = control;
    this.model = model;
    shownVersion = -1;
    shownHealth = null;
    shownEvents = null;
    shownAlarms = null;
    lastStatus = null;
    shownRunning = null;
    List<Parameter> rows = model.format().mode() == ClampMode.CURRENT_CLAMP ? CC_ROWS : VC_ROWS;
    trendPanel.bind(model.trends(), model.criteria(), rows);
    trendPanel.followAll();
    tiles.clear();
    for (Parameter p : rows) {
      tiles.add(new ReadoutTile(p));
    }
    readoutBox.getChildren().setAll(tiles);
    if (!sourceBox.getItems().contains(model.sourceName())) {
      sourceBox.getItems().add(0, model.sourceName());
    }
    sourceBox.setValue(model.sourceName());
    refresh(System.nanoTime());
  }

  /** Starts the per-frame pull. */
  public void start() {
    pump.start();
  }

  /** Stops the per-frame pull and the session. */
  public void shutdown() {
    pump.stop();
    if (control != null) {
      control.stop();
    }
  }

  /** The model shown, or null before {@link #bind}. */
  public LiveModel model() {
    return model;
  }

  public SessionControl control() {
    return control;
  }

  /** One frame: pull what changed and redraw it. View thread. */
  public void refresh(long nowNanos) {
    if (model == null) {
      return;
    }
    LiveSnapshot s = model.snapshot();
    HealthSnapshot h = control == null ? null : control.health();
    if (h == null || (s.health() != null && h.pulseNumber() < s.health().pulseNumber())) {
      h = s.health();
    }
    if (s.version() != shownVersion || h != shownHealth) {
      shownVersion = s.version();
      shownHealth = h;
      boolean latestRejected = s.latest() != null && !s.latest().accepted();
      for (ReadoutTile t : tiles) {
        t.show(
            h == null ? null : h.parameters().get(t.parameter()), s.lastAccepted(), latestRejected);
      }
      showOverall(h, s);
      banner.show(h);
      transientPanel.show(s);
      trendPanel.markDirty();
      if (s.recentEvents() != shownEvents) {
        shownEvents = s.recentEvents();
        eventList.getItems().setAll(lines(shownEvents, true));
      }
      if (s.alarmHistory() != shownAlarms) {
        shownAlarms = s.alarmHistory();
        alarmList.getItems().setAll(lines(shownAlarms, false));
      }
    }
    // At most one canvas per frame, alternating: a new pulse dirties both, and drawing them in
    // two frames keeps each frame's software render within the frame period.
    boolean drew = transientFirst ? transientPanel.drawIfDirty() : trendPanel.drawIfDirty();
    if (!drew) {
      drew = transientFirst ? trendPanel.drawIfDirty() : transientPanel.drawIfDirty();
    }
    if (drew) {
      transientFirst = !transientFirst;
    }
    if (lastStatus == null || nowNanos - lastStatusNanos >= STATUS_PERIOD_NS) {
      lastStatusNanos = nowNanos;
      boolean running = control != null && control.running();
      lastStatus =
          SourceStatus.read(
              model.sourceName(),
              model.format().sampleRateHz(),
              control == null ? null : control.counters(),
              lastStatus);
      status.show(
          lastStatus,
          running,
          s.pulses(),
          s.acceptedPulses(),
          control == null ? null : control.sessionDir());
      if (!Boolean.valueOf(running).equals(shownRunning)) {
        shownRunning = running;
        logging.setText(running ? "Stop logging" : "Start logging");
        logging.setDisable(!running && factory == null);
        baseline.setDisable(!running);
        addMark.setDisable(!running);
        addMark.setTooltip(
            running ? null : new Tooltip("marks go to the session's event log: start logging"));
        markNote.setPromptText(
            running ? "note for the event log, e.g. drug on" : "logging stopped: no log to mark");
        if (!running && control instanceof LiveSession ls && ls.failure() != null) {
          // A session that failed (e.g. before its logs opened) says why instead of just stopping.
          message.setText("session ended: " + ls.failure().getMessage());
        }
      }
    }
  }

  private void showOverall(HealthSnapshot h, LiveSnapshot s) {
    HealthState o = h == null ? HealthState.NO_SIGNAL : h.overall();
    if (o != shownOverall) {
      shownOverall = o;
      overallShape.getChildren().setAll(StateLook.shape(o, 26));
      overallWord.setStyle("-fx-text-fill: " + StateLook.css(o) + ";");
    }
    String word;
    if (h == null) {
      word = "waiting for pulses";
    } else if (!h.baselineSet()) {
      word =
          o.label()
              + " · baseline "
              + h.baselinePulses()
              + "/"
              + model.criteria().baselinePulses()
              + " pulses";
    } else {
      word = "cell " + o.label();
    }
    overallWord.setText(word);
  }

  private static List<String> lines(List<MonitorEvent> events, boolean withKind) {
    List<String> out = new ArrayList<>(events.size());
    for (int i = events.size() - 1; i >= 0; i--) {
      MonitorEvent e = events.get(i);
      String t = Double.isFinite(e.streamTimeS()) ? Numbers.clock(e.streamTimeS()) : "–";
      out.add(
          String.format(
              Locale.ROOT,
              "%s  %s%s",
              t,
              withKind ? e.kind().code() + ": " : (e.kind().code().equals("alarm") ? "" : "ack: "),
              e.detail()));
    }
    return out;
  }

  private void acknowledge(Parameter p) {
    if (control != null) {
      control.acknowledge(p);
    }
    refresh(System.nanoTime());
  }

  private Region controls() {
    sourceBox.setId("source-box");
    sourceBox.setEditable(true);
    sourceBox.getItems().setAll(OFFERED_SOURCES);
    sourceBox.setPrefWidth(230);
    switchSource.setId("switch-source");
    switchSource.setOnAction(e -> switchTo(sourceBox.getEditor().getText()));
    switchSource.setDisable(factory == null);
    profileBox.setId("profile-box");
    profileBox.setEditable(true);
    profileBox.getItems().setAll(DeviceProfileLoader.builtInNames());
    profileBox.setValue(DeviceProfileLoader.DEFAULT_PROFILE);
    profileBox.getEditor().setText(DeviceProfileLoader.DEFAULT_PROFILE);
    profileBox.setPrefWidth(170);
    profileBox.setTooltip(
        new Tooltip(
            "device profile for tcp:// and serial: sources: a built-in name or a drivers/*.toml"
                + " file (the simulator and files carry their own format)"));
    profileFile.setId("profile-file");
    profileFile.setDisable(true);
    profileFile.setOnAction(
        e -> {
          String f = profileFileChooser == null ? null : profileFileChooser.get();
          if (f != null) {
            chooseProfile(f);
          }
        });
    sourceBox
        .getEditor()
        .textProperty()
        .addListener(
            (o, was, now) -> {
              profileBox.setDisable(!isDeviceUri(now));
              profileFile.setDisable(!isDeviceUri(now) || profileFileChooser == null);
            });
    logging.setId("logging");
    logging.setOnAction(e -> toggleLogging());
    baseline.setId("baseline-now");
    baseline.setOnAction(
        e -> {
          if (control != null) {
            control.requestBaselineNow();
            message.setText("baseline will be set at the next accepted pulse");
          }
        });
    markNote.setId("mark-note");
    markNote.setPromptText("note for the event log, e.g. drug on");
    markNote.setPrefColumnCount(22);
    markNote.setOnAction(e -> addMark());
    addMark.setId("add-mark");
    addMark.setOnAction(e -> addMark());
    openFolder.setId("open-folder");
    openFolder.setOnAction(e -> openFolder());
    sound.setId("alarm-sound");
    sound.selectedProperty().addListener((o, was, on) -> banner.setSoundOn(on));
    message.setId("message");
    Label src = new Label("Source");
    Label prof = new Label("Profile");
    // Two rows, so that every control keeps its full label at 1280 px and up.
    HBox source =
        new HBox(
            8,
            src,
            sourceBox,
            prof,
            profileBox,
            profileFile,
            switchSource,
            sep(),
            logging,
            openFolder);
    source.setAlignment(Pos.CENTER_LEFT);
    HBox actions = new HBox(8, baseline, sep(), markNote, addMark, sep(), sound, message);
    actions.setAlignment(Pos.CENTER_LEFT);
    for (HBox row : new HBox[] {source, actions}) {
      for (var n : row.getChildren()) {
        if (n instanceof Region r && n != message && !(n instanceof TextField)) {
          r.setMinWidth(Region.USE_PREF_SIZE);
        }
      }
    }
    VBox bar = new VBox(4, source, actions);
    bar.getStyleClass().add("controls");
    return bar;
  }

  private static Separator sep() {
    return new Separator(Orientation.VERTICAL);
  }

  private Region centre() {
    ToggleGroup range = new ToggleGroup();
    ToggleButton all = range(range, "whole session", Double.NaN);
    range(range, "last 30 min", 1800);
    range(range, "last 5 min", 300);
    range(range, "last 1 min", 60);
    all.setSelected(true);
    Label trendTitle = new Label("Trends");
    trendTitle.getStyleClass().add("section-title");
    Label hint = new Label("scroll to zoom · drag to pan · double-click for the whole session");
    hint.getStyleClass().add("readout-description");
    HBox trendBar = new HBox(8, trendTitle);
    for (var t : range.getToggles()) {
      trendBar.getChildren().add((ToggleButton) t);
    }
    trendBar.getChildren().add(hint);
    trendBar.setAlignment(Pos.CENTER_LEFT);
    trendBar.setPadding(new Insets(4, 8, 2, 8));
    VBox.setVgrow(trendPanel, Priority.ALWAYS);
    transientPanel.setPrefHeight(300);
    transientPanel.setMinHeight(220);
    average.setId("show-average");
    average.selectedProperty().addListener((o, was, on) -> transientPanel.setShowAverage(on));
    HBox transientBar = new HBox(8, average);
    transientBar.setAlignment(Pos.CENTER_RIGHT);
    transientBar.setPadding(new Insets(2, 8, 0, 8));
    VBox left = new VBox(0, transientBar, transientPanel, trendBar, trendPanel);
    VBox.setVgrow(trendPanel, Priority.ALWAYS);

    overallWord.setId("overall-state");
    overallWord.getStyleClass().add("readout-state");
    overallShape.setMinSize(28, 28);
    HBox overall = new HBox(10, overallShape, overallWord);
    overall.setAlignment(Pos.CENTER_LEFT);
    overall.setPadding(new Insets(4, 4, 4, 6));
    alarmList.setId("alarm-history");
    eventList.setId("event-list");
    wrapLines(alarmList);
    wrapLines(eventList);
    alarmList.setPrefHeight(90);
    alarmList.setMinHeight(70);
    eventList.setPrefHeight(140);
    eventList.setMinHeight(90);
    Label alarmsTitle = new Label("Alarm history");
    alarmsTitle.getStyleClass().add("section-title");
    Label eventsTitle = new Label("Events (newest first)");
    eventsTitle.getStyleClass().add("section-title");
    VBox.setVgrow(eventList, Priority.ALWAYS);
    VBox right = new VBox(6, overall, readoutBox, alarmsTitle, alarmList, eventsTitle, eventList);
    right.setPadding(new Insets(6));
    right.setMinWidth(360);
    right.setPrefWidth(400);
    SplitPane split = new SplitPane(left, right);
    split.setDividerPositions(0.73);
    SplitPane.setResizableWithParent(right, false);
    return split;
  }

  /**
   * Lines wrap at the list's width: an event's text (a baseline's values, an alarm's rule) is
   * longer than the side panel, and a cut line hides the part that says why.
   */
  private static void wrapLines(ListView<String> list) {
    list.setCellFactory(
        v ->
            new ListCell<>() {
              {
                setWrapText(true);
                // Less the scroll bar and the cell's padding, so the text never runs under them.
                prefWidthProperty().bind(v.widthProperty().subtract(24));
                setMaxWidth(Control.USE_PREF_SIZE);
              }

              @Override
              protected void updateItem(String item, boolean empty) {
                super.updateItem(item, empty);
                setText(empty ? null : item);
              }
            });
  }

  private ToggleButton range(ToggleGroup g, String text, double spanS) {
    ToggleButton b = new ToggleButton(text);
    b.setToggleGroup(g);
    b.setOnAction(
        e -> {
          b.setSelected(true);
          if (Double.isNaN(spanS)) {
            trendPanel.followAll();
          } else {
            trendPanel.followLast(spanS);
          }
        });
    return b;
  }

  private void addMark() {
    String note = markNote.getText().trim();
    if (note.isEmpty() || control == null) {
      message.setText("type a note first");
      return;
    }
    switch (control.mark(note)) {
      case LOGGED:
        markNote.clear();
        message.setText("mark added");
        break;
      case QUEUED:
        markNote.clear();
        message.setText("mark kept; it is written as soon as the session's log opens");
        break;
      default:
        message.setText("logging is stopped: start logging to add the mark (the note is kept)");
        break;
    }
  }

  private void toggleLogging() {
    if (control != null && control.running()) {
      control.stop();
      message.setText("logging stopped; the session's files are closed");
      return;
    }
    String uri = model == null ? sourceBox.getEditor().getText() : model.sourceName();
    startSession(uri);
  }

  private void switchTo(String uri) {
    if (uri == null || uri.isBlank()) {
      message.setText("type a source, e.g. sim:ra-creep or file:recording.csv");
      return;
    }
    if (control != null && control.running()) {
      control.stop();
    }
    startSession(uri.trim());
  }

  private void startSession(String uri) {
    if (factory == null) {
      return;
    }
    try {
      String profile = isDeviceUri(uri) ? profileBox.getEditor().getText().trim() : null;
      LiveSession s = factory.start(uri, profile);
      bind(s, s.model());
      message.setText("logging " + uri + (profile == null ? "" : " with profile " + profile));
    } catch (IllegalArgumentException e) {
      message.setText(e.getMessage());
    }
  }

  private static boolean isDeviceUri(String uri) {
    String u = uri == null ? "" : uri.trim();
    return u.startsWith("tcp:") || u.startsWith("serial:");
  }

  private void openFolder() {
    Path dir = control == null ? null : control.sessionDir();
    if (dir == null) {
      message.setText("no session folder yet");
      return;
    }
    message.setText(dir.toString());
    if (folderOpener != null) {
      folderOpener.accept(dir);
    }
  }

  /** Turns the transient's average overlay on or off, as its check box does. */
  void showAverage(boolean on) {
    average.setSelected(on);
  }

  // For tests: the parts a user looks at.

  ReadoutTile tile(Parameter p) {
    for (ReadoutTile t : tiles) {
      if (t.parameter() == p) {
        return t;
      }
    }
    return null;
  }

  AlarmBanner banner() {
    return banner;
  }

  TrendPanel trendPanel() {
    return trendPanel;
  }

  TransientPanel transientPanel() {
    return transientPanel;
  }

  ListView<String> eventList() {
    return eventList;
  }

  ListView<String> alarmList() {
    return alarmList;
  }

  StatusLine statusLine() {
    return status;
  }
}
