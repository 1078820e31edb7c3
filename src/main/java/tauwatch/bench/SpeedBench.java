package tauwatch.bench;

import java.io.ByteArrayOutputStream;
import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.TimeUnit;
import tauwatch.bench.naive.NaiveEstimate;
import tauwatch.bench.naive.NaiveEstimator;
import tauwatch.bench.naive.NaiveFrameReader;
import tauwatch.bench.naive.NaivePipeline;
import tauwatch.bench.naive.NaivePulseFinder;
import tauwatch.bench.naive.Sample;
import tauwatch.fit.Parameter;
import tauwatch.fit.PulseEstimate;
import tauwatch.fit.VoltageClampEstimator;
import tauwatch.pulse.PulseSegmenter;
import tauwatch.pulse.PulseWindow;
import tauwatch.pulse.SegmenterOptions;
import tauwatch.sim.Scenario;
import tauwatch.sim.SimulatedRecording;
import tauwatch.sim.serve.ByteOutlet;
import tauwatch.sim.serve.SimulatedDaq;
import tauwatch.stream.SampleBlock;
import tauwatch.stream.SampleBlockHandler;
import tauwatch.stream.SampleRing;
import tauwatch.stream.StreamCounters;
import tauwatch.wire.DeviceProfile;
import tauwatch.wire.DeviceProfileLoader;
import tauwatch.wire.SampleFeed;
import tauwatch.wire.StreamDecoder;

/**
 * The throughput half of {@code tauwatch bench}: decoder, segmenter, per-pulse fit and the whole
 * chain in replay, each beside the naive pipeline ({@link tauwatch.bench.naive}) measured in the
 * same run.
 *
 * <p>Single-threaded driver (the chain runs its own threads); allocates freely. Figures are medians
 * of repeated rounds after warm-up rounds.
 */
public final class SpeedBench {
  /**
   * Tolerances the naive pipeline must meet against the product, per pulse (relative). They cover
   * what the naive fit does differently by design — group-delay filter correction instead of the
   * exact Bessel gain, a plain mean of the on and off sides instead of inverse-variance weights, a
   * different first fitted row — on the shipped steady cell (Ra 10 MΩ, Rm 300 MΩ, Cm 30 pF).
   */
  static final double RA_TOLERANCE = 0.03;

  static final double RIN_TOLERANCE = 0.03;
  static final double CM_TOLERANCE = 0.03;
  static final double TAU_TOLERANCE = 0.03;

  private final PrintWriter out;
  private final Path workDir;
  private final double chainSeconds;
  private final int rounds;

  /**
   * @param chainSeconds stream seconds in the whole-chain capture
   * @param rounds timed rounds per figure (the median is reported)
   */
  public SpeedBench(PrintWriter out, Path workDir, double chainSeconds, int rounds) {
    this.out = out;
    this.workDir = workDir;
    this.chainSeconds = chainSeconds;
    this.rounds = rounds;
  }

  /** Runs every throughput section; returns false if the naive pipeline disagreed. */
  public boolean run() throws Exception {
    return run(java.util.Set.of("decoder", "fit", "chain"));
  }

  /** Runs the named sections ({@code decoder}, {@code fit}, {@code chain}). */
  public boolean run(java.util.Set<String> sections) throws Exception {
    if (sections.contains("decoder")) {
      decoder();
    }
    boolean ok = true;
    if (sections.contains("fit")) {
      ok &= segmenterAndFit();
    }
    if (sections.contains("chain")) {
      ok &= chain();
    }
    return ok;
  }

  // ---------------------------------------------------------------- decoder

  void decoder() throws Exception {
    DeviceProfile profile = DeviceProfileLoader.loadBuiltIn("simulator");
    Scenario sc = BenchScenarios.load("steady-cell", profile.sampleRateHz(), 0, 0);
    byte[] stream = frames(sc, profile, 4.0);
    int samples = (int) Math.round(4.0 * profile.sampleRateHz());
    int chunk = 4096; // a socket read's worth

    SampleRing ring = new SampleRing(1024, SampleBlock.DEFAULT_CAPACITY, false, new Drain());
    ring.start();
    SampleFeed feed = new SampleFeed(profile, ring.writer());
    StreamDecoder decoder = profile.newDecoder(feed, new StreamCounters());
    double product =
        Repeats.medianSeconds(
            3,
            rounds,
            () -> {
              for (int off = 0; off < stream.length; off += chunk) {
                decoder.accept(stream, off, Math.min(chunk, stream.length - off));
              }
              ring.writer().flush();
              return ring.writer().nextSampleIndex();
            });
    ring.writer().endOfStream();
    ring.awaitDrainedAndStop(10, TimeUnit.SECONDS);

    double[] sum = {0};
    NaiveFrameReader naive = new NaiveFrameReader(profile, s -> sum[0] += s.responsePa());
    double naiveS =
        Repeats.medianSeconds(
            2,
            rounds,
            () -> {
              for (int off = 0; off < stream.length; off += chunk) {
                naive.accept(stream, off, Math.min(chunk, stream.length - off), 0);
              }
              return sum[0];
            });
    double channelSamples = 2.0 * samples;
    new Table(
            "Decoder: binary frames (simulator profile, int16 ×2, 50 samples/frame) → scaled"
                + " samples in the ring",
            "pipeline",
            "M samples/s (2 ch)",
            "ns per sample pair",
            "× naive")
        .row(
            "Tauwatch (FrameDecoder → SampleFeed → ring)",
            f1(channelSamples / product / 1e6),
            f1(product / samples * 1e9),
            f1(naiveS / product))
        .row(
            "naive (ByteBuffer, CRC32, new Sample per sample)",
            f1(channelSamples / naiveS / 1e6),
            f1(naiveS / samples * 1e9),
            "1.0")
        .print(out);
  }

  private static byte[] frames(Scenario sc, DeviceProfile profile, double seconds) {
    ByteArrayOutputStream bytes = new ByteArrayOutputStream();
    ByteOutlet outlet =
        new ByteOutlet() {
          @Override
          public boolean write(byte[] buf, int len) {
            bytes.write(buf, 0, len);
            return true;
          }

          @Override
          public void dropLink(long outageMs) {}

          @Override
          public String describe() {
            return "memory";
          }

          @Override
          public void close() {}
        };
    new SimulatedDaq(new SimulatedRecording(sc, 11), profile, List.of(), 1, outlet)
        .serve(seconds, false);
    return bytes.toByteArray();
  }

  /** A consumer that only takes blocks. */
  private static final class Drain implements SampleBlockHandler {
    long samples;

    @Override
    public void onBlock(SampleBlock block, long sequence, boolean endOfBatch) {
      samples += block.length;
    }
  }

  // ---------------------------------------------------------- segmenter, fit

  boolean segmenterAndFit() throws Exception {
    Table seg =
        new Table(
            "Pulse segmenter: µs of segmenting per pulse (one 500 ms pulse period of samples)",
            "rate",
            "Tauwatch µs/pulse",
            "ns/sample",
            "naive µs/pulse",
            "× naive");
    Table fit =
        new Table(
            "Per-pulse fit: µs per pulse (VC estimator, on + off transient)",
            "rate",
            "cell (model chosen)",
            "Tauwatch µs/pulse",
            "naive µs/pulse (mono, fixed start)",
            "× naive");
    double slowestUs = 0;
    for (double rate : new double[] {20_000, 50_000, 100_000}) {
      segmenterRow(seg, rate);
      slowestUs = Math.max(slowestUs, fitRow(fit, rate, "steady-cell"));
      slowestUs = Math.max(slowestUs, fitRow(fit, rate, "dendritic-cell"));
    }
    seg.print(out);
    fit.print(out);
    boolean ok = slowestUs < FIT_TARGET_US;
    out.printf(
        Locale.ROOT,
        "target: every per-pulse fit under %.0f µs %s (slowest %.0f µs)%n",
        FIT_TARGET_US,
        ok ? "met" : "MISSED",
        slowestUs);
    return ok;
  }

  /** DESIGN.md: per pulse, fitting must stay well under 1 ms. */
  static final double FIT_TARGET_US = 1000;

  private void segmenterRow(Table t, double rate) throws Exception {
    Scenario sc = BenchScenarios.load("steady-cell", rate, 0, 0);
    SimulatedRecording rec = new SimulatedRecording(sc, 3);
    int n = (int) Math.round(10.0 * rate); // 10 s: 20 pulses
    double[] cmd = new double[n];
    double[] resp = new double[n];
    rec.fill(cmd, resp, 0, n);
    SampleBlock[] blocks = new SampleBlock[(n + 255) / 256];
    for (int b = 0; b < blocks.length; b++) {
      SampleBlock blk = new SampleBlock(256);
      int len = Math.min(256, n - b * 256);
      System.arraycopy(cmd, b * 256, blk.command, 0, len);
      System.arraycopy(resp, b * 256, blk.response, 0, len);
      blk.length = len;
      blocks[b] = blk;
    }
    long[] pulses = {0};
    tauwatch.stream.StreamFormat format = rec.format();
    // 30 untimed rounds: the segmenter's loop is compiled (and OSR-replaced) in the first ones.
    double product =
        Repeats.medianSeconds(
            30,
            rounds,
            () -> {
              PulseSegmenter s =
                  new PulseSegmenter(
                      format, SegmenterOptions.defaults(), w -> pulses[0]++, e -> {});
              long index = 0;
              for (SampleBlock b : blocks) {
                b.firstSampleIndex = index;
                index += b.length;
                s.onBlock(b, 0, false);
              }
              return s.pulseCount();
            });
    List<Sample> objects = new ArrayList<>(n);
    for (int i = 0; i < n; i++) {
      objects.add(new Sample(i, cmd[i], resp[i], 0));
    }
    long[] naivePulses = {0};
    SegmenterOptions o = SegmenterOptions.defaults();
    double naive =
        Repeats.medianSeconds(
            10,
            rounds,
            () -> {
              NaivePulseFinder f =
                  new NaivePulseFinder(
                      rate,
                      o.edgeThreshold(),
                      o.baselineMs(),
                      o.maxStepMs(),
                      o.offWindowMs(),
                      null,
                      e -> naivePulses[0]++);
              for (Sample s : objects) {
                f.onSample(s);
              }
              return f.pulses();
            });
    int perRound = 20;
    t.row(
        khz(rate),
        f1(product / perRound * 1e6),
        f2(product / n * 1e9),
        f1(naive / perRound * 1e6),
        f1(naive / product));
  }

  /** Adds one row; returns the product's µs per pulse. */
  private double fitRow(Table t, double rate, String cell) throws Exception {
    Scenario sc = BenchScenarios.load(cell, rate, 0, 0);
    SimulatedPulseTrain train = new SimulatedPulseTrain(sc, 5, 3.0, 20.0);
    int distinct = 40;
    PulseWindow[] windows = new PulseWindow[distinct];
    List<List<Sample>> naiveWindows = new ArrayList<>();
    for (int i = 0; i < distinct; i++) {
      windows[i] = train.next();
      List<Sample> l = new ArrayList<>(windows[i].length);
      for (int k = 0; k < windows[i].length; k++) {
        l.add(
            new Sample(
                windows[i].firstSampleIndex + k, windows[i].command[k], windows[i].response[k], 0));
      }
      naiveWindows.add(l);
    }
    VoltageClampEstimator est = new VoltageClampEstimator();
    int[] bi = {0};
    for (PulseWindow w : windows) {
      if ("bi".equals(est.estimate(w).model())) {
        bi[0]++;
      }
    }
    double product =
        Repeats.medianSeconds(
            5,
            rounds,
            () -> {
              double s = 0;
              for (PulseWindow w : windows) {
                s += est.estimate(w).value(Parameter.ACCESS_RESISTANCE);
              }
              return s;
            });
    NaiveEstimator naive = new NaiveEstimator(sc.amplifier().filterCutoffHz());
    PulseWindow w0 = windows[0];
    double naiveS =
        Repeats.medianSeconds(
            2,
            rounds,
            () -> {
              double s = 0;
              for (int i = 0; i < distinct; i++) {
                s +=
                    naive
                        .estimate(
                            i,
                            naiveWindows.get(i),
                            w0.onsetIndex,
                            w0.offsetIndex,
                            w0.sampleIntervalS)
                        .raMOhm();
              }
              return s;
            });
    String model =
        bi[0] == distinct ? "two-exp" : bi[0] == 0 ? "mono" : bi[0] + "/" + distinct + " two-exp";
    t.row(
        khz(rate),
        cell + " (" + model + ")",
        f1(product / distinct * 1e6),
        f1(naiveS / distinct * 1e6),
        f1(naiveS / product));
    return product / distinct * 1e6;
  }

  // ------------------------------------------------------------ whole chain

  boolean chain() throws Exception {
    DeviceProfile profile = DeviceProfileLoader.loadBuiltIn("simulator");
    Scenario sc = BenchScenarios.load("steady-cell", profile.sampleRateHz(), 0, 0);
    Path capture = workDir.resolve("chain-capture.twc");
    BenchCapture.write(capture, sc, 21, profile, chainSeconds);
    long captureBytes = Files.size(capture);

    List<ChainReplay.Result> runs = new ArrayList<>();
    double[] productS = new double[rounds];
    int[] warmRound = {0};
    Repeats.WarmUp productWarm =
        Repeats.untilCompiled(
            CHAIN_MAX_WARM_UPS,
            () -> ChainReplay.run(capture, workDir.resolve("warm-up-" + warmRound[0]++)).seconds());
    for (int i = 0; i < rounds; i++) {
      ChainReplay.Result r = ChainReplay.run(capture, workDir.resolve("product-" + i));
      runs.add(r);
      productS[i] = r.seconds();
    }
    int naiveRounds = rounds; // as many as the product: its figure moves as much
    double[] naiveS = new double[naiveRounds];
    // Warm-up rounds for the naive pipeline too, by the same rule, so both columns are measured
    // warm (its rounds are ten times longer, so its compiler settles sooner).
    Repeats.WarmUp naiveWarm =
        Repeats.untilCompiled(
            CHAIN_MAX_WARM_UPS,
            () ->
                NaivePipeline.run(
                        capture, workDir.resolve("naive-warm-up-" + warmRound[0]++ + ".csv"))
                    .seconds());
    NaivePipeline.Result naive = null;
    for (int i = 0; i < naiveRounds; i++) {
      naive = NaivePipeline.run(capture, workDir.resolve("naive-params-" + i + ".csv"));
      naiveS[i] = naive.seconds();
    }
    ChainReplay.Result p = runs.get(0);
    double pMed = Repeats.median(productS);
    double nMed = Repeats.median(naiveS);
    long frames = p.monitor().samples();
    double pRate = 2.0 * frames / pMed;
    double nRate = 2.0 * naive.samples() / nMed;
    double realTime = 2.0 * profile.sampleRateHz();
    new Table(
            String.format(
                Locale.ROOT,
                "Whole chain in replay: raw capture (%.0f s of 2 ch at %.0f kHz, %.1f MB) →"
                    + " params.csv; median of %d runs after %s (naive: %d after %s)",
                chainSeconds,
                profile.sampleRateHz() / 1e3,
                captureBytes / 1e6,
                rounds,
                productWarm.describe(),
                naiveRounds,
                naiveWarm.describe()),
            "pipeline",
            "M samples/s (2 ch)",
            "× real time (2 ch, 50 kHz)",
            "pulses",
            "params rows",
            "× naive")
        .row(
            "Tauwatch",
            f1(pRate / 1e6),
            f0(pRate / realTime),
            Long.toString(p.monitor().pulses()),
            Long.toString(p.paramsRows()),
            f1(pRate / nRate))
        .row(
            "naive (object per sample, BlockingQueue, fixed-start LM)",
            f1(nRate / 1e6),
            f0(nRate / realTime),
            Long.toString(naive.pulses()),
            Long.toString(naive.pulses()),
            "1.0")
        .print(out);
    boolean fast = pRate >= CHAIN_TARGET_SAMPLES_PER_S;
    boolean faster = pRate >= CHAIN_TARGET_TIMES_NAIVE * nRate;
    out.printf(
        Locale.ROOT,
        "targets: ≥ %.0f M samples/s %s; ≥ %.0f× the naive pipeline %s%n",
        CHAIN_TARGET_SAMPLES_PER_S / 1e6,
        fast ? "met" : "MISSED",
        CHAIN_TARGET_TIMES_NAIVE,
        faster ? "met" : "MISSED");
    return agreement(p.estimates(), naive.estimates()) & fast & faster;
  }

  /** The whole-chain targets: 500× real time for 2 ch at 50 kHz, and 10× the naive. */
  static final double CHAIN_TARGET_SAMPLES_PER_S = 50e6;

  static final double CHAIN_TARGET_TIMES_NAIVE = 10;

  /** At most this many untimed rounds before the timed ones (see {@link Repeats#untilCompiled}). */
  static final int CHAIN_MAX_WARM_UPS = 25;

  /** The naive estimates agree with the product's pulse by pulse, within the stated tolerances. */
  private boolean agreement(List<PulseEstimate> product, List<NaiveEstimate> naive) {
    int n = Math.min(product.size(), naive.size());
    double[] worst = new double[4];
    int compared = 0;
    for (int i = 0; i < n; i++) {
      PulseEstimate a = product.get(i);
      NaiveEstimate b = naive.get(i);
      if (!a.accepted() || !b.accepted()) {
        continue;
      }
      compared++;
      worst[0] = Math.max(worst[0], rel(b.raMOhm(), a.value(Parameter.ACCESS_RESISTANCE)));
      worst[1] = Math.max(worst[1], rel(b.rinMOhm(), a.value(Parameter.INPUT_RESISTANCE)));
      worst[2] = Math.max(worst[2], rel(b.cmPf(), a.value(Parameter.MEMBRANE_CAPACITANCE)));
      worst[3] = Math.max(worst[3], rel(b.tauMs(), a.value(Parameter.TIME_CONSTANT)));
    }
    boolean ok =
        product.size() == naive.size()
            && compared > 0.95 * n
            && worst[0] <= RA_TOLERANCE
            && worst[1] <= RIN_TOLERANCE
            && worst[2] <= CM_TOLERANCE
            && worst[3] <= TAU_TOLERANCE;
    out.printf(
        Locale.ROOT,
        "naive vs Tauwatch, %d pulses compared: largest relative difference Ra %.2f %% (tolerance"
            + " %.0f %%), Rin %.2f %% (%.0f %%), Cm %.2f %% (%.0f %%), tau %.2f %% (%.0f %%): %s%n",
        compared,
        100 * worst[0],
        100 * RA_TOLERANCE,
        100 * worst[1],
        100 * RIN_TOLERANCE,
        100 * worst[2],
        100 * CM_TOLERANCE,
        100 * worst[3],
        100 * TAU_TOLERANCE,
        ok ? "same estimates" : "DISAGREE");
    out.flush();
    return ok;
  }

  private static double rel(double a, double b) {
    return Math.abs(a - b) / Math.abs(b);
  }

  static String khz(double rate) {
    return String.format(Locale.ROOT, "%.0f kHz", rate / 1e3);
  }

  static String f0(double v) {
    return String.format(Locale.ROOT, "%.0f", v);
  }

  static String f1(double v) {
    return String.format(Locale.ROOT, "%.1f", v);
  }

  static String f2(double v) {
    return String.format(Locale.ROOT, "%.2f", v);
  }

  /**
   * For a quick run from the class path: {@code java -cp tauwatch.jar tauwatch.bench.SpeedBench}.
   */
  public static void main(String[] args) throws Exception {
    Path dir = Files.createTempDirectory("tauwatch-bench");
    PrintWriter out = new PrintWriter(System.out, true);
    new SpeedBench(out, dir, args.length > 0 ? Double.parseDouble(args[0]) : 120, 3).run();
  }
}
