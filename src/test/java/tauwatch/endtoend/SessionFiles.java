package tauwatch.endtoend;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.stream.Stream;
import tauwatch.cli.Main;

/** Runs the command line in-process and reads back the session folder it wrote. */
final class SessionFiles {
  final int exitCode;
  final String out;
  final String err;
  final Path dir;

  private SessionFiles(int exitCode, String out, String err, Path dir) {
    this.exitCode = exitCode;
    this.out = out;
    this.err = err;
    this.dir = dir;
  }

  static SessionFiles run(Path logDir, String... args) throws IOException {
    StringWriter out = new StringWriter();
    StringWriter err = new StringWriter();
    String[] all = Arrays.copyOf(args, args.length + 2);
    all[args.length] = "--log-dir";
    all[args.length + 1] = logDir.toString();
    int code = Main.run(all, new PrintWriter(out, true), new PrintWriter(err, true));
    Path dir;
    try (Stream<Path> s = Files.list(logDir)) {
      dir = s.filter(Files::isDirectory).sorted().reduce((a, b) -> b).orElse(null);
    }
    return new SessionFiles(code, out.toString(), err.toString(), dir);
  }

  /** Rows of a CSV in the session folder as maps from column to cell (no quoted commas used). */
  List<Map<String, String>> csv(String name) throws IOException {
    List<String> lines = Files.readAllLines(dir.resolve(name));
    String[] header = lines.get(0).split(",", -1);
    List<Map<String, String>> rows = new ArrayList<>();
    for (String line : lines.subList(1, lines.size())) {
      String[] cells = splitCsv(line);
      Map<String, String> m = new HashMap<>();
      for (int i = 0; i < header.length; i++) {
        m.put(header[i], i < cells.length ? cells[i] : "");
      }
      rows.add(m);
    }
    return rows;
  }

  private static String[] splitCsv(String line) {
    List<String> cells = new ArrayList<>();
    StringBuilder cell = new StringBuilder();
    boolean quoted = false;
    for (int i = 0; i < line.length(); i++) {
      char c = line.charAt(i);
      if (quoted) {
        if (c == '"' && i + 1 < line.length() && line.charAt(i + 1) == '"') {
          cell.append('"');
          i++;
        } else if (c == '"') {
          quoted = false;
        } else {
          cell.append(c);
        }
      } else if (c == '"') {
        quoted = true;
      } else if (c == ',') {
        cells.add(cell.toString());
        cell.setLength(0);
      } else {
        cell.append(c);
      }
    }
    cells.add(cell.toString());
    return cells.toArray(new String[0]);
  }

  List<Map<String, String>> events(String kind) throws IOException {
    return csv("events.csv").stream().filter(e -> e.get("kind").equals(kind)).toList();
  }

  String sessionJson() throws IOException {
    return Files.readString(dir.resolve("session.json"));
  }
}
