package tauwatch.record;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Font;
import java.awt.Graphics2D;
import java.awt.RenderingHints;
import java.awt.image.BufferedImage;
import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import tauwatch.event.EventKind;
import tauwatch.event.MonitorEvent;
import tauwatch.fit.Parameter;
import tauwatch.health.HealthState;
import tauwatch.health.LoggedPulse;
import tauwatch.health.TrendSummary;
import tauwatch.health.UsableSpan;

/**
 * Draws one parameter's trend over a session with Java2D: values, baseline, limits, usable spans,
 * drifting and breach stretches, marks, alarms and change points.
 *
 * <p>Stateless; runs headless ({@code java.awt.headless=true}); allocates an image per call.
 */
final class TrendPlot {
  static final int WIDTH = 960;
  static final int HEIGHT = 250;
  private static final int LEFT = 70;
  private static final int RIGHT = 16;
  private static final int TOP = 24;
  private static final int BOTTOM = 34;
  private static final Pattern SINCE = Pattern.compile("since pulse #\\d+, t = ([0-9.]+) s");

  private TrendPlot() {}

  /**
   * @param limits min, max, max change percent, max change (NaN for none)
   */
  static BufferedImage draw(
      Parameter p,
      List<LoggedPulse> pulses,
      List<MonitorEvent> events,
      List<UsableSpan> spans,
      double baseline,
      double[] limits) {
    BufferedImage img = new BufferedImage(WIDTH, HEIGHT, BufferedImage.TYPE_INT_RGB);
    Graphics2D g = img.createGraphics();
    g.setRenderingHint(RenderingHints.KEY_ANTIALIASING, RenderingHints.VALUE_ANTIALIAS_ON);
    g.setRenderingHint(
        RenderingHints.KEY_TEXT_ANTIALIASING, RenderingHints.VALUE_TEXT_ANTIALIAS_ON);
    g.setColor(Color.WHITE);
    g.fillRect(0, 0, WIDTH, HEIGHT);
    double t0 = Double.POSITIVE_INFINITY;
    double t1 = Double.NEGATIVE_INFINITY;
    double lo = Double.POSITIVE_INFINITY;
    double hi = Double.NEGATIVE_INFINITY;
    for (LoggedPulse r : pulses) {
      t0 = Math.min(t0, r.streamTimeS());
      t1 = Math.max(t1, r.streamTimeS());
      double v = r.values()[p.ordinal()];
      if (r.accepted() && !Double.isNaN(v)) {
        lo = Math.min(lo, v);
        hi = Math.max(hi, v);
      }
    }
    if (!(t1 > t0)) {
      t1 = t0 + 1;
    }
    double[] lines = limitLines(baseline, limits);
    double span = Math.max(hi - lo, 1e-9 + 0.02 * Math.abs(hi));
    for (double y : lines) {
      // Show a limit when it is near the data; a far one would flatten the trend.
      if (!Double.isNaN(y) && y > lo - 1.5 * span && y < hi + 1.5 * span) {
        lo = Math.min(lo, y);
        hi = Math.max(hi, y);
      }
    }
    if (!Double.isNaN(baseline)) {
      lo = Math.min(lo, baseline);
      hi = Math.max(hi, baseline);
    }
    // Show at least ±10 % around the middle, so that a steady parameter's noise is not blown up to
    // the plot's height and read as a change.
    double mid = 0.5 * (lo + hi);
    double half = Math.max(0.5 * (hi - lo), 0.10 * Math.abs(mid));
    if (!(half > 0)) {
      half = 0.5;
    }
    lo = Math.min(lo, mid - half);
    hi = Math.max(hi, mid + half);
    double pad = 0.08 * (hi - lo);
    Axes a = new Axes(t0, t1, lo - pad, hi + pad);

    // Usable spans: a green band along the bottom edge and a light background.
    for (UsableSpan s : spans) {
      int x0 = a.x(s.startS());
      int x1 = Math.max(x0 + 1, a.x(s.endS()));
      g.setColor(new Color(226, 244, 226));
      g.fillRect(x0, TOP, x1 - x0, HEIGHT - TOP - BOTTOM);
    }
    // This parameter's drifting and breach stretches.
    List<TrendSummary.StateChange> ch = TrendSummary.changes(p, events);
    for (int i = 0; i < ch.size(); i++) {
      HealthState st = ch.get(i).state();
      double from = ch.get(i).streamTimeS();
      double to = i + 1 < ch.size() ? ch.get(i + 1).streamTimeS() : t1;
      Color c =
          st == HealthState.BREACH
              ? new Color(250, 214, 214)
              : st == HealthState.DRIFTING ? new Color(253, 236, 200) : null;
      if (c != null) {
        g.setColor(c);
        g.fillRect(a.x(from), TOP, Math.max(1, a.x(to) - a.x(from)), 10);
      }
    }
    // Frame and grid.
    g.setColor(new Color(200, 200, 200));
    g.drawRect(LEFT, TOP, WIDTH - LEFT - RIGHT, HEIGHT - TOP - BOTTOM);
    g.setFont(new Font(Font.SANS_SERIF, Font.PLAIN, 11));
    double yStep = AxisTicks.step(a.y0, a.y1, 5);
    for (double y : AxisTicks.ticks(a.y0, a.y1, 5)) {
      int py = a.y(y);
      g.setColor(new Color(235, 235, 235));
      g.drawLine(LEFT + 1, py, WIDTH - RIGHT - 1, py);
      g.setColor(Color.DARK_GRAY);
      g.drawString(AxisTicks.label(y, yStep), 6, py + 4);
    }
    // Long recordings read better in minutes.
    boolean minutes = a.t1 - a.t0 > 1200;
    double unit = minutes ? 60 : 1;
    double tStep = AxisTicks.step(a.t0 / unit, a.t1 / unit, 8);
    for (double tu : AxisTicks.ticks(a.t0 / unit, a.t1 / unit, 8)) {
      String text = AxisTicks.label(tu, tStep) + (minutes ? " min" : " s");
      int x = a.x(tu * unit);
      g.drawString(text, x - g.getFontMetrics().stringWidth(text) / 2, HEIGHT - BOTTOM + 16);
    }
    // Limits and baseline.
    g.setStroke(
        new BasicStroke(
            1.2f, BasicStroke.CAP_BUTT, BasicStroke.JOIN_MITER, 1, new float[] {6, 4}, 0));
    for (double y : lines) {
      if (!Double.isNaN(y) && y >= a.y0 && y <= a.y1) {
        g.setColor(new Color(200, 40, 40));
        g.drawLine(LEFT, a.y(y), WIDTH - RIGHT, a.y(y));
      }
    }
    if (!Double.isNaN(baseline)) {
      g.setColor(new Color(90, 90, 90));
      g.drawLine(LEFT, a.y(baseline), WIDTH - RIGHT, a.y(baseline));
    }
    // Marks, alarms, change points.
    for (MonitorEvent e : events) {
      if (Double.isNaN(e.streamTimeS())) {
        continue;
      }
      if (e.kind() == EventKind.MARK) {
        g.setColor(new Color(80, 80, 200));
        g.drawLine(a.x(e.streamTimeS()), TOP, a.x(e.streamTimeS()), HEIGHT - BOTTOM);
        g.drawString(e.detail(), a.x(e.streamTimeS()) + 3, TOP + 22);
      } else if (e.kind() == EventKind.ALARM && e.detail().startsWith(p.description() + " ")) {
        g.setStroke(new BasicStroke(2f));
        g.setColor(new Color(200, 0, 0));
        g.drawLine(a.x(e.streamTimeS()), TOP, a.x(e.streamTimeS()), HEIGHT - BOTTOM);
        g.drawString("alarm", a.x(e.streamTimeS()) + 3, TOP + 34);
      } else if (e.kind() == EventKind.STATE_CHANGE
          && e.detail().startsWith(p.key() + " ")
          && e.detail().contains("-> drifting")) {
        Matcher m = SINCE.matcher(e.detail());
        if (m.find()) {
          double cp = Double.parseDouble(m.group(1));
          g.setStroke(new BasicStroke(1.5f));
          g.setColor(new Color(230, 140, 0));
          g.drawLine(a.x(cp), TOP, a.x(cp), HEIGHT - BOTTOM);
          g.drawString("change began", a.x(cp) + 3, TOP + 46);
        }
      }
    }
    // Rejected pulses: grey crosses where they would lie, so a gap in the trace has its reason.
    g.setStroke(new BasicStroke(1f));
    g.setColor(new Color(150, 150, 150));
    for (LoggedPulse r : pulses) {
      double v = r.values()[p.ordinal()];
      if (!r.accepted() && !Double.isNaN(v) && v >= a.y0 && v <= a.y1) {
        int x = a.x(r.streamTimeS());
        int y = a.y(v);
        g.drawLine(x - 3, y - 3, x + 3, y + 3);
        g.drawLine(x - 3, y + 3, x + 3, y - 3);
      }
    }
    // Values.
    g.setStroke(new BasicStroke(1.3f));
    g.setColor(new Color(20, 60, 140));
    int px = -1;
    int py = -1;
    for (LoggedPulse r : pulses) {
      double v = r.values()[p.ordinal()];
      if (!r.accepted() || Double.isNaN(v)) {
        continue;
      }
      int x = a.x(r.streamTimeS());
      int y = a.y(v);
      if (px >= 0) {
        g.drawLine(px, py, x, y);
      } else {
        g.fillRect(x - 1, y - 1, 3, 3);
      }
      px = x;
      py = y;
    }
    g.setColor(Color.BLACK);
    g.setFont(new Font(Font.SANS_SERIF, Font.BOLD, 13));
    g.drawString(p.description() + " (" + p.symbol() + ", " + p.unit() + ")", LEFT, 16);
    g.setFont(new Font(Font.SANS_SERIF, Font.PLAIN, 11));
    String legend =
        "green: usable · orange: drifting · red: breach · grey dashes: baseline · red dashes:"
            + " limits · x: rejected";
    g.drawString(legend, WIDTH - RIGHT - g.getFontMetrics().stringWidth(legend), 16);
    g.dispose();
    return img;
  }

  /** Horizontal lines for the absolute and relative limits. */
  private static double[] limitLines(double b, double[] l) {
    double pct = l[2];
    double abs = l[3];
    return new double[] {
      l[0],
      l[1],
      Double.isNaN(pct) || Double.isNaN(b) ? Double.NaN : b + Math.abs(b) * pct / 100,
      Double.isNaN(pct) || Double.isNaN(b) ? Double.NaN : b - Math.abs(b) * pct / 100,
      Double.isNaN(abs) || Double.isNaN(b) ? Double.NaN : b + abs,
      Double.isNaN(abs) || Double.isNaN(b) ? Double.NaN : b - abs
    };
  }

  private static final class Axes {
    final double t0;
    final double t1;
    final double y0;
    final double y1;

    Axes(double t0, double t1, double y0, double y1) {
      this.t0 = t0;
      this.t1 = t1;
      this.y0 = y0;
      this.y1 = y1;
    }

    int x(double t) {
      return LEFT + (int) Math.round((t - t0) / (t1 - t0) * (WIDTH - LEFT - RIGHT));
    }

    int y(double v) {
      return HEIGHT - BOTTOM - (int) Math.round((v - y0) / (y1 - y0) * (HEIGHT - TOP - BOTTOM));
    }
  }
}
