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
  private final PixelRaster raster = new PixelRaster();
  private static final int BG = PixelRaster.argb(StateLook.BACKGROUND);
  private static final int BAND = PixelRaster.over(StateLook.BAND, StateLook.BACKGROUND);
  private static final int BASE = PixelRaster.argb(StateLook.BASELINE);
  private static final int LIM = PixelRaster.argb(StateLook.LIMIT);
  private static final int DATA = PixelRaster.argb(StateLook.TRACE);
  private static final int REJ = PixelRaster.argb(StateLook.REJECTED);
  private static final int GRIDC = PixelRaster.argb(StateLook.GRID);
  private static final int[] STATE = new int[HealthState.values().length];

  static {
    for (HealthState st : HealthState.values()) {
      STATE[st.ordinal()] = PixelRaster.argb(StateLook.color(st));
    }
  }

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
    int wi = (int) w;
    int hi = (int) h;
    raster.reset(wi, hi, PixelRaster.argb(StateLook.PANEL));
    if (history == null || rows.isEmpty()) {
      g.drawImage(raster.image(), 0, 0);
      return;
    }
    long count = history.rowCount();
    int pw = Math.max(10, wi - (int) LEFT - (int) RIGHT);
    int cols = pw;
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
    timeGrid(t0, t1, pw, hi);
    for (int i = 0; i < rows.size(); i++) {
      TrendReduction r = reductions[i];
      r.reduce(history, rows.get(i), t0, t1, cols);
      double top = TOP + i * (rowH + ROW_GAP);
      rasterRow(i, rows.get(i), r, top, rowH, pw);
    }
    g.drawImage(raster.image(), 0, 0);
    for (int i = 0; i < rows.size(); i++) {
      rowText(g, i, rows.get(i), pw);
    }
    timeAxisText(g, t0, t1, pw, h);
    if (count == 0) {
      g.setFill(StateLook.AXIS_TEXT);
      g.setFont(labelFont);
      g.setTextAlign(TextAlignment.CENTER);
      g.setTextBaseline(VPos.CENTER);
      g.fillText("trends appear with the first pulses", LEFT + pw / 2.0, h / 2);
    }
  }

  /** Vertical range, plot top and height of each row, kept from the raster pass for the text. */
  private double[] rowLo = new double[0];

  private double[] rowHi = new double[0];
  private double[] rowTop = new double[0];
  private double[] rowPlotH = new double[0];

  private void rasterRow(int i, Parameter p, TrendReduction r, double top, double rh, int pw) {
    if (rowLo.length < rows.size()) {
      rowLo = new double[rows.size()];
      rowHi = new double[rows.size()];
      rowTop = new double[rows.size()];
      rowPlotH = new double[rows.size()];
    }
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
    rowLo[i] = lo;
    rowHi[i] = hi;
    rowTop[i] = plotTop;
    rowPlotH[i] = plotH;
    int left = (int) LEFT;
    int pt = (int) Math.round(plotTop);
    int pb = (int) Math.round(plotTop + plotH);
    raster.rect(left, pt, left + pw, pb, BG);

    // Allowed band and baseline; columns between pulses carry the baseline in force.
    int lastCol = -1;
    for (int c = 0; c < cols; c++) {
      if (r.hasPulses(c)) {
        lastCol = c;
      }
    }
    float b = Float.NaN;
    for (int c = 0; c < cols; c++) {
      if (!Float.isNaN(r.baseline(c))) {
        b = r.baseline(c);
      } else if (r.hasPulses(c)) {
        b = Float.NaN;
      }
      if (Float.isNaN(b) || c > lastCol) {
        continue;
      }
      double half = allowed(b, pct, abs);
      if (Double.isFinite(half)) {
        raster.span(
            left + c,
            py(b + half, lo, hi, plotTop, plotH),
            py(b - half, lo, hi, plotTop, plotH),
            pt,
            pb,
            BAND);
      }
      if (c % 5 < 2) {
        raster.span(
            left + c, py(b, lo, hi, plotTop, plotH), py(b, lo, hi, plotTop, plotH), pt, pb, BASE);
      }
    }
    if (lim != null) {
      for (double v : new double[] {lim.max(), lim.min()}) {
        if (Double.isFinite(v) && v >= lo && v <= hi) {
          int yy = py(v, lo, hi, plotTop, plotH);
          raster.dashed(left, left + pw, yy, 8, 4, LIM);
          raster.dashed(left, left + pw, yy + 1, 8, 4, LIM);
        }
      }
    }

    // Values: per column a span from min to max, joined to the previous column's value unless a
    // rejected pulse or a silence longer than the no-signal timeout lies between.
    double joinS = criteria == null ? 5 : criteria.noPulseTimeoutS();
    double sPerCol = (lastT1 - lastT0) / Math.max(1, cols);
    int prev = -1;
    int prevY = 0;
    int filled = 0;
    for (int k = 0; k < cols; k++) {
      if (r.rejected(k) > 0) {
        prev = -1;
        int yc = (int) (top + marks / 2);
        for (int d = -3; d <= 3; d++) {
          raster.span(left + k + d, yc + d, yc + d, 0, raster.height(), REJ);
          raster.span(left + k + d, yc - d, yc - d, 0, raster.height(), REJ);
        }
      }
      float mn = r.min(k);
      if (Float.isNaN(mn)) {
        continue;
      }
      filled++;
      int yMin = py(mn, lo, hi, plotTop, plotH);
      int yMax = py(r.max(k), lo, hi, plotTop, plotH);
      int yMid = (yMin + yMax) / 2;
      if (prev >= 0 && (k - prev) * sPerCol <= joinS) {
        // A straight join across the empty columns between.
        int last = prevY;
        for (int x = prev + 1; x < k; x++) {
          int yy = prevY + (int) Math.round((double) (yMid - prevY) * (x - prev) / (k - prev));
          raster.span(left + x, last, yy, pt, pb, DATA);
          last = yy;
        }
        raster.span(left + k, Math.min(yMax, last), Math.max(yMin, last), pt, pb, DATA);
      } else {
        raster.span(left + k, yMax, yMin, pt, pb, DATA);
      }
      prev = k;
      prevY = yMid;
    }
    if (filled > 0 && filled * 4 < cols) {
      // Sparse (a short session or a close zoom): mark each pulse too.
      for (int k = 0; k < cols; k++) {
        if (!Float.isNaN(r.min(k))) {
          int yy = py(r.min(k), lo, hi, plotTop, plotH);
          raster.rect(left + k - 2, yy - 2, left + k + 3, yy + 3, DATA);
        }
      }
    }

    // Health state along the time axis: colour and height by state.
    int stripTop = pb + 1;
    for (int k = 0; k < cols; k++) {
      if (r.hasPulses(k)) {
        HealthState st = r.worstState(k);
        raster.rect(
            left + k,
            stripTop,
            left + k + 1,
            stripTop + (int) StateLook.stripHeight(st),
            STATE[st.ordinal()]);
      }
    }
    // Frame.
    raster.rect(left, pt, left + pw, pt + 1, GRIDC);
    raster.rect(left, pb - 1, left + pw, pb, GRIDC);
    raster.rect(left, pt, left + 1, pb, GRIDC);
    raster.rect(left + pw - 1, pt, left + pw, pb, GRIDC);
  }

  private void rowText(GraphicsContext g, int i, Parameter p, int pw) {
    double lo = rowLo[i];
    double hi = rowHi[i];
    double plotTop = rowTop[i];
    double plotH = rowPlotH[i];
    g.setFill(StateLook.TEXT);
    g.setFont(labelFont);
    g.setTextAlign(TextAlignment.LEFT);
    g.setTextBaseline(VPos.TOP);
    g.fillText(p.symbol(), 6, plotTop);
    g.setFont(tickFont);
    g.setFill(StateLook.AXIS_TEXT);
    g.fillText(p.unit(), 6, plotTop + 18);
    double step = Numbers.niceStep(hi - lo, 3);
    g.setTextAlign(TextAlignment.RIGHT);
    g.setTextBaseline(VPos.CENTER);
    for (double v = Math.ceil(lo / step) * step; v <= hi; v += step) {
      double yy = py(v, lo, hi, plotTop, plotH);
      g.fillText(Numbers.tick(v, step), LEFT - 6, yy);
    }
    ParameterLimits lim = criteria == null ? null : criteria.limits().get(p);
    if (lim != null) {
      g.setFill(StateLook.LIMIT);
      g.setTextBaseline(VPos.BOTTOM);
      limitText(g, lim.max(), "max", lo, hi, plotTop, plotH, pw);
      limitText(g, lim.min(), "min", lo, hi, plotTop, plotH, pw);
    }
  }

  private void limitText(
      GraphicsContext g,
      double v,
      String what,
      double lo,
      double hi,
      double top,
      double ph,
      int pw) {
    if (Double.isFinite(v) && v >= lo && v <= hi) {
      g.fillText(
          what + " " + Numbers.tick(v, Math.abs(v) >= 10 ? 1 : 0.1),
          LEFT + pw - 4,
          py(v, lo, hi, top, ph) - 1);
    }
  }

  private static final double[] TIME_STEPS = {
    1, 2, 5, 10, 15, 30, 60, 120, 300, 600, 900, 1800, 3600, 7200, 14400
  };

  private static double timeStep(double t0, double t1) {
    for (double s : TIME_STEPS) {
      if ((t1 - t0) / s <= 10) {
        return s;
      }
    }
    return TIME_STEPS[TIME_STEPS.length - 1];
  }

  private void timeGrid(double t0, double t1, int pw, int h) {
    double step = timeStep(t0, t1);
    int axisY = h - (int) BOTTOM + 2;
    for (double v = Math.ceil(t0 / step) * step; v <= t1; v += step) {
      int x = (int) Math.round(LEFT + (v - t0) / (t1 - t0) * pw);
      raster.span(x, (int) TOP, axisY, 0, h, GRIDC);
    }
  }

  private void timeAxisText(GraphicsContext g, double t0, double t1, int pw, double h) {
    double step = timeStep(t0, t1);
    g.setFont(tickFont);
    g.setFill(StateLook.AXIS_TEXT);
    g.setTextAlign(TextAlignment.CENTER);
    g.setTextBaseline(VPos.TOP);
    double axisY = h - BOTTOM + 2;
    for (double v = Math.ceil(t0 / step) * step; v <= t1; v += step) {
      double x = Math.round(LEFT + (v - t0) / (t1 - t0) * pw) + 0.5;
      g.fillText(Numbers.clock(v), x, axisY + 2);
    }
    g.setTextAlign(TextAlignment.LEFT);
    g.fillText("recording time", 6, axisY + 2);
  }

  private static int py(double v, double lo, double hi, double top, double ph) {
    return (int) Math.round(top + (hi - v) / (hi - lo) * ph);
  }

  /** Smallest vertical span worth showing, so that noise is not blown up to the strip's height. */
  private static double minimumSpan(Parameter p, double mid) {
    double floor =
        switch (p) {
          case ACCESS_RESISTANCE -> 2;
          case INPUT_RESISTANCE, TOTAL_RESISTANCE -> 40;
          case MEMBRANE_CAPACITANCE, CHARGE_CAPACITANCE -> 4;
          case TIME_CONSTANT, FAST_TIME_CONSTANT, SLOW_TIME_CONSTANT -> 0.05;
          case HOLDING_CURRENT -> 20;
          case RESTING_POTENTIAL -> 4;
          case FAST_AMPLITUDE, SLOW_AMPLITUDE -> 20;
        };
    return Math.max(floor, 0.05 * Math.abs(mid));
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
}
