package tauwatch.view;

import java.util.List;
import javafx.geometry.VPos;
import javafx.scene.canvas.GraphicsContext;
import javafx.scene.input.MouseButton;
import javafx.scene.text.Font;
import javafx.scene.text.TextAlignment;
import tauwatch.fit.Parameter;
import tauwatch.health.HealthCriteria;
import tauwatch.health.HealthState;
import tauwatch.health.ParameterLimits;
import tauwatch.monitor.live.TrendHistory;
import tauwatch.monitor.live.TrendReduction;

/**
 * The trends of the session: one strip per parameter against recording time, with its baseline,
 * allowed band and limits, rejected pulses marked above it and its health state as a strip below it
 * whose height grows with severity.
 *
 * <p>View thread only. Each draw reduces the visible rows to min/max per pixel column ({@link
 * TrendReduction}, reused arrays), so hours of pulses cost the same to draw as minutes. Scroll to
 * zoom about the pointer, drag to pan, double-click (or {@link #followAll()}) to follow the whole
 * session again.
 */
final class TrendPanel extends CanvasPanel {
  private static final double LEFT = 86;
  private static final double RIGHT = 16;
  private static final double TOP = 6;
  private static final double BOTTOM = 26;
  private static final double ROW_GAP = 8;
  private static final double MIN_SPAN_S = 5;

  private final Font labelFont = Font.font(15);
  private final Font tickFont = Font.font(12);
  private TrendHistory history;
  private HealthCriteria criteria;
  private List<Parameter> rows = List.of();
  private TrendReduction[] reductions = new TrendReduction[0];
  private double[] xs = new double[0];
  private double[] ys = new double[0];

  /** Visible span in s; NaN = the whole session. */
  private double spanS = Double.NaN;

  /** Visible end in stream s; NaN = follow the latest pulse. */
  private double endS = Double.NaN;

  private double dragX = Double.NaN;
  private double dragEndS;
  private double lastT0;
  private double lastT1;

  TrendPanel() {
    setId("trend-panel");
    setOnScroll(
        ev -> {
          double factor = ev.getDeltaY() > 0 ? 0.8 : 1.25;
          zoom(factor, ev.getX());
          ev.consume();
        });
    setOnMousePressed(
        ev -> {
          dragX = ev.getX();
          dragEndS = lastT1;
        });
    setOnMouseDragged(
        ev -> {
          if (Double.isNaN(dragX)) {
            return;
          }
          double pw = canvas.getWidth() - LEFT - RIGHT;
          double sPerPx = (lastT1 - lastT0) / Math.max(1, pw);
          spanS = lastT1 - lastT0;
          endS = dragEndS - (ev.getX() - dragX) * sPerPx;
          markDirty();
        });
    setOnMouseReleased(ev -> dragX = Double.NaN);
    setOnMouseClicked(
        ev -> {
          if (ev.getButton() == MouseButton.PRIMARY && ev.getClickCount() == 2) {
            followAll();
          }
        });
  }

  void bind(TrendHistory history, HealthCriteria criteria, List<Parameter> rows) {
    this.history = history;
    this.criteria = criteria;
    this.rows = List.copyOf(rows);
    reductions = new TrendReduction[rows.size()];
    for (int i = 0; i < reductions.length; i++) {
      reductions[i] = new TrendReduction();
    }
    markDirty();
  }

  /** Shows the whole session and follows new pulses. */
  void followAll() {
    spanS = Double.NaN;
    endS = Double.NaN;
    markDirty();
  }

  /** Shows the last {@code s} seconds and follows new pulses. */
  void followLast(double s) {
    spanS = s;
    endS = Double.NaN;
    markDirty();
  }

  void zoom(double factor, double atX) {
    double span = lastT1 - lastT0;
    if (!(span > 0)) {
      return;
    }
    double pw = canvas.getWidth() - LEFT - RIGHT;
    double frac = Math.min(1, Math.max(0, (atX - LEFT) / Math.max(1, pw)));
    double at = lastT0 + frac * span;
    double newSpan = Math.max(MIN_SPAN_S, span * factor);
    double t0 = at - frac * newSpan;
    spanS = newSpan;
    endS = t0 + newSpan;
    markDirty();
  }

  /** The visible range of the last draw, stream s. */
  double[] visibleRange() {
    return new double[] {lastT0, lastT1};
  }

  @Override
  protected void draw(GraphicsContext g, double w, double h) {
    g.setFill(StateLook.PANEL);
    g.fillRect(0, 0, w, h);
    if (history == null || rows.isEmpty()) {
      return;
    }
    long count = history.rowCount();
    double pw = Math.max(10, w - LEFT - RIGHT);
    int cols = (int) pw;
    double first = count == 0 ? 0 : history.timeS(history.oldestReadableRow(count));
    double latest = count == 0 ? 60 : history.timeS(count - 1);
    double t1 = Double.isNaN(endS) ? Math.max(latest, first + MIN_SPAN_S) : endS;
    double span = Double.isNaN(spanS) ? Math.max(MIN_SPAN_S, t1 - first) : spanS;
    if (Double.isNaN(spanS) && Double.isNaN(endS)) {
      // Whole session: leave a little room on the right for the next pulses.
      span *= 1.02;
      t1 = first + span;
    }
    double t0 = t1 - span;
    lastT0 = t0;
    lastT1 = t1;

    double rowH = (h - TOP - BOTTOM - ROW_GAP * (rows.size() - 1)) / rows.size();
    for (int i = 0; i < rows.size(); i++) {
      TrendReduction r = reductions[i];
      r.reduce(history, rows.get(i), t0, t1, cols);
      double top = TOP + i * (rowH + ROW_GAP);
      row(g, rows.get(i), r, top, rowH, pw);
    }
    timeAxis(g, t0, t1, pw, h);
    if (count == 0) {
      g.setFill(StateLook.AXIS_TEXT);
      g.setFont(labelFont);
      g.setTextAlign(TextAlignment.CENTER);
      g.setTextBaseline(VPos.CENTER);
      g.fillText("trends appear with the first pulses", LEFT + pw / 2, h / 2);
    }
  }

  private void row(
      GraphicsContext g, Parameter p, TrendReduction r, double top, double rh, double pw) {
    int cols = r.columns();
    double strip = 10;
    double marks = 9;
    double plotTop = top + marks;
    double plotH = Math.max(10, rh - strip - marks - 2);
    ParameterLimits lim = criteria == null ? null : criteria.limits().get(p);
    double pct = lim == null ? Double.NaN : lim.maxChangePercent();
    double abs = lim == null ? Double.NaN : lim.maxChangeAbs();

    // Vertical range: the data, the band around the baseline, and limits near them.
    double lo = r.dataMin();
    double hi = r.dataMax();
    double bLast = Double.NaN;
    for (int c = 0; c < cols; c++) {
      if (!Float.isNaN(r.baseline(c))) {
        bLast = r.baseline(c);
      }
    }
    if (Double.isFinite(bLast)) {
      double half = allowed(bLast, pct, abs);
      double bandLo = Double.isFinite(half) ? bLast - half : bLast;
      double bandHi = Double.isFinite(half) ? bLast + half : bLast;
      lo = Double.isNaN(lo) ? bandLo : Math.min(lo, bandLo);
      hi = Double.isNaN(hi) ? bandHi : Math.max(hi, bandHi);
    }
    if (Double.isNaN(lo)) {
      lo = 0;
      hi = 1;
    }
    double span0 = Math.max(hi - lo, Math.abs(hi) * 0.02 + 1e-6);
    if (lim != null) {
      if (Double.isFinite(lim.max()) && lim.max() > hi && lim.max() - hi < span0) {
        hi = lim.max();
      }
      if (Double.isFinite(lim.min()) && lim.min() < lo && lo - lim.min() < span0) {
        lo = lim.min();
      }
    }
    double minSpan = minimumSpan(p, 0.5 * (lo + hi));
    if (hi - lo < minSpan) {
      double mid = 0.5 * (lo + hi);
      lo = mid - minSpan / 2;
      hi = mid + minSpan / 2;
    }
    double pad = 0.08 * Math.max(hi - lo, Math.abs(hi) * 0.02 + 1e-6);
    lo -= pad;
    hi += pad;
    final double ylo = lo;
    final double yhi = hi;

    g.setFill(StateLook.BACKGROUND);
    g.fillRect(LEFT, plotTop, pw, plotH);

    // Allowed band and baseline, in runs of equal baseline.
    // Columns between pulses hold no baseline: the one in force carries on through them.
    int c = 0;
    while (c < cols) {
      float b = r.baseline(c);
      int e = c + 1;
      while (e < cols && (sameFloat(r.baseline(e), b) || (!r.hasPulses(e) && e - c < cols))) {
        if (!r.hasPulses(e) && !hasLaterPulse(r, e, cols)) {
          break;
        }
        e++;
      }
      if (!Float.isNaN(b)) {
        double half = allowed(b, pct, abs);
        double x0 = LEFT + c;
        double x1 = LEFT + e;
        if (Double.isFinite(half)) {
          double y0 = y(b + half, ylo, yhi, plotTop, plotH);
          double y1 = y(b - half, ylo, yhi, plotTop, plotH);
          g.setFill(StateLook.BAND);
          g.fillRect(
              x0,
              clamp(y0, plotTop, plotTop + plotH),
              x1 - x0,
              clamp(y1, plotTop, plotTop + plotH) - clamp(y0, plotTop, plotTop + plotH));
        }
        double yb = y(b, ylo, yhi, plotTop, plotH);
        if (yb >= plotTop && yb <= plotTop + plotH) {
          g.setStroke(StateLook.BASELINE);
          g.setLineWidth(1);
          g.setLineDashes(2, 3);
          g.strokeLine(x0, yb, x1, yb);
          g.setLineDashes((double[]) null);
        }
      }
      c = e;
    }

    // Limits.
    g.setFont(tickFont);
    g.setTextBaseline(VPos.BOTTOM);
    g.setTextAlign(TextAlignment.RIGHT);
    if (lim != null) {
      limit(g, lim.max(), "max", ylo, yhi, plotTop, plotH, pw);
      limit(g, lim.min(), "min", ylo, yhi, plotTop, plotH, pw);
    }

    // Values: min/max per column as one envelope polyline, broken where a column is empty.
    ensure(2 * cols);
    g.setStroke(StateLook.TRACE);
    g.setLineWidth(1.3);
    int n = 0;
    for (int k = 0; k < cols; k++) {
      float mn = r.min(k);
      if (Float.isNaN(mn)) {
        // A column without accepted values only breaks the line when it holds a rejected pulse
        // or a long stretch is empty; short gaps between pulses stay joined.
        if (r.rejected(k) > 0 || !joinAcross(r, k, cols)) {
          n = flush(g, n);
        }
        continue;
      }
      double x = LEFT + k + 0.5;
      xs[n] = x;
      ys[n++] = y(mn, ylo, yhi, plotTop, plotH);
      xs[n] = x;
      ys[n++] = y(r.max(k), ylo, yhi, plotTop, plotH);
    }
    flush(g, n);
    if (n == 2) {
      g.setFill(StateLook.TRACE);
      g.fillOval(xs[0] - 2, ys[0] - 2, 4, 4);
    }

    // Rejected pulses: a small cross above the plot.
    g.setStroke(StateLook.REJECTED);
    g.setLineWidth(1.2);
    for (int k = 0; k < cols; k++) {
      if (r.rejected(k) > 0) {
        double x = LEFT + k + 0.5;
        double yc = top + marks / 2;
        g.strokeLine(x - 3, yc - 3, x + 3, yc + 3);
        g.strokeLine(x - 3, yc + 3, x + 3, yc - 3);
      }
    }

    // Health state along the time axis.
    double stripTop = plotTop + plotH + 1;
    for (int k = 0; k < cols; ) {
      if (!r.hasPulses(k)) {
        k++;
        continue;
      }
      HealthState s = r.worstState(k);
      int e = k + 1;
      while (e < cols && r.hasPulses(e) && r.worstState(e) == s) {
        e++;
      }
      double sh = StateLook.stripHeight(s);
      g.setFill(StateLook.color(s));
      g.fillRect(LEFT + k, stripTop, e - k, sh);
      k = e;
    }

    // Label and vertical ticks.
    g.setFill(StateLook.TEXT);
    g.setFont(labelFont);
    g.setTextAlign(TextAlignment.LEFT);
    g.setTextBaseline(VPos.TOP);
    g.fillText(p.symbol(), 6, plotTop);
    g.setFont(tickFont);
    g.setFill(StateLook.AXIS_TEXT);
    g.fillText(p.unit(), 6, plotTop + 18);
    double step = Numbers.niceStep(yhi - ylo, 3);
    g.setTextAlign(TextAlignment.RIGHT);
    g.setTextBaseline(VPos.CENTER);
    g.setStroke(StateLook.GRID);
    g.setLineWidth(1);
    for (double v = Math.ceil(ylo / step) * step; v <= yhi; v += step) {
      double yy = Math.round(y(v, ylo, yhi, plotTop, plotH)) + 0.5;
      g.strokeLine(LEFT - 4, yy, LEFT, yy);
      g.fillText(Numbers.tick(v, step), LEFT - 6, yy);
    }
    g.setStroke(StateLook.GRID);
    g.strokeRect(LEFT + 0.5, plotTop + 0.5, pw - 1, plotH - 1);
  }

  private static boolean hasLaterPulse(TrendReduction r, int from, int cols) {
    for (int k = from; k < cols; k++) {
      if (r.hasPulses(k)) {
        return true;
      }
    }
    return false;
  }

  /** Smallest vertical span worth showing, so that noise is not blown up to the strip's height. */
  private static double minimumSpan(Parameter p, double mid) {
    double floor =
        switch (p) {
          case ACCESS_RESISTANCE -> 2;
          case INPUT_RESISTANCE, TOTAL_RESISTANCE -> 40;
          case MEMBRANE_CAPACITANCE, CHARGE_CAPACITANCE -> 4;
          case TIME_CONSTANT -> 0.05;
          case HOLDING_CURRENT -> 20;
          case RESTING_POTENTIAL -> 4;
        };
    return Math.max(floor, 0.05 * Math.abs(mid));
  }

  /** Whether an empty column lies between two filled columns within 12 px (pulse spacing). */
  private static boolean joinAcross(TrendReduction r, int k, int cols) {
    int before = k - 1;
    while (before >= 0 && k - before <= 12 && Float.isNaN(r.min(before))) {
      before--;
    }
    int after = k + 1;
    while (after < cols && after - k <= 12 && Float.isNaN(r.min(after))) {
      after++;
    }
    return before >= 0
        && after < cols
        && k - before <= 12
        && after - k <= 12
        && !Float.isNaN(r.min(before))
        && !Float.isNaN(r.min(after));
  }

  private int flush(GraphicsContext g, int n) {
    if (n >= 2) {
      g.strokePolyline(xs, ys, n);
    }
    return 0;
  }

  private void limit(
      GraphicsContext g,
      double v,
      String what,
      double lo,
      double hi,
      double top,
      double ph,
      double pw) {
    if (!Double.isFinite(v) || v < lo || v > hi) {
      return;
    }
    double yy = Math.round(y(v, lo, hi, top, ph)) + 0.5;
    g.setStroke(StateLook.LIMIT);
    g.setLineWidth(1.4);
    g.setLineDashes(8, 4);
    g.strokeLine(LEFT, yy, LEFT + pw, yy);
    g.setLineDashes((double[]) null);
    g.setFill(StateLook.LIMIT);
    g.fillText(what + " " + Numbers.tick(v, Math.abs(v) >= 10 ? 1 : 0.1), LEFT + pw - 4, yy - 1);
  }

  private void timeAxis(GraphicsContext g, double t0, double t1, double pw, double h) {
    double[] steps = {1, 2, 5, 10, 15, 30, 60, 120, 300, 600, 900, 1800, 3600, 7200, 14400};
    double step = steps[steps.length - 1];
    for (double s : steps) {
      if ((t1 - t0) / s <= 10) {
        step = s;
        break;
      }
    }
    g.setFont(tickFont);
    g.setFill(StateLook.AXIS_TEXT);
    g.setStroke(StateLook.GRID);
    g.setTextAlign(TextAlignment.CENTER);
    g.setTextBaseline(VPos.TOP);
    double axisY = h - BOTTOM + 2;
    for (double v = Math.ceil(t0 / step) * step; v <= t1; v += step) {
      double x = Math.round(LEFT + (v - t0) / (t1 - t0) * pw) + 0.5;
      g.strokeLine(x, TOP, x, axisY);
      g.fillText(Numbers.clock(v), x, axisY + 2);
    }
    g.setTextAlign(TextAlignment.LEFT);
    g.fillText("recording time", 6, axisY + 2);
  }

  private static double allowed(double b, double pct, double abs) {
    double half = Double.NaN;
    if (Double.isFinite(pct)) {
      half = Math.abs(b) * pct / 100;
    }
    if (Double.isFinite(abs)) {
      half = Double.isNaN(half) ? abs : Math.min(half, abs);
    }
    return half;
  }

  private static double y(double v, double lo, double hi, double top, double ph) {
    return top + (hi - v) / (hi - lo) * ph;
  }

  private static double clamp(double v, double a, double b) {
    return Math.max(a, Math.min(b, v));
  }

  private static boolean sameFloat(float a, float b) {
    return a == b || (Float.isNaN(a) && Float.isNaN(b));
  }

  private void ensure(int n) {
    if (xs.length < n) {
      xs = new double[n];
      ys = new double[n];
    }
  }
}
