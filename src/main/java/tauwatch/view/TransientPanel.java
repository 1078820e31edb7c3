package tauwatch.view;

import java.util.Locale;
import javafx.geometry.VPos;
import javafx.scene.canvas.GraphicsContext;
import javafx.scene.text.Font;
import javafx.scene.text.TextAlignment;
import tauwatch.fit.FittedTransient;
import tauwatch.fit.Parameter;
import tauwatch.fit.PulseEstimate;
import tauwatch.monitor.live.LiveSnapshot;
import tauwatch.monitor.live.PulseTrace;
import tauwatch.stream.ClampMode;

/**
 * The latest pulse's response with the fitted curve over it, the baseline pulse faint behind and
 * the fit windows shaded; time in ms from the step onset, current in pA (voltage clamp) or
 * potential in mV (current clamp).
 *
 * <p>View thread only. Redraws when a new snapshot brings a new trace; reuses its point arrays.
 */
final class TransientPanel extends CanvasPanel {
  private static final double LEFT = 64;
  private static final double RIGHT = 14;
  private static final double TOP = 26;
  private static final double BOTTOM = 34;
  private static final int CURVE_POINTS = 160;

  private final Font tickFont = Font.font(13);
  private final Font titleFont = Font.font(14);
  private double[] xs = new double[0];
  private double[] ys = new double[0];
  private LiveSnapshot shown = LiveSnapshot.empty();
  private final PixelRaster raster = new PixelRaster();
  private static final int PANEL_ARGB = PixelRaster.argb(StateLook.PANEL);
  private static final int PLOT_ARGB = PixelRaster.argb(StateLook.BACKGROUND);
  private static final int WINDOW_ARGB =
      PixelRaster.over(StateLook.FIT.deriveColor(0, 1, 1, 0.10), StateLook.BACKGROUND);
  private static final int GRID_ARGB = PixelRaster.argb(StateLook.GRID);
  private static final int TRACE_ARGB = PixelRaster.argb(StateLook.TRACE);
  private static final int BASE_ARGB =
      PixelRaster.over(StateLook.BASELINE_TRACE, StateLook.BACKGROUND);

  TransientPanel() {
    setId("transient-panel");
  }

  void show(LiveSnapshot s) {
    if (s.trace() != shown.trace() || s.latest() != shown.latest()) {
      markDirty();
    }
    shown = s;
  }

  @Override
  protected void draw(GraphicsContext g, double w, double h) {
    g.setFill(StateLook.PANEL);
    g.fillRect(0, 0, w, h);
    PulseTrace t = shown.trace();
    PulseEstimate e = shown.latest();
    g.setFont(titleFont);
    g.setFill(StateLook.TEXT);
    g.setTextBaseline(VPos.TOP);
    g.setTextAlign(TextAlignment.LEFT);
    if (t == null || t.length() < 2) {
      g.fillText("Latest test pulse — waiting for the first pulse", LEFT, 6);
      return;
    }
    boolean cc = t.mode() == ClampMode.CURRENT_CLAMP;
    String yUnit = cc ? "mV" : "pA";
    double x0 = t.startMs();
    double x1 = t.endMs();
    double lo = t.responseMin();
    double hi = t.responseMax();
    PulseTrace base = shown.baselineTrace();
    if (base != null && base.length() > 1) {
      lo = Math.min(lo, base.responseMin());
      hi = Math.max(hi, base.responseMax());
    }
    if (e != null) {
      for (FittedTransient f : e.fittedTransients()) {
        if (Double.isFinite(f.edgeLevel())) {
          lo = Math.min(lo, f.edgeLevel());
          hi = Math.max(hi, f.edgeLevel());
        }
      }
    }
    double pad = 0.06 * Math.max(hi - lo, 1e-9);
    lo -= pad;
    hi += pad;
    double pw = w - LEFT - RIGHT;
    double ph = h - TOP - BOTTOM;
    Axis ax = new Axis(x0, x1, LEFT, pw);
    Axis ay = new Axis(hi, lo, TOP, ph);

    // Fit windows, grid and traces as pixels; then text and the fitted curves on top.
    raster.reset((int) w, (int) h, PANEL_ARGB);
    int pt = (int) TOP;
    int pb = (int) (TOP + ph);
    raster.rect((int) LEFT, pt, (int) (LEFT + pw), pb, PLOT_ARGB);
    if (e != null) {
      for (FittedTransient f : e.fittedTransients()) {
        raster.rect(
            (int) Math.round(ax.px(f.fitStartMs())),
            pt,
            (int) Math.round(ax.px(f.fitEndMs())) + 1,
            pb,
            WINDOW_ARGB);
      }
    }
    double sx = Numbers.niceStep(ax.span(), 8);
    for (double v = Math.ceil(ax.min() / sx) * sx; v <= ax.max() + 1e-9; v += sx) {
      raster.span((int) Math.round(ax.px(v)), pt, pb, pt, pb, GRID_ARGB);
    }
    double sy = Numbers.niceStep(ay.span(), 5);
    for (double v = Math.ceil(ay.min() / sy) * sy; v <= ay.max() + 1e-9; v += sy) {
      int yy = (int) Math.round(ay.px(v));
      raster.rect((int) LEFT, yy, (int) (LEFT + pw), yy + 1, GRID_ARGB);
    }
    if (base != null && base.length() > 1 && base != t) {
      rasterTrace(base, ax, ay, pt, pb, BASE_ARGB, 1);
    }
    rasterTrace(t, ax, ay, pt, pb, TRACE_ARGB, 0);
    g.drawImage(raster.image(), 0, 0);
    gridText(g, ax, ay, pw, ph, yUnit);

    if (e != null) {
      for (FittedTransient f : e.fittedTransients()) {
        curve(g, f, ax, ay);
      }
    }
    title(g, t, e, base != null && base != t, w);
  }

  private void gridText(GraphicsContext g, Axis ax, Axis ay, double pw, double ph, String yUnit) {
    g.setFont(tickFont);
    g.setFill(StateLook.AXIS_TEXT);
    double sx = Numbers.niceStep(ax.span(), 8);
    g.setTextAlign(TextAlignment.CENTER);
    g.setTextBaseline(VPos.TOP);
    for (double v = Math.ceil(ax.min() / sx) * sx; v <= ax.max() + 1e-9; v += sx) {
      g.fillText(Numbers.tick(v, sx), Math.round(ax.px(v)) + 0.5, TOP + ph + 4);
    }
    g.fillText("ms from step onset", LEFT + pw / 2, TOP + ph + 18);
    double sy = Numbers.niceStep(ay.span(), 5);
    g.setTextAlign(TextAlignment.RIGHT);
    g.setTextBaseline(VPos.CENTER);
    for (double v = Math.ceil(ay.min() / sy) * sy; v <= ay.max() + 1e-9; v += sy) {
      g.fillText(Numbers.tick(v, sy), LEFT - 6, Math.round(ay.px(v)) + 0.5);
    }
    g.setTextAlign(TextAlignment.CENTER);
    g.save();
    g.translate(14, TOP + ph / 2);
    g.rotate(-90);
    g.fillText(yUnit, 0, 0);
    g.restore();
    g.setStroke(StateLook.AXIS_TEXT);
    g.setLineWidth(1);
    g.strokeRect(LEFT + 0.5, TOP + 0.5, pw, ph);
  }

  /**
   * The samples as connected vertical spans, one pixel column at a time ({@code thick} extra px).
   */
  private void rasterTrace(
      PulseTrace t, Axis ax, Axis ay, int top, int bottom, int argb, int thick) {
    int px = (int) Math.round(ax.px(t.timeMs(0)));
    int py = (int) Math.round(ay.px(t.response(0)));
    for (int i = 1; i < t.length(); i++) {
      int x = (int) Math.round(ax.px(t.timeMs(i)));
      int y = (int) Math.round(ay.px(t.response(i)));
      if (x == px) {
        raster.span(x, py, y, top, bottom, argb);
      } else {
        int last = py;
        for (int c = px + 1; c <= x; c++) {
          int yy = py + (int) Math.round((double) (y - py) * (c - px) / (x - px));
          for (int k = 0; k <= thick; k++) {
            raster.span(c + k, last, yy, top, bottom, argb);
          }
          last = yy;
        }
      }
      px = x;
      py = y;
    }
  }

  private void curve(GraphicsContext g, FittedTransient f, Axis ax, Axis ay) {
    ensure(CURVE_POINTS + 1);
    // Dashed: carried back from the fit's start to the edge; solid: the part fitted.
    g.setStroke(StateLook.FIT);
    g.setLineWidth(1.6);
    g.setLineDashes(5, 4);
    segment(g, f, f.edgeMs(), f.fitStartMs(), ax, ay, 24);
    g.setLineDashes((double[]) null);
    g.setLineWidth(2.2);
    segment(g, f, f.fitStartMs(), f.fitEndMs(), ax, ay, CURVE_POINTS);
    if (Double.isFinite(f.edgeLevel())) {
      double x = ax.px(f.edgeMs());
      double y = ay.px(f.edgeLevel());
      g.setLineWidth(2);
      g.strokeOval(x - 5, y - 5, 10, 10);
    }
  }

  private void segment(
      GraphicsContext g, FittedTransient f, double a, double b, Axis ax, Axis ay, int n) {
    if (!(b > a)) {
      return;
    }
    for (int i = 0; i <= n; i++) {
      double t = a + (b - a) * i / n;
      xs[i] = ax.px(t);
      ys[i] = ay.px(f.levelAt(t));
    }
    g.strokePolyline(xs, ys, n + 1);
  }

  private void title(GraphicsContext g, PulseTrace t, PulseEstimate e, boolean withBase, double w) {
    g.setFont(titleFont);
    g.setTextAlign(TextAlignment.LEFT);
    g.setTextBaseline(VPos.TOP);
    g.setFill(StateLook.TEXT);
    StringBuilder sb = new StringBuilder();
    sb.append("Latest test pulse #").append(t.pulseNumber());
    if (e != null) {
      sb.append(
          String.format(
              Locale.ROOT,
              "  step %+.1f %s",
              e.stepAmplitude(),
              t.mode() == ClampMode.CURRENT_CLAMP ? "pA" : "mV"));
      double tau = e.value(Parameter.TIME_CONSTANT);
      if (Double.isFinite(tau)) {
        sb.append(String.format(Locale.ROOT, "   fit %s, tau %.3f ms", e.model(), tau));
      }
    }
    g.fillText(sb.toString(), LEFT, 5);
    g.setTextAlign(TextAlignment.RIGHT);
    double x = w - RIGHT;
    if (e != null && !e.accepted()) {
      g.setFill(StateLook.REJECTED);
      g.fillText("rejected: " + e.rejectReason(), x, 5);
    } else {
      g.setFill(StateLook.AXIS_TEXT);
      g.fillText(
          (withBase ? "grey: baseline pulse · " : "")
              + "amber: fit, shaded: fitted samples, ring: value at the edge",
          x,
          5);
    }
  }

  private void ensure(int n) {
    if (xs.length < n) {
      xs = new double[n];
      ys = new double[n];
    }
  }

  /** A linear map from data to pixels; {@code min}/{@code max} are the data at the two ends. */
  private record Axis(double from, double to, double offsetPx, double lengthPx) {
    double px(double v) {
      return offsetPx + (v - from) / (to - from) * lengthPx;
    }

    double min() {
      return Math.min(from, to);
    }

    double max() {
      return Math.max(from, to);
    }

    double span() {
      return Math.abs(to - from);
    }
  }
}
