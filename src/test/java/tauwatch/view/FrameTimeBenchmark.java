package tauwatch.view;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.Locale;
import java.util.Random;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.TimeUnit;
import javafx.animation.AnimationTimer;
import javafx.application.Platform;
import javafx.scene.Scene;
import javafx.stage.Stage;
import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.Test;

/**
 * Frame time of the main window with long trends: not a timed test (tag {@code bench}, excluded by
 * default), it prints figures. Run with {@code mvn -B -q -o test -Dsurefire.excludedGroups=none
 * -Dtest=FrameTimeBenchmark -Dsurefire.failIfNoSpecifiedTests=false}.
 *
 * <p>Worst case per frame: both canvases redraw every frame (the trend reduces every visible row to
 * pixel columns; in use it redraws only on a new pulse or a zoom), and a new pulse arrives every
 * 30th frame (2 pulses/s at 60 frames/s). "Work" is the view thread's own time in {@link
 * WatchWindow#refresh}; the "period" between successive frames includes the software render of the
 * scene on the platform's render thread (Monocle headless, {@code prism.order=sw}).
 */
@Tag("bench")
@Tag("fx")
class FrameTimeBenchmark {
  private static final int WARMUP_FRAMES = 120;
  private static final int FRAMES = 600;

  @Test
  void printsFrameTimesWithTwoHoursAndTwentyFourHoursOfTrends() throws Exception {
    CompletableFuture<Void> up = new CompletableFuture<>();
    Platform.startup(() -> up.complete(null));
    // Closing the first run's window must not end the platform before the second run.
    Platform.setImplicitExit(false);
    up.get(30, TimeUnit.SECONDS);
    run(2 * 3600 * 2, "2 h at 2 pulses/s, redraw every frame", true);
    run(2 * 3600 * 2, "2 h at 2 pulses/s, redraw on each new pulse (as in use)", false);
    run(24 * 3600 * 2, "24 h at 2 pulses/s, redraw every frame", true);
    run(24 * 3600 * 2, "24 h at 2 pulses/s, redraw on each new pulse (as in use)", false);
    Platform.exit();
  }

  private void run(int rows, String label, boolean everyFrame) throws Exception {
    Path dir = Files.createTempDirectory("tauwatch-bench");
    try (ScriptedSession s = new ScriptedSession(dir)) {
      Random rng = new Random(11);
      long t0 = System.nanoTime();
      for (int i = 0; i < rows; i++) {
        // Ra creeps 10 → 20 MΩ over the session with 0.2 MΩ noise; one pulse in 40 rejected.
        s.pulseFast(10 + 10.0 * i / rows + 0.2 * rng.nextGaussian(), rng.nextInt(40) != 0);
      }
      double fillS = (System.nanoTime() - t0) * 1e-9;
      CompletableFuture<double[][]> result = new CompletableFuture<>();
      Platform.runLater(
          () -> {
            try {
              WatchWindow w = new WatchWindow(null, null);
              w.bind(s, s.model);
              Stage stage = new Stage();
              Scene scene = new Scene(w.root(), 1600, 1000);
              stage.setScene(scene);
              stage.show();
              double[] work = new double[FRAMES];
              double[] period = new double[FRAMES];
              // The real frame loop: JavaFX's pulse calls the timer, then renders the scene on its
              // render thread; the next pulse waits for that render, so the period between timer
              // calls is the whole frame time.
              new AnimationTimer() {
                private int f = -WARMUP_FRAMES;
                private long last;

                @Override
                public void handle(long now) {
                  long a = System.nanoTime();
                  if (f % 30 == 0) {
                    s.pulse(20 + 0.2 * rng.nextGaussian(), true);
                  }
                  if (everyFrame) {
                    w.transientPanel().markDirty();
                    w.trendPanel().markDirty();
                  }
                  w.refresh(now);
                  long b = System.nanoTime();
                  if (f >= 0) {
                    work[f] = (b - a) * 1e-6;
                    period[f] = (a - last) * 1e-6;
                  }
                  last = a;
                  if (++f == FRAMES) {
                    stop();
                    stage.close();
                    result.complete(new double[][] {work, period});
                  }
                }
              }.start();
            } catch (RuntimeException | Error e) {
              result.completeExceptionally(e);
            }
          });
      double[][] r = result.get(4, TimeUnit.MINUTES);
      System.out.printf(
          Locale.ROOT,
          "frame time, %s (%d rows, filled in %.1f s), 1600x1000 window, %d frames:%n"
              + "  view-thread work per frame (pull, reduce, draw) median %.2f ms  p99 %.2f ms"
              + "  max %.2f ms%n"
              + "  frame period incl. rendering (60 Hz pulse = 16.7 ms) median %.2f ms  p99 %.2f"
              + " ms  max %.2f ms%n",
          label,
          s.model.trends().rowCount(),
          fillS,
          FRAMES,
          quantile(r[0], 0.5),
          quantile(r[0], 0.99),
          quantile(r[0], 1),
          quantile(r[1], 0.5),
          quantile(r[1], 0.99),
          quantile(r[1], 1));
    }
  }

  private static double quantile(double[] v, double q) {
    double[] s = v.clone();
    Arrays.sort(s);
    return s[(int) Math.min(s.length - 1, Math.floor(q * s.length))];
  }
}
