package tauwatch.view;

import javafx.scene.Node;
import javafx.scene.paint.Color;
import javafx.scene.shape.Circle;
import javafx.scene.shape.Polygon;
import javafx.scene.shape.Rectangle;
import tauwatch.health.HealthState;

/**
 * Tauwatch's own visual language for the health states: a colour, a shape and a word for each, so
 * that no state is told by colour alone.
 *
 * <p>Steady is a filled blue disc, drifting an amber triangle pointing up, breach a red square, no
 * signal a grey ring. Blue, amber and red differ in lightness as well as hue, so they stay apart
 * for red–green colour-blind readers; the shapes and words carry the state for everyone. Stateless;
 * the shapes it makes are new nodes for the view thread.
 */
final class StateLook {
  static final Color BACKGROUND = Color.web("#15191e");
  static final Color PANEL = Color.web("#1d232a");
  static final Color GRID = Color.web("#323b45");
  static final Color AXIS_TEXT = Color.web("#aab4bf");
  static final Color TEXT = Color.web("#e8edf2");
  static final Color TRACE = Color.web("#e8edf2");
  static final Color BASELINE_TRACE = Color.web("#7d8894", 0.55);
  static final Color FIT = Color.web("#ffb000");
  static final Color FIT_WINDOW = Color.web("#ffb000", 0.06);
  static final Color BASELINE = Color.web("#9ecae9");
  static final Color BAND = Color.web("#4a90d9", 0.16);
  static final Color LIMIT = Color.web("#ff6b5e");
  static final Color REJECTED = Color.web("#c9a0dc");

  private StateLook() {}

  static Color color(HealthState s) {
    return switch (s) {
      case STEADY -> Color.web("#4a90d9");
      case DRIFTING -> Color.web("#f0c030");
      case BREACH -> Color.web("#e0402e");
      case NO_SIGNAL -> Color.web("#8a949e");
    };
  }

  /** CSS hex of {@link #color}. */
  static String css(HealthState s) {
    Color c = color(s);
    return String.format(
        "#%02x%02x%02x",
        (int) Math.round(c.getRed() * 255),
        (int) Math.round(c.getGreen() * 255),
        (int) Math.round(c.getBlue() * 255));
  }

  /** The word shown for a state (the log's label). */
  static String word(HealthState s) {
    return s.label();
  }

  /** The state's shape, {@code size} px across. */
  static Node shape(HealthState s, double size) {
    double r = size / 2;
    Color c = color(s);
    return switch (s) {
      case STEADY -> new Circle(r, r, r, c);
      case DRIFTING -> {
        Polygon p = new Polygon(r, 0, size, size, 0, size);
        p.setFill(c);
        yield p;
      }
      case BREACH -> {
        Rectangle q = new Rectangle(size * 0.9, size * 0.9, c);
        yield q;
      }
      case NO_SIGNAL -> {
        Circle ring = new Circle(r, r, r - size * 0.12, Color.TRANSPARENT);
        ring.setStroke(c);
        ring.setStrokeWidth(size * 0.22);
        yield ring;
      }
    };
  }

  /** Height of the state strip under a trend, px: grows with severity, a cue that is not colour. */
  static double stripHeight(HealthState s) {
    return switch (s) {
      case STEADY -> 3;
      case DRIFTING -> 6;
      case NO_SIGNAL -> 6;
      case BREACH -> 10;
    };
  }
}
