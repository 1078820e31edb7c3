package tauwatch.view;

import javafx.scene.image.PixelFormat;
import javafx.scene.image.WritableImage;
import javafx.scene.paint.Color;

/**
 * An opaque ARGB pixel buffer drawn into by plain array writes and handed to the canvas as one
 * image: spans, rectangles and dashed lines without anti-aliasing, which the software renderer
 * would otherwise rasterise path by path.
 *
 * <p>View thread only. The buffer and the image are reused and reallocated only when the size
 * changes, so a redraw allocates nothing.
 */
final class PixelRaster {
  private int width;
  private int height;
  private int[] pixels = new int[0];
  private WritableImage image;

  /** Resizes if needed and fills with {@code background}. */
  void reset(int w, int h, int background) {
    if (w != width || h != height) {
      width = w;
      height = h;
      pixels = new int[Math.max(1, w * h)];
      image = new WritableImage(Math.max(1, w), Math.max(1, h));
    }
    java.util.Arrays.fill(pixels, background);
  }

  int width() {
    return width;
  }

  int height() {
    return height;
  }

  /** Fills [x0, x1) × [y0, y1), clipped. */
  void rect(int x0, int y0, int x1, int y1, int argb) {
    x0 = Math.max(0, x0);
    y0 = Math.max(0, y0);
    x1 = Math.min(width, x1);
    y1 = Math.min(height, y1);
    for (int y = y0; y < y1; y++) {
      int row = y * width;
      for (int x = x0; x < x1; x++) {
        pixels[row + x] = argb;
      }
    }
  }

  /**
   * A vertical span at column x from y0 to y1 inclusive (either order), clipped to [top, bottom).
   */
  void span(int x, int y0, int y1, int top, int bottom, int argb) {
    if (x < 0 || x >= width) {
      return;
    }
    int a = Math.max(Math.max(0, top), Math.min(y0, y1));
    int b = Math.min(Math.min(height, bottom) - 1, Math.max(y0, y1));
    for (int y = a; y <= b; y++) {
      pixels[y * width + x] = argb;
    }
  }

  /** A horizontal dashed line: {@code on} pixels drawn, {@code off} skipped. */
  void dashed(int x0, int x1, int y, int on, int off, int argb) {
    if (y < 0 || y >= height) {
      return;
    }
    int row = y * width;
    for (int x = Math.max(0, x0); x < Math.min(width, x1); x++) {
      if ((x - x0) % (on + off) < on) {
        pixels[row + x] = argb;
      }
    }
  }

  /** The buffer as an image, for {@code GraphicsContext.drawImage}. */
  WritableImage image() {
    image
        .getPixelWriter()
        .setPixels(0, 0, width, height, PixelFormat.getIntArgbInstance(), pixels, 0, width);
    return image;
  }

  static int argb(Color c) {
    return ((int) Math.round(c.getOpacity() * 255) << 24)
        | ((int) Math.round(c.getRed() * 255) << 16)
        | ((int) Math.round(c.getGreen() * 255) << 8)
        | (int) Math.round(c.getBlue() * 255);
  }

  /** {@code top} with its opacity laid over the opaque {@code under}, as an opaque colour. */
  static int over(Color top, Color under) {
    double a = top.getOpacity();
    return argb(
        new Color(
            top.getRed() * a + under.getRed() * (1 - a),
            top.getGreen() * a + under.getGreen() * (1 - a),
            top.getBlue() * a + under.getBlue() * (1 - a),
            1));
  }
}
