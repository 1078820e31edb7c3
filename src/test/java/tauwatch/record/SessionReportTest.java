package tauwatch.record;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Base64;
import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Stream;
import javax.imageio.ImageIO;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import tauwatch.cli.Main;

/**
 * Spans and the report from a recorded session: the Ra-creep scenario (Ra 10 MΩ to 120 s, then
 * linear to 20 MΩ at 480 s) run through the command line in-process, unpaced, for 300 s. With the
 * default rule (Ra within 20 % of baseline, common practice) the breach is due when Ra passes 12
 * MΩ: 120 s + 2/10 · 360 s = 192 s, plus the 3-pulse debounce.
 */
class SessionReportTest {
  @TempDir static Path logDir;
  static Path session;
  static String console;

  @BeforeAll
  static void recordASession() throws Exception {
    StringWriter out = new StringWriter();
    StringWriter err = new StringWriter();
    int code =
        Main.run(
            new String[] {
              "watch",
              "--headless",
              "--no-pacing",
              "--quiet",
              "--source",
              "sim:ra-creep",
              "--duration",
              "300s",
              "--log-dir",
              logDir.toString()
            },
            new PrintWriter(out),
            new PrintWriter(err));
    assertEquals(0, code, err.toString());
    console = out.toString();
    try (Stream<Path> s = Files.list(logDir)) {
      session = s.filter(Files::isDirectory).findFirst().orElseThrow();
    }
  }

  @Test
  void theCreepingCellHasOneUsableSpanEndingAtTheRaBreach() throws Exception {
    List<String> lines = Files.readAllLines(session.resolve("spans.csv"));
    assertEquals(SessionReport.SPANS_HEADER, lines.get(0));
    assertEquals(2, lines.size(), lines.toString());
    String[] c = lines.get(1).split(",");
    assertEquals(0.1, Double.parseDouble(c[2]), 1e-9);
    double end = Double.parseDouble(c[4]);
    // Ra crosses 12 MΩ near 192 s (noise ±0.05 MΩ ≈ ±2 s of ramp); the span ends before that.
    assertTrue(end > 188 && end < 196, "span ends at " + end);
    assertEquals("breach: ra", c[9]);
    assertTrue(console.contains("usable spans"), console);
    assertTrue(console.contains("ended by breach: ra"), console);
  }

  @Test
  void theReportIsOneFileWithTheEmbeddedPlotsTheSummaryAndTheEvents() throws Exception {
    String html = Files.readString(session.resolve("report.html"));
    assertTrue(html.startsWith("<!DOCTYPE html>") && html.trim().endsWith("</html>"));
    Matcher img = Pattern.compile("src=\"data:image/png;base64,([A-Za-z0-9+/=]+)\"").matcher(html);
    int images = 0;
    while (img.find()) {
      // Each embedded image decodes as a PNG of the plot's size.
      var decoded =
          ImageIO.read(new java.io.ByteArrayInputStream(Base64.getDecoder().decode(img.group(1))));
      assertEquals(TrendPlot.WIDTH, decoded.getWidth());
      images++;
    }
    assertEquals(5, images); // Ra, Rin, Cm, tau, holding current
    for (String key : new String[] {"ra", "rin", "cm", "tau", "hold"}) {
      assertTrue(Files.size(session.resolve(key + ".png")) > 1000, key);
    }
    String summary = section(html, "summary");
    assertEquals(6, count(summary, "<tr>")); // header + 5 parameters
    assertTrue(summary.contains("<td>Ra (MΩ)</td>"), summary);
    String events = section(html, "events");
    assertTrue(events.contains("alarm") && events.contains("since pulse #"), events);
    assertTrue(section(html, "session").contains("ra-creep"));
  }

  @Test
  void aMalformedParamsLineIsOneErrorNamingFileAndLine() throws Exception {
    Path bad = logDir.resolve("bad");
    Files.createDirectories(bad);
    List<String> params = Files.readAllLines(session.resolve("params.csv"));
    Files.write(bad.resolve("params.csv"), List.of(params.get(0), params.get(1), "2026,x,3"));
    Files.copy(session.resolve("events.csv"), bad.resolve("events.csv"));
    StringWriter err = new StringWriter();
    int code =
        Main.run(
            new String[] {"report", bad.toString()},
            new PrintWriter(new StringWriter()),
            new PrintWriter(err));
    assertEquals(Main.EXIT_BAD_INPUT, code);
    assertTrue(err.toString().contains(bad.resolve("params.csv") + " line 3:"), err.toString());
    assertEquals(1, err.toString().strip().split("\n").length, err.toString());
    StringWriter err2 = new StringWriter();
    assertEquals(
        Main.EXIT_BAD_INPUT,
        Main.run(
            new String[] {"report", logDir.resolve("nowhere").toString()},
            new PrintWriter(new StringWriter()),
            new PrintWriter(err2)));
    assertTrue(err2.toString().contains("no such session folder"), err2.toString());
  }

  private static String section(String html, String id) {
    int a = html.indexOf("<table id=\"" + id + "\">");
    assertTrue(a >= 0, id);
    return html.substring(a, html.indexOf("</table>", a));
  }

  private static int count(String s, String what) {
    int n = 0;
    for (int i = s.indexOf(what); i >= 0; i = s.indexOf(what, i + 1)) {
      n++;
    }
    return n;
  }
}
