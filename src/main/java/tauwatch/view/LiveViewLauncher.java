package tauwatch.view;

import java.util.concurrent.atomic.AtomicReference;
import javafx.application.Application;
import tauwatch.monitor.live.LiveSession;
import tauwatch.monitor.live.LiveSessionFactory;
import tauwatch.monitor.live.SessionControl;

/**
 * Opens the live view window on a first session and returns when the user closes it.
 *
 * <p>Call from a plain thread (the command's main thread), once per JVM: JavaFX can be launched
 * only once. The factory is used on the view thread for later sessions (start logging, switch
 * source).
 */
public final class LiveViewLauncher {
  /** What the application needs, handed over through a static because JavaFX creates it. */
  record Request(LiveSessionFactory factory, LiveSession firstSession) {}

  private static final AtomicReference<Request> REQUEST = new AtomicReference<>();
  private static final AtomicReference<SessionControl> LAST = new AtomicReference<>();

  private LiveViewLauncher() {}

  /**
   * Shows the window until it is closed.
   *
   * @return the session shown when the window closed (stopped by then), or the first one
   */
  public static SessionControl show(LiveSessionFactory factory, LiveSession first) {
    REQUEST.set(new Request(factory, first));
    LAST.set(first);
    Application.launch(LiveViewApp.class);
    return LAST.get();
  }

  static Request request() {
    return REQUEST.get();
  }

  static void windowClosed(SessionControl last) {
    if (last != null) {
      LAST.set(last);
    }
  }
}
