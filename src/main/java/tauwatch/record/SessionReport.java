package tauwatch.record;

import com.fasterxml.jackson.databind.JsonNode;
import java.awt.image.BufferedImage;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.PrintWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Base64;
import java.util.Iterator;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import javax.imageio.ImageIO;
import tauwatch.event.MonitorEvent;
import tauwatch.fit.Parameter;
import tauwatch.health.HealthCriteria;
import tauwatch.health.HealthState;
import tauwatch.health.TrendSummary;
import tauwatch.health.UsableSpan;
import tauwatch.health.UsableSpans;

/**
 * Writes the end-of-recording outputs of a session folder from its logs: {@code spans.csv}, one PNG
 * trend plot per parameter and {@code report.html}, a single self-contained file (images embedded
 * as base64) that opens in any browser.
 *
 * <p>Runs once after a session, off the live path; needs {@code java.awt.headless=true} on a
 * machine without a display (set by the caller before AWT loads).
 */
public final class SessionReport {
  /** The parameters plotted and summarised, in report order. */
  public static final Parameter[] PLOTTED = {
    Parameter.ACCESS_RESISTANCE,
    Parameter.INPUT_RESISTANCE,
    Parameter.MEMBRANE_CAPACITANCE,
    Parameter.TIME_CONSTANT,
    Parameter.HOLDING_CURRENT
  };

  public static final String SPANS_HEADER =
      "span,start_time_iso,start_t_s,end_time_iso,end_t_s,duration_s,first_pulse,last_pulse,"
          + "pulses,end_reason";

  private final SessionLogs logs;
  private final List<UsableSpan> spans;
  private final List<TrendSummary> summaries = new ArrayList<>();

  public SessionReport(SessionLogs logs) {
    this.logs = logs;
    this.spans = UsableSpans.find(logs.pulses(), logs.events(), noPulseTimeoutS(logs.session()));
    for (Parameter p : PLOTTED) {
      TrendSummary s = TrendSummary.of(p, logs.pulses(), logs.events());
      if (s != null) {
        summaries.add(s);
      }
    }
  }

  public List<UsableSpan> spans() {
    return spans;
  }

  public List<TrendSummary> summaries() {
    return summaries;
  }

  /** Writes spans.csv, the PNGs and report.html into the session folder; returns the HTML path. */
  public Path write() throws IOException {
    Path dir = logs.dir();
    writeSpans(dir.resolve("spans.csv"));
    StringBuilder html = new StringBuilder(1 << 16);
    html.append("<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\">\n<title>")
        .append(esc("Tauwatch session " + dir.getFileName()))
        .append("</title>\n<style>body{font-family:sans-serif;margin:24px;max-width:1000px}")
        .append("table{border-collapse:collapse;margin:8px 0 20px}td,th{border:1px solid #ccc;")
        .append("padding:3px 8px;font-size:13px;text-align:left}th{background:#f2f2f2}")
        .append(
            "img{display:block;margin:6px 0 14px;border:1px solid #ddd}</style>\n</head><body>\n");
    html.append("<h1>Tauwatch session report</h1>\n<p>")
        .append(esc(dir.getFileName().toString()))
        .append(". Tauwatch observes; its figures are aids to judgement, not a replacement for the")
        .append(" lab's own inclusion criteria.</p>\n");
    metadata(html);
    html.append("<h2>Usable spans</h2>\n<table id=\"spans\"><tr><th>#</th><th>start</th>")
        .append("<th>end</th><th>duration</th><th>pulses</th>")
        .append(logs.hasSweeps() ? "<th>sweeps</th>" : "")
        .append("<th>ended by</th></tr>\n");
    int i = 1;
    for (UsableSpan s : spans) {
      html.append(
          String.format(
              Locale.ROOT,
              "<tr><td>%d</td><td>%.1f s (%s)</td><td>%.1f s (%s)</td><td>%.1f s</td><td>%d</td>",
              i++,
              s.startS(),
              esc(s.startIso()),
              s.endS(),
              esc(s.endIso()),
              s.durationS(),
              s.pulses()));
      if (logs.hasSweeps()) {
        html.append("<td>")
            .append(s.firstSweep())
            .append("–")
            .append(s.lastSweep())
            .append("</td>");
      }
      html.append("<td>").append(esc(s.endReason())).append("</td></tr>\n");
    }
    html.append("</table>\n<h2>Summary</h2>\n");
    summaryTable(html);
    html.append("<h2>Trends</h2>\n");
    Map<String, double[]> limits = limits(logs.session());
    for (TrendSummary s : summaries) {
      Parameter p = s.parameter();
      double[] l =
          limits.getOrDefault(
              p.key(), new double[] {Double.NaN, Double.NaN, Double.NaN, Double.NaN});
      BufferedImage img = TrendPlot.draw(p, logs.pulses(), logs.events(), spans, s.baseline(), l);
      ByteArrayOutputStream png = new ByteArrayOutputStream();
      ImageIO.write(img, "png", png);
      Files.write(dir.resolve(p.key() + ".png"), png.toByteArray());
      html.append("<img alt=\"")
          .append(esc(p.description()))
          .append("\" width=\"")
          .append(TrendPlot.WIDTH)
          .append("\" src=\"data:image/png;base64,")
          .append(Base64.getEncoder().encodeToString(png.toByteArray()))
          .append("\">\n");
    }
    html.append("<h2>Events</h2>\n<table id=\"events\"><tr><th>time</th><th>t (s)</th>")
        .append("<th>kind</th><th>detail</th></tr>\n");
    for (MonitorEvent e : logs.events()) {
      html.append("<tr><td>")
          .append(java.time.Instant.ofEpochMilli(e.wallMillis()))
          .append("</td><td>")
          .append(
              Double.isNaN(e.streamTimeS())
                  ? ""
                  : String.format(Locale.ROOT, "%.2f", e.streamTimeS()))
          .append("</td><td>")
          .append(esc(e.kind().code()))
          .append("</td><td>")
          .append(esc(e.detail()))
          .append("</td></tr>\n");
    }
    html.append("</table>\n</body></html>\n");
    Path out = dir.resolve("report.html");
    Files.writeString(out, html, StandardCharsets.UTF_8);
    return out;
  }

  private void writeSpans(Path f) throws IOException {
    try (PrintWriter w = new PrintWriter(Files.newBufferedWriter(f, StandardCharsets.UTF_8))) {
      w.print(SPANS_HEADER);
      w.print(logs.hasSweeps() ? ",first_sweep,last_sweep\n" : "\n");
      int i = 1;
      for (UsableSpan s : spans) {
        w.print(i++ + "," + s.startIso() + "," + CsvText.fixed(s.startS(), 6) + "," + s.endIso());
        w.print("," + CsvText.fixed(s.endS(), 6) + "," + CsvText.fixed(s.durationS(), 3));
        w.print("," + s.firstPulse() + "," + s.lastPulse() + "," + s.pulses());
        w.print("," + CsvText.text(s.endReason()));
        if (logs.hasSweeps()) {
          w.print("," + (s.firstSweep() >= 0 ? s.firstSweep() : "") + ",");
          w.print(s.lastSweep() >= 0 ? Long.toString(s.lastSweep()) : "");
        }
        w.print('\n');
      }
    }
  }

  private void metadata(StringBuilder html) {
    JsonNode s = logs.session();
    html.append("<h2>Session</h2>\n<table id=\"session\">\n");
    if (s == null) {
      html.append("<tr><td>session.json</td><td>missing</td></tr>\n");
    } else {
      Iterator<Map.Entry<String, JsonNode>> it = s.fields();
      while (it.hasNext()) {
        Map.Entry<String, JsonNode> e = it.next();
        if (e.getKey().equals("configuration")) {
          continue; // long; the criteria show in the plots and the full file is beside the report
        }
        JsonNode v = e.getValue();
        html.append("<tr><th>")
            .append(esc(e.getKey()))
            .append("</th><td>")
            .append(esc(v.isValueNode() ? v.asText() : v.toString()))
            .append("</td></tr>\n");
      }
    }
    html.append("</table>\n");
  }

  private void summaryTable(StringBuilder html) {
    html.append("<table id=\"summary\"><tr><th>parameter</th><th>baseline</th><th>final</th>")
        .append("<th>min</th><th>max</th><th>change</th>");
    for (HealthState st : HealthState.values()) {
      html.append("<th>").append(st.label()).append("</th>");
    }
    html.append("</tr>\n");
    for (TrendSummary s : summaries) {
      html.append("<tr><td>")
          .append(esc(s.parameter().symbol() + " (" + s.parameter().unit() + ")"));
      html.append("</td>");
      for (double v : new double[] {s.baseline(), s.last(), s.min(), s.max()}) {
        html.append("<td>").append(num(v)).append("</td>");
      }
      html.append("<td>")
          .append(
              Double.isNaN(s.changePercent())
                  ? ""
                  : String.format(Locale.ROOT, "%+.1f %%", s.changePercent()))
          .append("</td>");
      for (double sec : s.secondsInState()) {
        html.append(String.format(Locale.ROOT, "<td>%.1f s</td>", sec));
      }
      html.append("</tr>\n");
    }
    html.append("</table>\n");
  }

  /** The summary table as console text. */
  public String summaryText() {
    StringBuilder sb = new StringBuilder();
    sb.append(
        String.format(
            Locale.ROOT,
            "  %-6s %10s %10s %10s %10s %8s   %s%n",
            "",
            "baseline",
            "final",
            "min",
            "max",
            "change",
            "time steady/drifting/breach/no signal"));
    for (TrendSummary s : summaries) {
      double[] t = s.secondsInState();
      sb.append(
          String.format(
              Locale.ROOT,
              "  %-6s %10s %10s %10s %10s %8s   %.0f/%.0f/%.0f/%.0f s  %s%n",
              s.parameter().symbol(),
              cell(s.baseline(), "%.4g"),
              cell(s.last(), "%.4g"),
              cell(s.min(), "%.4g"),
              cell(s.max(), "%.4g"),
              cell(s.changePercent(), "%+.1f%%"),
              t[0],
              t[1],
              t[2],
              t[3],
              s.parameter().unit()));
    }
    return sb.toString();
  }

  /** A console cell: the value formatted, or a dash where there is none (no baseline yet). */
  private static String cell(double v, String format) {
    return Double.isNaN(v) ? "–" : String.format(Locale.ROOT, format, v);
  }

  /** The usable spans as console text. */
  public String spansText() {
    StringBuilder sb = new StringBuilder();
    if (spans.isEmpty()) {
      sb.append("  none\n");
    }
    int i = 1;
    for (UsableSpan s : spans) {
      sb.append(
          String.format(
              Locale.ROOT,
              "  %d: %.1f – %.1f s (%.1f s, pulses #%d–#%d%s), ended by %s%n",
              i++,
              s.startS(),
              s.endS(),
              s.durationS(),
              s.firstPulse(),
              s.lastPulse(),
              s.firstSweep() >= 0 ? ", sweeps " + s.firstSweep() + "–" + s.lastSweep() : "",
              s.endReason()));
    }
    return sb.toString();
  }

  private static String num(double v) {
    return Double.isNaN(v) ? "" : String.format(Locale.ROOT, "%.4g", v);
  }

  private static double noPulseTimeoutS(JsonNode session) {
    JsonNode n =
        session == null
            ? null
            : session.path("configuration").path("health").get("no_pulse_timeout_s");
    return n != null && n.isNumber() ? n.asDouble() : HealthCriteria.DEFAULT_NO_PULSE_TIMEOUT_S;
  }

  /** Limits per parameter key from session.json: min, max, max change %, max change. */
  private static Map<String, double[]> limits(JsonNode session) {
    Map<String, double[]> out = new java.util.HashMap<>();
    JsonNode lim = session == null ? null : session.path("configuration").get("limits");
    if (lim == null || !lim.isObject()) {
      return out;
    }
    Iterator<Map.Entry<String, JsonNode>> it = lim.fields();
    while (it.hasNext()) {
      Map.Entry<String, JsonNode> e = it.next();
      JsonNode t = e.getValue();
      out.put(
          e.getKey(),
          new double[] {
            t.has("min") ? t.get("min").asDouble() : Double.NaN,
            t.has("max") ? t.get("max").asDouble() : Double.NaN,
            t.has("max_change_percent") ? t.get("max_change_percent").asDouble() : Double.NaN,
            t.has("max_change") ? t.get("max_change").asDouble() : Double.NaN
          });
    }
    return out;
  }

  static String esc(String s) {
    return s.replace("&", "&amp;")
        .replace("<", "&lt;")
        .replace(">", "&gt;")
        .replace("\"", "&quot;");
  }
}
