package tauwatch.view;

import java.nio.file.Path;
import javafx.application.Application;
import javafx.scene.Scene;
import javafx.stage.Stage;
import tauwatch.monitor.live.LiveSession;
import tauwatch.monitor.live.LiveSessionFactory;

/**
 * The JavaFX application of the live view. Started only through {@link LiveViewLauncher} (a plain
 * jar cannot start a main class that extends {@code Application}).
 *
 * <p>JavaFX creates it and calls it on the view thread.
 */
public final class LiveViewApp extends Application {
  private WatchWindow window;

  @Override
  public void start(Stage stage) {
    LiveViewLauncher.Request r = LiveViewLauncher.request();
    LiveSessionFactory factory = r.factory();
    window = new WatchWindow(factory, this::showFolder);
    LiveSession first = r.firstSession();
    window.bind(first, first.model());
    Scene scene = new Scene(window.root(), 1600, 1000);
    stage.setTitle("Tauwatch — " + first.model().sourceName());
    stage.setScene(scene);
    stage.setOnCloseRequest(e -> window.shutdown());
    stage.show();
    window.start();
  }

  private void showFolder(Path dir) {
    // HostServices asks the desktop to open the folder; without a desktop it does nothing, and the
    // path stays on screen in the message line.
    try {
      getHostServices().showDocument(dir.toUri().toString());
    } catch (RuntimeException e) {
      System.err.println("watch: cannot open " + dir + " on this desktop: " + e.getMessage());
    }
  }

  @Override
  public void stop() {
    if (window != null) {
      window.shutdown();
    }
    LiveViewLauncher.windowClosed(window == null ? null : window.control());
  }
}
