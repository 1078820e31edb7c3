package tauwatch.fit;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.Objects;
import tauwatch.pulse.PulseWindow;

/**
 * A voltage-clamp interchange CSV fixture ({@code t_s,cmd_mV,im_pA}) read from the test class path,
 * and the test pulses cut from it by the command's edges.
 *
 * <p>Test-side only: the real segmenter lives in {@code tauwatch.pulse} and is not used here, so
 * the estimator's tests do not depend on it.
 */
final class InterchangeTrace {
  final String name;
  final double[] tS;
  final double[] cmdMv;
  final double[] imPa;

  /** The clamp mode the header names; in current clamp cmdMv holds pA and imPa holds mV. */
  tauwatch.stream.ClampMode mode = tauwatch.stream.ClampMode.VOLTAGE_CLAMP;

  private InterchangeTrace(String name, double[] t, double[] cmd, double[] im) {
    this.name = name;
    this.tS = t;
    this.cmdMv = cmd;
    this.imPa = im;
  }

  static InterchangeTrace load(String resource) throws IOException {
    InputStream in =
        Objects.requireNonNull(
            InterchangeTrace.class.getResourceAsStream(resource), "missing fixture " + resource);
    List<double[]> rows = new ArrayList<>();
    tauwatch.stream.ClampMode mode = tauwatch.stream.ClampMode.VOLTAGE_CLAMP;
    try (BufferedReader r = new BufferedReader(new InputStreamReader(in, StandardCharsets.UTF_8))) {
      String header = r.readLine();
      if ("t_s,cmd_pA,vm_mV".equals(header)) {
        mode = tauwatch.stream.ClampMode.CURRENT_CLAMP;
      } else if (!"t_s,cmd_mV,im_pA".equals(header)) {
        throw new IOException(
            resource + ":1: expected header t_s,cmd_mV,im_pA or t_s,cmd_pA,vm_mV, got " + header);
      }
      String line;
      int lineNo = 1;
      while ((line = r.readLine()) != null) {
        lineNo++;
        String[] f = line.split(",");
        if (f.length != 3) {
          throw new IOException(resource + ":" + lineNo + ": expected 3 fields");
        }
        rows.add(
            new double[] {
              Double.parseDouble(f[0]), Double.parseDouble(f[1]), Double.parseDouble(f[2])
            });
      }
    }
    int n = rows.size();
    double[] t = new double[n];
    double[] c = new double[n];
    double[] im = new double[n];
    for (int i = 0; i < n; i++) {
      t[i] = rows.get(i)[0];
      c[i] = rows.get(i)[1];
      im[i] = rows.get(i)[2];
    }
    InterchangeTrace trace = new InterchangeTrace(resource, t, c, im);
    trace.mode = mode;
    return trace;
  }

  /**
   * Cuts one window per step: from the midpoint of the preceding hold (or the trace's start) to the
   * midpoint of the following hold (or the end). Levels are read from the command channel.
   */
  List<PulseWindow> pulses(double filterCutoffHz) {
    double dt = (tS[tS.length - 1] - tS[0]) / (tS.length - 1);
    double hold = cmdMv[0];
    List<int[]> edges = new ArrayList<>();
    int on = -1;
    for (int i = 1; i < cmdMv.length; i++) {
      boolean was = Math.abs(cmdMv[i - 1] - hold) > 1e-6;
      boolean is = Math.abs(cmdMv[i] - hold) > 1e-6;
      if (is && !was) {
        on = i;
      } else if (!is && was && on >= 0) {
        edges.add(new int[] {on, i});
        on = -1;
      }
    }
    List<PulseWindow> out = new ArrayList<>();
    for (int p = 0; p < edges.size(); p++) {
      int onIdx = edges.get(p)[0];
      int offIdx = edges.get(p)[1];
      int from = p == 0 ? 0 : (edges.get(p - 1)[1] + onIdx) / 2;
      int to = p == edges.size() - 1 ? cmdMv.length - 1 : (offIdx + edges.get(p + 1)[0]) / 2;
      int n = to - from + 1;
      PulseWindow w = new PulseWindow(n);
      System.arraycopy(cmdMv, from, w.command, 0, n);
      System.arraycopy(imPa, from, w.response, 0, n);
      w.length = n;
      w.onsetIndex = onIdx - from;
      w.offsetIndex = offIdx - from;
      w.firstSampleIndex = from;
      w.sampleIntervalS = dt;
      w.streamStartS = tS[0];
      w.holdingLevel = hold;
      w.stepLevel = cmdMv[onIdx];
      w.filterCutoffHz = filterCutoffHz;
      w.pulseNumber = p + 1;
      w.mode = mode;
      out.add(w);
    }
    return out;
  }
}
