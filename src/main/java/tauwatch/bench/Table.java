package tauwatch.bench;

import java.io.PrintWriter;
import java.util.ArrayList;
import java.util.List;

/**
 * A plain-text table with a title, printed with columns padded to their widest cell.
 *
 * <p>Single-threaded; built once per benchmark section.
 */
final class Table {
  private final String title;
  private final List<String[]> rows = new ArrayList<>();

  Table(String title, String... header) {
    this.title = title;
    rows.add(header);
  }

  Table row(String... cells) {
    rows.add(cells);
    return this;
  }

  void print(PrintWriter out) {
    int cols = rows.get(0).length;
    int[] width = new int[cols];
    for (String[] r : rows) {
      for (int c = 0; c < cols && c < r.length; c++) {
        width[c] = Math.max(width[c], r[c].length());
      }
    }
    out.println();
    out.println(title);
    for (int i = 0; i < rows.size(); i++) {
      StringBuilder sb = new StringBuilder("| ");
      String[] r = rows.get(i);
      for (int c = 0; c < cols; c++) {
        String cell = c < r.length ? r[c] : "";
        sb.append(cell).append(" ".repeat(width[c] - cell.length())).append(" | ");
      }
      out.println(sb.toString().stripTrailing());
      if (i == 0) {
        StringBuilder line = new StringBuilder("|");
        for (int c = 0; c < cols; c++) {
          line.append("-".repeat(width[c] + 2)).append('|');
        }
        out.println(line);
      }
    }
    out.flush();
  }
}
