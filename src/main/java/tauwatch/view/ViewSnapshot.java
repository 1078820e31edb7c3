package tauwatch.view;

import java.awt.image.BufferedImage;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.TimeUnit;
import javafx.application.Platform;
import javafx.scene.Scene;
import javafx.scene.image.PixelReader;
import javafx.scene.image.WritableImage;
import javafx.stage.Stage;
import javax.imageio.ImageIO;
import tauwatch.fit.PulseEstimator;
import tauwatch.monitor.MonitorConfig;
import tauwatch.monitor.PulseEstimators;
import tauwatch.monitor.live.LiveSession;
import tauwatch.sim.ScenarioLoader;
import tauwatch.sim.SimulatedRecording;
import tauwatch.source.SimulatedSource;

/**
 * Renders the main window after a stretch of a simulated recording into a PNG, for the docs.
 *
 * <p>Usage: {@code java -cp target/tauwatch.jar tauwatch.view.ViewSnapshot OUT.png [SCENARIO
 * [SECONDS]]} under a display (e.g. {@code xvfb-run}). Runs the scenario unpaced through the whole
 * pipeline into a temporary log folder, then shows the window at 1600×1000 and writes its image.
 */
public final class ViewSnapshot {
  private ViewSnapshot() {}

  public static void main(String[] args) throws Exception {
    if (args.length < 1) {
      System.err.println("usage: ViewSnapshot OUT.png [SCENARIO [SECONDS]]");
      System.exit(2);
    }
    Path out = Path.of(args[0]);
    String scenario = args.length > 1 ? args[1] : "ra-creep";
    double seconds = args.length > 2 ? Double.parseDouble(args[2]) : 240;
    Path logDir = Files.createTempDirectory("tauwatch-snapshot");
    MonitorConfig config = MonitorConfig.defaults();
    SimulatedSource src =
        new SimulatedSource(new SimulatedRecording(ScenarioLoader.load(scenario)), false);
    PulseEstimator est = PulseEstimators.forFormat(src.format(), config);
    LiveSession s =
        LiveSession.start(src, config, est, logDir, Duration.ofMillis((long) (seconds * 1000)));
    if (!s.awaitEnd(10, TimeUnit.MINUTES)) {
      throw new IllegalStateException("the simulated session did not finish");
    }
    if (s.failure() != null) {
      throw s.failure();
    }
    CompletableFuture<WritableImage> shot = new CompletableFuture<>();
    Platform.startup(
        () -> {
          try {
            WatchWindow w = new WatchWindow(null, null);
            w.bind(s, s.model());
            Stage stage = new Stage();
            Scene scene = new Scene(w.root(), 1600, 1000);
            stage.setScene(scene);
            stage.show();
            // Two layout passes: the canvases take their size in the first.
            scene.getRoot().applyCss();
            scene.getRoot().layout();
            w.refresh(System.nanoTime());
            scene.getRoot().layout();
            w.transientPanel().markDirty();
            w.trendPanel().markDirty();
            w.refresh(System.nanoTime() + 1_000_000_000L);
            w.refresh(System.nanoTime() + 2_000_000_000L);
            shot.complete(scene.snapshot(null));
          } catch (RuntimeException e) {
            shot.completeExceptionally(e);
          }
        });
    WritableImage img = shot.get(60, TimeUnit.SECONDS);
    write(img, out);
    Platform.exit();
    System.out.println("wrote " + out + " (" + s.result().pulses() + " pulses, " + scenario + ")");
  }

  /** Writes a JavaFX image as PNG through a {@link BufferedImage}. */
  static void write(WritableImage img, Path out) throws IOException {
    int w = (int) img.getWidth();
    int h = (int) img.getHeight();
    BufferedImage b = new BufferedImage(w, h, BufferedImage.TYPE_INT_RGB);
    PixelReader r = img.getPixelReader();
    for (int y = 0; y < h; y++) {
      for (int x = 0; x < w; x++) {
        b.setRGB(x, y, r.getArgb(x, y));
      }
    }
    if (out.getParent() != null) {
      Files.createDirectories(out.getParent());
    }
    ImageIO.write(b, "png", out.toFile());
  }
}
