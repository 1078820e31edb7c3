package tauwatch.pulse;

import tauwatch.event.EventKind;
import tauwatch.event.EventSink;
import tauwatch.event.MonitorEvent;
import tauwatch.stream.SampleBlock;
import tauwatch.stream.SampleBlockHandler;
import tauwatch.stream.StreamFormat;

/**
 * Finds test pulses in the stream from the command channel's edges and cuts one window per pulse:
 * baseline, step (on-transient and steady state) and the off-transient.
 *
 * <p>Runs on the ring's consumer thread. The per-sample path allocates nothing: the history and the
 * window are preallocated and the same {@link PulseWindow} is handed to the listener every time.
 * Only rare news (an ignored long step) builds an event.
 *
 * <p>Edges are changes of the command by more than the threshold from the tracked holding level;
 * the step amplitude is then measured from the command levels, never assumed. When the command is
 * not recorded (NaN), the configured {@link PulseSchedule} stands in for it.
 */
public final class PulseSegmenter implements SampleBlockHandler {
  private enum Phase {
    IDLE,
    STEP,
    OFF
  }

  /** The holding level follows slow command changes over about this many baseline lengths. */
  private static final int HOLDING_TRACKING_BASELINES = 4;

  /**
   * Fraction of the edge threshold a command may stray from the run's starting level and still be
   * certain not to be an edge (one half, with room for rounding).
   */
  private static final double SAFE_FRACTION = 0.45;

  private final PulseListener listener;
  private final EventSink events;
  private final StreamFormat format;
  private final double threshold;
  private final int baselineSamples;
  private final int maxStepSamples;
  private final int offSamples;
  private final double holdingAlpha;
  private final double alphaBeta1;
  private final double alphaBeta2;
  private final double alphaBeta3;
  private final double beta4;

  private final long scheduleFirstOnset;
  private final long schedulePeriod;
  private final long scheduleWidth;
  private final double scheduleStep;

  private final double[] historyCommand;
  private final double[] historyResponse;
  private int historyCount;
  private int historyNext;

  private final PulseWindow window;
  private Phase phase = Phase.IDLE;
  private double holdingLevel;
  private boolean holdingKnown;
  private int offRemaining;
  private long pulseCount;
  private long sweepCount;
  private long sweepStartIndex;
  private long ignoredSteps;

  public PulseSegmenter(
      StreamFormat format, SegmenterOptions options, PulseListener listener, EventSink events) {
    this.format = format;
    this.listener = listener;
    this.events = events;
    this.threshold = options.edgeThreshold();
    double rate = format.sampleRateHz();
    this.baselineSamples = Math.max(4, (int) Math.round(options.baselineMs() * 1e-3 * rate));
    this.maxStepSamples = Math.max(4, (int) Math.round(options.maxStepMs() * 1e-3 * rate));
    this.offSamples = Math.max(4, (int) Math.round(options.offWindowMs() * 1e-3 * rate));
    this.holdingAlpha = 1.0 / (HOLDING_TRACKING_BASELINES * baselineSamples);
    double beta = 1 - holdingAlpha;
    this.alphaBeta1 = holdingAlpha * beta;
    this.alphaBeta2 = alphaBeta1 * beta;
    this.alphaBeta3 = alphaBeta2 * beta;
    this.beta4 = beta * beta * beta * beta;
    PulseSchedule s = options.schedule();
    if (s != null) {
      scheduleFirstOnset = Math.round(s.firstOnsetMs() * 1e-3 * rate);
      schedulePeriod = Math.max(2, Math.round(s.periodMs() * 1e-3 * rate));
      scheduleWidth = Math.max(1, Math.round(s.widthMs() * 1e-3 * rate));
      scheduleStep = s.stepAmplitude();
    } else {
      scheduleFirstOnset = -1;
      schedulePeriod = 0;
      scheduleWidth = 0;
      scheduleStep = Double.NaN;
    }
    historyCommand = new double[baselineSamples];
    historyResponse = new double[baselineSamples];
    window = new PulseWindow(baselineSamples + maxStepSamples + offSamples + 2);
    window.mode = format.mode();
    window.filterCutoffHz = format.filterCutoffHz();
    window.sampleIntervalS = format.sampleIntervalS();
    window.streamStartS = format.startTimeS();
  }

  /** Pulses handed to the listener so far. */
  public long pulseCount() {
    return pulseCount;
  }

  /** Steps seen that were too long to be test pulses. */
  public long ignoredSteps() {
    return ignoredSteps;
  }

  @Override
  public void onBlock(SampleBlock block, long sequence, boolean endOfBatch) {
    if (block.lostBeforeSamples > 0
        || block.hasFlag(SampleBlock.FLAG_SIGNAL_LOST)
        || block.hasFlag(SampleBlock.FLAG_SIGNAL_RESTORED)) {
      onDiscontinuity();
    }
    long index = block.firstSampleIndex;
    double[] cmd = block.command;
    double[] resp = block.response;
    byte[] sweep = block.sweepStart;
    for (int i = 0, n = block.length; i < n; i++, index++) {
      if (phase == Phase.IDLE && holdingKnown && historyCount == baselineSamples) {
        int j = quietRun(cmd, resp, sweep, i, n);
        index += j - i;
        i = j;
        if (i == n) {
          break;
        }
      }
      if (sweep[i] != 0) {
        sweepCount++;
        sweepStartIndex = index;
      }
      double c = cmd[i];
      if (c != c) { // NaN: no command channel recorded
        c = scheduledCommand(index);
      }
      onSample(index, c, resp[i], block.receivedNanos);
    }
  }

  /**
   * The common case, between pulses with a full baseline history: samples at the holding level,
   * with a recorded command and no sweep start. Does for each exactly what {@link #onSample} does
   * in the idle phase (follow the holding level, remember the sample), a run at a time; stops at
   * the first sample that needs the general path.
   *
   * <p>A run is found without following the level sample by sample: the level is a weighted mean of
   * where it started and of the commands since, so while every command stays within {@link
   * #SAFE_FRACTION} of the threshold of the starting level, no sample can be an edge. Such a run is
   * then folded into the level four samples per dependent step and copied into the history in bulk;
   * a sample beyond the safe band is checked exactly, one at a time. The level so followed differs
   * from the sample-by-sample one only by rounding (it decides edges, which lie a threshold away;
   * window levels are measured from the window itself).
   *
   * @return the index of the first sample not handled
   */
  private int quietRun(double[] cmd, double[] resp, byte[] sweep, int from, int to) {
    int i = from;
    while (i < to) {
      int end = safeRunEnd(cmd, sweep, i, to);
      if (end > i) {
        followHolding(cmd, i, end);
        rememberRun(cmd, resp, i, end);
        i = end;
        if (i == to) {
          break;
        }
      }
      double c = cmd[i];
      if (sweep[i] != 0 || c != c || Math.abs(c - holdingLevel) > threshold) {
        break;
      }
      holdingLevel += (c - holdingLevel) * holdingAlpha;
      remember(c, resp[i]);
      i++;
    }
    return i;
  }

  /** The end of the run from {@code from} with no sweep start and every command near the level. */
  private int safeRunEnd(double[] cmd, byte[] sweep, int from, int to) {
    final double level = holdingLevel;
    final double band = SAFE_FRACTION * threshold;
    int i = from;
    while (i < to && sweep[i] == 0 && Math.abs(cmd[i] - level) <= band) { // NaN ends the run
      i++;
    }
    return i;
  }

  /**
   * Folds {@code cmd[from..to)} into the holding level: L ← βL + αc per sample (β = 1 − α), four
   * samples per step as L ← β⁴L + α(β³c₀ + β²c₁ + βc₂ + c₃), so the loop's dependent chain is a
   * quarter as long.
   */
  private void followHolding(double[] cmd, int from, int to) {
    double level = holdingLevel;
    int i = from;
    for (int end4 = to - 3; i < end4; i += 4) {
      level =
          level * beta4
              + (cmd[i] * alphaBeta3 + cmd[i + 1] * alphaBeta2)
              + (cmd[i + 2] * alphaBeta1 + cmd[i + 3] * holdingAlpha);
    }
    for (; i < to; i++) {
      level += (cmd[i] - level) * holdingAlpha;
    }
    holdingLevel = level;
  }

  /** {@link #remember} for a run, when the history is full: only its last samples are kept. */
  private void rememberRun(double[] cmd, double[] resp, int from, int to) {
    final int size = baselineSamples;
    int n = to - from;
    int next = historyNext;
    if (n > size) {
      next = (int) ((next + (long) (n - size)) % size);
      from = to - size;
      n = size;
    }
    int first = Math.min(n, size - next);
    System.arraycopy(cmd, from, historyCommand, next, first);
    System.arraycopy(resp, from, historyResponse, next, first);
    int rest = n - first;
    if (rest > 0) {
      System.arraycopy(cmd, from + first, historyCommand, 0, rest);
      System.arraycopy(resp, from + first, historyResponse, 0, rest);
    }
    next += n;
    if (next >= size) {
      next -= size;
    }
    historyNext = next;
  }

  /** The rest of a window cut by a gap or signal loss cannot be trusted; so is the baseline. */
  private void onDiscontinuity() {
    if (phase != Phase.IDLE) {
      window.spansGap = true;
    }
    historyCount = 0;
    historyNext = 0;
    holdingKnown = phase != Phase.IDLE && holdingKnown;
  }

  private double scheduledCommand(long index) {
    if (schedulePeriod == 0) {
      return 0.0;
    }
    long local = index - scheduleFirstOnset;
    return local >= 0 && local % schedulePeriod < scheduleWidth ? scheduleStep : 0.0;
  }

  private void onSample(long index, double c, double r, long receivedNanos) {
    if (!holdingKnown) {
      holdingLevel = c;
      holdingKnown = true;
    }
    boolean away = Math.abs(c - holdingLevel) > threshold;
    switch (phase) {
      case IDLE:
        if (away && historyCount >= baselineSamples / 2) {
          beginWindow(index);
          append(c, r);
          phase = Phase.STEP;
        } else if (!away) {
          holdingLevel += (c - holdingLevel) * holdingAlpha;
        }
        break;
      case STEP:
        append(c, r);
        if (!away) {
          window.offsetIndex = window.length - 1;
          offRemaining = offSamples - 1; // the offset row itself is the first of the off window
          phase = Phase.OFF;
        } else if (window.length - window.onsetIndex > maxStepSamples) {
          ignoreLongStep(index, c);
        }
        break;
      case OFF:
        if (away) {
          // The next step came before the off window filled: close this pulse short.
          emit(receivedNanos);
          if (historyCount >= baselineSamples / 2) {
            beginWindow(index);
            append(c, r);
            phase = Phase.STEP;
          }
        } else {
          append(c, r);
          if (--offRemaining == 0) {
            emit(receivedNanos);
          }
        }
        break;
      default:
        throw new AssertionError(phase);
    }
    remember(c, r);
  }

  private void beginWindow(long onsetIndex) {
    PulseWindow w = window;
    int n = historyCount;
    int start = historyNext - n;
    if (start < 0) {
      start += baselineSamples;
    }
    for (int k = 0; k < n; k++) {
      int h = start + k;
      if (h >= baselineSamples) {
        h -= baselineSamples;
      }
      w.command[k] = historyCommand[h];
      w.response[k] = historyResponse[h];
    }
    w.length = n;
    w.onsetIndex = n;
    w.offsetIndex = -1;
    w.firstSampleIndex = onsetIndex - n;
    w.spansGap = false;
    if (sweepCount > 0) {
      w.sweepNumber = sweepCount;
      w.sweepTimeS = (onsetIndex - sweepStartIndex) * format.sampleIntervalS();
    } else {
      w.sweepNumber = -1;
      w.sweepTimeS = Double.NaN;
    }
  }

  private void append(double c, double r) {
    PulseWindow w = window;
    int i = w.length;
    w.command[i] = c;
    w.response[i] = r;
    w.length = i + 1;
  }

  private void remember(double c, double r) {
    historyCommand[historyNext] = c;
    historyResponse[historyNext] = r;
    if (++historyNext == baselineSamples) {
      historyNext = 0;
    }
    if (historyCount < baselineSamples) {
      historyCount++;
    }
  }

  private void emit(long receivedNanos) {
    PulseWindow w = window;
    w.holdingLevel = mean(w.command, 0, w.onsetIndex);
    w.stepLevel = mean(w.command, w.onsetIndex, w.offsetIndex);
    w.pulseNumber = ++pulseCount;
    w.lastSampleReceivedNanos = receivedNanos;
    phase = Phase.IDLE;
    listener.onPulse(w);
  }

  private void ignoreLongStep(long index, double c) {
    ignoredSteps++;
    double fromLevel = holdingLevel;
    // A step this long is the experiment's own (or a new holding level): follow it as holding.
    holdingLevel = c;
    phase = Phase.IDLE;
    historyCount = 0;
    historyNext = 0;
    events.onEvent(
        new MonitorEvent(
            System.currentTimeMillis(),
            format.timeOfSampleS(index),
            EventKind.STEP_IGNORED,
            String.format(
                "command stayed at %.3g %s (from %.3g) longer than a test pulse; now tracked as holding",
                c, format.mode().commandUnit(), fromLevel)));
  }

  private static double mean(double[] a, int from, int to) {
    double s = 0;
    for (int i = from; i < to; i++) {
      s += a[i];
    }
    return to > from ? s / (to - from) : Double.NaN;
  }
}
