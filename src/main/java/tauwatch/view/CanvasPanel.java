package tauwatch.view;

import javafx.scene.canvas.Canvas;
import javafx.scene.canvas.GraphicsContext;
import javafx.scene.layout.Region;

/**
 * A region that draws itself on a canvas the size of the region, only when marked dirty and at most
 * once per frame.
 *
 * <p>View thread only.
 */
abstract class CanvasPanel extends Region {
  protected final Canvas canvas = new Canvas();
  private boolean dirty = true;

  CanvasPanel() {
    getChildren().add(canvas);
    setMinSize(200, 120);
  }

  @Override
  protected void layoutChildren() {
    double w = Math.floor(getWidth());
    double h = Math.floor(getHeight());
    if (canvas.getWidth() != w || canvas.getHeight() != h) {
      canvas.setWidth(w);
      canvas.setHeight(h);
      dirty = true;
    }
    canvas.relocate(0, 0);
  }

  final void markDirty() {
    dirty = true;
  }

  /** Draws if something changed since the last draw; returns whether it drew. */
  final boolean drawIfDirty() {
    if (!dirty || canvas.getWidth() < 10 || canvas.getHeight() < 10) {
      return false;
    }
    dirty = false;
    GraphicsContext g = canvas.getGraphicsContext2D();
    draw(g, canvas.getWidth(), canvas.getHeight());
    return true;
  }

  protected abstract void draw(GraphicsContext g, double w, double h);
}
