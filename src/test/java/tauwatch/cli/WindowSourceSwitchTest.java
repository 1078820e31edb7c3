package tauwatch.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.net.InetAddress;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.TimeUnit;
import java.util.function.BooleanSupplier;
import javafx.scene.Scene;
import javafx.scene.control.ComboBox;
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
import tauwatch.monitor.MonitorConfig;
import tauwatch.monitor.live.SessionControl;
import tauwatch.sim.ScenarioLoader;
import tauwatch.sim.SimulatedRecording;
import tauwatch.sim.serve.SimulatedDaq;
import tauwatch.sim.serve.TcpOutlet;
import tauwatch.view.WatchWindow;
import tauwatch.wire.DeviceProfileLoader;

/**
 * The window's source box and profile selector reach a simulated DAQ on a loopback TCP port through
 * the same {@link SourceOpener} as the command line: the status says connected and pulses arrive,
 * read with the profile chosen in the window.
 */
@Tag("fx")
@ExtendWith(ApplicationExtension.class)
class WindowSourceSwitchTest {
  @TempDir static Path dir;
  private WatchWindow window;
  private TcpOutlet outlet;
  private SimulatedDaq daq;
  private Thread serving;

  @Start
  void start(Stage stage) {
    WindowSessions sessions =
        new WindowSessions(MonitorConfig.defaults(), true, 3L, 0, dir.resolve("logs"), null);
    window = new WatchWindow(sessions, null);
    var first = sessions.start("sim:steady-cell", null);
    window.bind(first, first.model());
    stage.setScene(new Scene(window.root(), 1600, 1000));
    stage.show();
    window.start();
  }

  @AfterEach
  void close(FxRobot robot) throws Exception {
    robot.interact(() -> window.shutdown());
    if (daq != null) {
      daq.stop();
      serving.join(5_000);
    }
    if (outlet != null) {
      outlet.close();
    }
  }

  private static String text(FxRobot robot, String id) {
    return robot.lookup(id).queryAs(Label.class).getText();
  }

  private static boolean waitFor(BooleanSupplier ok, long seconds) throws InterruptedException {
    long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(seconds);
    while (!ok.getAsBoolean()) {
      if (System.nanoTime() > deadline) {
        return false;
      }
      Thread.sleep(20);
    }
    return true;
  }

  @Test
  void switchingToATcpSourceWithAProfileFileConnectsAndPulsesArrive(FxRobot robot)
      throws Exception {
    // A profile file of our own: the built-in simulator wiring under another name, so the test
    // can tell that the window's choice, not the default, reached the source.
    String builtIn = DeviceProfileLoader.loadBuiltIn("simulator").text();
    Path profile = dir.resolve("bench-rig.toml");
    Files.writeString(
        profile, builtIn.replaceFirst("name = \"simulator\"", "name = \"bench-rig\""));
    outlet = new TcpOutlet(InetAddress.getLoopbackAddress(), 0);
    daq =
        new SimulatedDaq(
            new SimulatedRecording(ScenarioLoader.load("steady-cell"), 5),
            DeviceProfileLoader.loadBuiltIn("simulator"),
            List.of(),
            7,
            outlet);
    String uri = "tcp://127.0.0.1:" + outlet.localPort();

    robot.interact(
        () -> {
          @SuppressWarnings("unchecked")
          ComboBox<String> box = robot.lookup("#source-box").queryAs(ComboBox.class);
          box.getEditor().setText(uri);
          @SuppressWarnings("unchecked")
          ComboBox<String> prof = robot.lookup("#profile-box").queryAs(ComboBox.class);
          prof.getEditor().setText(profile.toString());
        });
    robot.clickOn("#switch-source");
    assertTrue(waitFor(outlet::connected, 10), "the window's source connected to " + uri);
    serving = new Thread(() -> daq.serve(30), "test-daq");
    serving.setDaemon(true);
    serving.start();

    SessionControl c = window.control();
    assertTrue(
        waitFor(() -> c.counters() != null && c.counters().samplesReceived() > 50_000, 20),
        "samples arrive");
    assertTrue(
        waitFor(
            () ->
                robot
                    .lookup("#status-signal")
                    .queryAs(Label.class)
                    .getText()
                    .startsWith("connected"),
            5),
        text(robot, "#status-signal"));
    // Steady-cell protocol: 2 pulses/s; a few seconds bring several.
    assertTrue(waitFor(() -> pulses(window) >= 3, 20), "pulses arrive: " + pulses(window));
    assertTrue(text(robot, "#message").contains("bench-rig.toml"), text(robot, "#message"));
    assertNotNull(c.sessionDir());
    String json = Files.readString(c.sessionDir().resolve("session.json"));
    assertTrue(json.contains("bench-rig"), json);
    assertEquals(uri, ((ComboBox<?>) robot.lookup("#source-box").query()).getValue());
  }

  private static long pulses(WatchWindow w) {
    return w.model() == null ? 0 : w.model().snapshot().pulses();
  }
}
