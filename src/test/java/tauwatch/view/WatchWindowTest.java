package tauwatch.view;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.TimeUnit;
import javafx.scene.Scene;
import javafx.scene.control.Label;
import javafx.stage.Stage;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.extension.ExtendWith;
import org.junit.jupiter.api.io.TempDir;
import org.testfx.api.FxRobot;
import org.testfx.framework.junit5.ApplicationExtension;
import org.testfx.framework.junit5.Start;
import org.testfx.util.WaitForAsyncUtils;
import tauwatch.fit.Parameter;
import tauwatch.health.HealthState;

/**
 * The window driven by a scripted pulse sequence through the real health rules (default criteria,
 * common practice: Ra within 20 % of baseline, drifting past half of that, 3-pulse debounce, a
 * 20-pulse baseline) and the real event log, on Monocle's headless platform.
 */
@Tag("fx")
@ExtendWith(ApplicationExtension.class)
class WatchWindowTest {
  @TempDir Path dir;
  private ScriptedSession session;
  private WatchWindow window;

  @Start
  void start(Stage stage) throws Exception {
    session = new ScriptedSession(dir);
    window = new WatchWindow(null, null);
    window.bind(session, session.model);
    stage.setScene(new Scene(window.root(), 1280, 800));
    stage.show();
  }

  @AfterEach
  void close() throws Exception {
    session.close();
  }

  private void baseline() {
    for (int i = 0; i < 20; i++) {
      session.pulse(10.0, true);
    }
  }

  /** Two frames: the window draws at most one canvas per frame. */
  private void frame(FxRobot robot) {
    robot.interact(() -> window.refresh(System.nanoTime()));
    robot.interact(() -> window.refresh(System.nanoTime()));
  }

  private static String text(FxRobot robot, String id) {
    return robot.lookup(id).queryAs(Label.class).getText();
  }

  @Test
  void readoutsShowTheValuesAndStatesOfTheScriptedPulses(FxRobot robot) {
    baseline();
    frame(robot);
    assertEquals("10.0", text(robot, "#value-ra"));
    assertEquals("steady", text(robot, "#state-ra"));
    assertEquals("300", text(robot, "#value-rin"));
    assertEquals("0.290", text(robot, "#value-tau"));
    assertEquals("-20", text(robot, "#value-hold"));

    // 11.3 MΩ is +13 %: past half of the allowed 20 % → drifting after 3 pulses.
    for (int i = 0; i < 3; i++) {
      session.pulse(11.3, true);
    }
    frame(robot);
    assertEquals("11.3", text(robot, "#value-ra"));
    assertEquals("drifting", text(robot, "#state-ra"));
    assertEquals(HealthState.DRIFTING, window.tile(Parameter.ACCESS_RESISTANCE).shownState());
    assertEquals("+13.0 % from 10.0", text(robot, "#change-ra"));
    assertEquals("steady", text(robot, "#state-rin"));

    // A rejected pulse keeps the last accepted value on show and says so.
    session.pulse(50, false);
    frame(robot);
    assertEquals("11.3", text(robot, "#value-ra"));
    assertTrue(text(robot, "#state-ra").contains("last pulse rejected"));
  }

  @Test
  void anAlarmBannerAppearsOnBreachAndGoesOnAcknowledgeWhileTheLogKeepsTheAlarm(FxRobot robot)
      throws Exception {
    baseline();
    frame(robot);
    assertFalse(window.banner().showing());
    for (int i = 0; i < 3; i++) {
      session.pulse(13.0, true); // +30 %: beyond the allowed 20 %
    }
    frame(robot);
    assertEquals("breach", text(robot, "#state-ra"));
    assertTrue(window.banner().showing());
    String banner = text(robot, "#alarm-text-ra");
    assertTrue(banner.contains("Access resistance breach"), banner);
    assertTrue(banner.contains("Ra 13"), banner);
    assertTrue(banner.contains("rule change +30.0 %"), banner);
    assertEquals(1, window.alarmList().getItems().size());

    robot.clickOn("#acknowledge-ra");
    WaitForAsyncUtils.waitForFxEvents();
    frame(robot);
    assertFalse(window.banner().showing());
    assertEquals("breach", text(robot, "#state-ra"), "acknowledging does not change the state");
    assertEquals(2, window.alarmList().getItems().size());
    List<String> log = Files.readAllLines(dir.resolve("events.csv"));
    assertTrue(
        log.stream().anyMatch(l -> l.contains(",alarm,") && l.contains("breach")), log.toString());
    assertTrue(log.stream().anyMatch(l -> l.contains(",alarm_ack,")), log.toString());
  }

  @Test
  void aMarkTypedInTheWindowReachesTheEventLog(FxRobot robot) throws Exception {
    baseline();
    frame(robot);
    robot.clickOn("#mark-note").write("drug on");
    robot.clickOn("#add-mark");
    WaitForAsyncUtils.waitForFxEvents();
    frame(robot);
    List<String> log = Files.readAllLines(dir.resolve("events.csv"));
    assertTrue(log.stream().anyMatch(l -> l.contains(",mark,drug on")), log.toString());
    assertTrue(window.eventList().getItems().get(0).contains("mark: drug on"));
  }

  @Test
  void aLongEventLineWrapsWithinTheSidePanelInsteadOfBeingCut(FxRobot robot) throws Exception {
    baseline();
    frame(robot);
    String note = "bath exchanged to the second drug at twice the concentration, cell looks fine";
    robot.clickOn("#mark-note").write(note);
    robot.clickOn("#add-mark");
    WaitForAsyncUtils.waitForFxEvents();
    frame(robot);
    var list = window.eventList();
    var cells =
        robot.lookup("#event-list .list-cell").queryAllAs(javafx.scene.control.ListCell.class);
    var first =
        cells.stream()
            .filter(c -> c.getItem() != null && c.getItem().toString().contains(note))
            .findFirst()
            .orElseThrow();
    assertTrue(first.isWrapText());
    assertTrue(
        first.getWidth() <= list.getWidth(),
        "cell " + first.getWidth() + " px within the list's " + list.getWidth() + " px");
    assertTrue(first.getHeight() > 1.5 * first.getFont().getSize(), "the line took more rows");
  }

  @Test
  void whenPulsesStopTheReadoutsSayNoSignalWithoutANewPulse(FxRobot robot) {
    baseline();
    frame(robot);
    // Default: no pulse for 5 s of stream time → no signal (HealthCriteria defaults).
    session.health.onStreamTime(10 + 5.5);
    frame(robot);
    assertEquals("no signal", text(robot, "#state-ra"));
  }

  @Test
  void theTrendsZoomAboutThePointerAndReturnToTheWholeSession(FxRobot robot) throws Exception {
    for (int i = 0; i < 240; i++) {
      session.pulse(10 + 0.01 * i, i % 25 != 0);
    }
    frame(robot);
    double[] all = window.trendPanel().visibleRange();
    assertEquals(0.5, all[0], 1.0);
    assertTrue(all[1] >= 120, "whole session shown: " + all[1]);
    robot.interact(() -> window.trendPanel().zoom(0.5, 400));
    frame(robot);
    double[] zoomed = window.trendPanel().visibleRange();
    assertEquals((all[1] - all[0]) * 0.5, zoomed[1] - zoomed[0], 1e-6);
    robot.interact(() -> window.trendPanel().followAll());
    frame(robot);
    assertEquals(
        all[1] - all[0],
        window.trendPanel().visibleRange()[1] - window.trendPanel().visibleRange()[0],
        1.0);
    TimeUnit.MILLISECONDS.sleep(1);
  }

  private int pixelsOf(FxRobot robot, javafx.scene.Node n, javafx.scene.paint.Color c) {
    int[] count = new int[1];
    robot.interact(
        () -> {
          javafx.scene.image.WritableImage img = n.snapshot(null, null);
          javafx.scene.image.PixelReader r = img.getPixelReader();
          int want = PixelRaster.argb(c) & 0xffffff;
          for (int y = 0; y < (int) img.getHeight(); y++) {
            for (int x = 0; x < (int) img.getWidth(); x++) {
              if ((r.getArgb(x, y) & 0xffffff) == want) {
                count[0]++;
              }
            }
          }
        });
    return count[0];
  }

  @Test
  void theAverageToggleOverlaysTheMeanOfTheLastTenAcceptedPulses(FxRobot robot) {
    baseline();
    frame(robot);
    assertEquals(10, session.model.snapshot().averagePulses());
    assertEquals(0, pixelsOf(robot, window.transientPanel(), StateLook.AVERAGE_TRACE));
    robot.clickOn("#show-average");
    WaitForAsyncUtils.waitForFxEvents();
    frame(robot);
    assertTrue(window.transientPanel().showsAverage());
    int on = pixelsOf(robot, window.transientPanel(), StateLook.AVERAGE_TRACE);
    assertTrue(on > 200, "cyan average trace drawn: " + on + " px");
    robot.clickOn("#show-average");
    WaitForAsyncUtils.waitForFxEvents();
    frame(robot);
    assertEquals(0, pixelsOf(robot, window.transientPanel(), StateLook.AVERAGE_TRACE));
  }

  @Test
  void theBannerTakesParameterValueAndRuleFromTheAlarmRecordNotFromTheEventText() {
    // No event at all: the text comes from the health snapshot's structured alarm alone.
    var alarm =
        new tauwatch.health.AlarmRecord(
            Parameter.INPUT_RESISTANCE, 77, 95.0, 142.0, 300.0, -52.7, "min 150 MΩ");
    var status =
        new tauwatch.health.ParameterStatus(
            Parameter.INPUT_RESISTANCE,
            HealthState.BREACH,
            138.0,
            300.0,
            -54.0,
            new tauwatch.health.RuleReading(
                tauwatch.health.RuleReading.Rule.MIN,
                new tauwatch.health.ParameterLimits(
                    Parameter.INPUT_RESISTANCE, 150, Double.NaN, Double.NaN, Double.NaN),
                138.0,
                300.0),
            true,
            alarm);
    var h =
        new tauwatch.health.HealthSnapshot(
            80,
            96.5,
            HealthState.BREACH,
            java.util.Map.of(Parameter.INPUT_RESISTANCE, status),
            true,
            20);
    String text = AlarmBanner.text(h, Parameter.INPUT_RESISTANCE);
    assertEquals(
        "ALARM  Input resistance breach: Rin 142 MΩ, rule min 150 MΩ at 1:35 · now Rin 138 MΩ,"
            + " breach",
        text);
  }

  @Test
  void inCurrentClampTheReadoutsShowRinCmTauVrestAndRaSaysBridgeBalanced(FxRobot robot)
      throws Exception {
    Files.createDirectories(dir.resolve("cc"));
    try (ScriptedSession cc = new ScriptedSession(dir.resolve("cc"), ScriptedSession.CC_FORMAT)) {
      robot.interact(() -> window.bind(cc, cc.model));
      for (int i = 0; i < 20; i++) {
        cc.pulseCcBridgeBalanced();
      }
      frame(robot);
      assertEquals(null, window.tile(Parameter.HOLDING_CURRENT));
      assertEquals("300", text(robot, "#value-rin"));
      assertEquals("30.0", text(robot, "#value-cm"));
      assertEquals("9.000", text(robot, "#value-tau"));
      assertEquals("-65.0", text(robot, "#value-vrest"));
      assertEquals("mV", Parameter.RESTING_POTENTIAL.unit());
      assertEquals("–", text(robot, "#value-ra"));
      assertEquals("not measured", text(robot, "#state-ra"));
      assertTrue(
          text(robot, "#change-ra").startsWith("bridge balanced"), text(robot, "#change-ra"));
      assertEquals(HealthState.STEADY, window.tile(Parameter.INPUT_RESISTANCE).shownState());
      assertTrue(
          window.transientPanel().yUnit().equals("mV"), "transient axis in mV in current clamp");
    }
  }
}
