package tauwatch.record;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.BufferedReader;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.time.format.DateTimeParseException;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import tauwatch.event.EventKind;
import tauwatch.event.MonitorEvent;
import tauwatch.fit.Parameter;
import tauwatch.health.HealthState;
import tauwatch.health.LoggedPulse;

/**
 * A session folder's logs read back: {@code params.csv}, {@code events.csv} and {@code
 * session.json}.
 *
 * <p>Immutable once read; read once, off the live path. Malformed input raises a {@link
 * LogFormatException} whose message names the file and line.
 */
public final class SessionLogs {
  private final Path dir;
  private final List<LoggedPulse> pulses;
  private final List<MonitorEvent> events;
  private final JsonNode session;
  private final boolean sweeps;

  private SessionLogs(
      Path dir,
      List<LoggedPulse> pulses,
      List<MonitorEvent> events,
      JsonNode session,
      boolean sweeps) {
    this.dir = dir;
    this.pulses = pulses;
    this.events = events;
    this.session = session;
    this.sweeps = sweeps;
  }

  public static SessionLogs read(Path dir) throws IOException {
    if (!Files.isDirectory(dir)) {
      throw new LogFormatException(dir + ": no such session folder");
    }
    Path params = dir.resolve("params.csv");
    Path eventsFile = dir.resolve("events.csv");
    Path info = dir.resolve("session.json");
    for (Path f : new Path[] {params, eventsFile}) {
      if (!Files.isRegularFile(f)) {
        throw new LogFormatException(f + ": missing");
      }
    }
    JsonNode session = null;
    if (Files.isRegularFile(info)) {
      try {
        session = new ObjectMapper().readTree(info.toFile());
      } catch (IOException e) {
        throw new LogFormatException(info + ": not valid JSON: " + firstLine(e.getMessage()));
      }
    }
    List<LoggedPulse> pulses = new ArrayList<>();
    boolean[] sweeps = new boolean[1];
    readParams(params, pulses, sweeps);
    List<MonitorEvent> events = readEvents(eventsFile);
    return new SessionLogs(dir, List.copyOf(pulses), List.copyOf(events), session, sweeps[0]);
  }

  private static void readParams(Path f, List<LoggedPulse> out, boolean[] sweeps)
      throws IOException {
    try (BufferedReader r = Files.newBufferedReader(f, StandardCharsets.UTF_8)) {
      String header = r.readLine();
      if (header == null) {
        throw new LogFormatException(f + " line 1: empty file, expected a header");
      }
      List<String> cols = CsvText.split(header);
      Map<String, Integer> at = new HashMap<>();
      for (int i = 0; i < cols.size(); i++) {
        at.put(cols.get(i), i);
      }
      for (String need : new String[] {"time_iso", "t_s", "pulse", "accepted", "state"}) {
        if (!at.containsKey(need)) {
          throw new LogFormatException(f + " line 1: no column '" + need + "'");
        }
      }
      Parameter[] ps = Parameter.values();
      int[] valueCol = new int[ps.length];
      for (Parameter p : ps) {
        Integer c =
            p == Parameter.CHARGE_CAPACITANCE ? at.get("cmq_pf") : at.get(ParamsLog.columnName(p));
        valueCol[p.ordinal()] = c == null ? -1 : c;
      }
      Integer sweepCol = at.get("sweep");
      Integer alarmCol = at.get("alarms");
      sweeps[0] = sweepCol != null;
      String line;
      int n = 1;
      while ((line = r.readLine()) != null) {
        n++;
        if (line.isBlank()) {
          continue;
        }
        List<String> c = CsvText.split(line);
        String where = f + " line " + n;
        if (c.size() < cols.size()) {
          throw new LogFormatException(
              where + ": " + c.size() + " fields, header has " + cols.size());
        }
        double[] values = new double[ps.length];
        Arrays.fill(values, Double.NaN);
        for (Parameter p : ps) {
          int i = valueCol[p.ordinal()];
          if (i >= 0) {
            values[p.ordinal()] = number(c.get(i), where, cols.get(i));
          }
        }
        HealthState state = LoggedPulse.stateOf(c.get(at.get("state")));
        if (state == null) {
          throw new LogFormatException(where + ": unknown state '" + c.get(at.get("state")) + "'");
        }
        String acc = c.get(at.get("accepted"));
        if (!acc.equals("true") && !acc.equals("false")) {
          throw new LogFormatException(
              where + ": 'accepted' must be true or false, got '" + acc + "'");
        }
        double t = number(c.get(at.get("t_s")), where, "t_s");
        if (Double.isNaN(t)) {
          throw new LogFormatException(where + ": empty t_s");
        }
        long pulse;
        try {
          pulse = Long.parseLong(c.get(at.get("pulse")));
        } catch (NumberFormatException e) {
          throw new LogFormatException(where + ": 'pulse' is not a whole number");
        }
        long sweep = -1;
        if (sweepCol != null && !c.get(sweepCol).isEmpty()) {
          try {
            sweep = Long.parseLong(c.get(sweepCol));
          } catch (NumberFormatException e) {
            throw new LogFormatException(where + ": 'sweep' is not a whole number");
          }
        }
        out.add(
            new LoggedPulse(
                pulse,
                t,
                c.get(at.get("time_iso")),
                acc.equals("true"),
                state,
                alarmCol == null ? "" : c.get(alarmCol),
                sweep,
                values));
      }
    }
  }

  private static List<MonitorEvent> readEvents(Path f) throws IOException {
    List<MonitorEvent> out = new ArrayList<>();
    Map<String, EventKind> kinds = new HashMap<>();
    for (EventKind k : EventKind.values()) {
      kinds.put(k.code(), k);
    }
    try (BufferedReader r = Files.newBufferedReader(f, StandardCharsets.UTF_8)) {
      String header = r.readLine();
      if (header == null || !header.equals(EventLog.HEADER)) {
        throw new LogFormatException(f + " line 1: expected the header " + EventLog.HEADER);
      }
      String line;
      int n = 1;
      while ((line = r.readLine()) != null) {
        n++;
        if (line.isBlank()) {
          continue;
        }
        String where = f + " line " + n;
        List<String> c = CsvText.split(line);
        if (c.size() < 4) {
          throw new LogFormatException(where + ": " + c.size() + " fields, expected 4");
        }
        EventKind k = kinds.get(c.get(2));
        if (k == null) {
          throw new LogFormatException(where + ": unknown event kind '" + c.get(2) + "'");
        }
        long wall;
        try {
          wall = Instant.parse(c.get(0)).toEpochMilli();
        } catch (DateTimeParseException e) {
          throw new LogFormatException(where + ": bad time_iso '" + c.get(0) + "'");
        }
        out.add(new MonitorEvent(wall, number(c.get(1), where, "t_s"), k, c.get(3)));
      }
    }
    return out;
  }

  private static double number(String s, String where, String col) throws LogFormatException {
    if (s.isEmpty()) {
      return Double.NaN;
    }
    try {
      return Double.parseDouble(s);
    } catch (NumberFormatException e) {
      throw new LogFormatException(where + ": '" + col + "' is not a number: '" + s + "'");
    }
  }

  private static String firstLine(String s) {
    if (s == null) {
      return "";
    }
    int i = s.indexOf('\n');
    return i < 0 ? s : s.substring(0, i);
  }

  public Path dir() {
    return dir;
  }

  public List<LoggedPulse> pulses() {
    return pulses;
  }

  public List<MonitorEvent> events() {
    return events;
  }

  /** {@code session.json}, or null when the folder has none. */
  public JsonNode session() {
    return session;
  }

  public boolean hasSweeps() {
    return sweeps;
  }
}
