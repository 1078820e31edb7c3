package tauwatch.source;

import java.io.IOException;
import java.util.concurrent.locks.LockSupport;
import tauwatch.event.EventSink;
import tauwatch.event.StreamClock;
import tauwatch.record.RawCaptureWriter;
import tauwatch.stream.SampleWriter;
import tauwatch.stream.StreamFormat;
import tauwatch.wire.DeviceProfile;
import tauwatch.wire.SampleFeed;
import tauwatch.wire.StreamDecoder;

/**
 * Reads a live device stream over a byte link (TCP or serial), decodes it per the device profile
 * and feeds the ring; survives what real links do.
 *
 * <p>{@link #run} runs on the source thread and reads into one reusable buffer; decoding and
 * scaling allocate nothing per frame. No good frame for {@value #SILENCE_MS} ms, or a closed link,
 * sends {@code signal lost} down the ring at once (so the monitor shows {@code no signal} within a
 * second); a closed link, or one silent for {@value #RECONNECT_SILENCE_MS} ms, is reopened with
 * back-off from {@value #MIN_BACKOFF_MS} ms doubling to {@value #MAX_BACKOFF_MS} ms; the first good
 * frame after a loss sends {@code signal restored}. The source never gives up by itself: it runs
 * until {@link #stop()} or the sample limit. {@link #stop()} may be called from any thread.
 */
public final class DeviceStreamSource implements SampleSource {
  static final long SILENCE_MS = 500;
  static final long RECONNECT_SILENCE_MS = 3000;
  static final long MIN_BACKOFF_MS = 100;
  static final long MAX_BACKOFF_MS = 2000;
  private static final int READ_BYTES = 1 << 14;

  private final ByteLink link;
  private final DeviceProfile profile;
  private final StreamFormat format;
  private final String name;
  private RawCaptureWriter capture;
  private StreamFaultReporter reporter;
  private volatile boolean stopped;
  private EventSink events;
  private StreamClock clock;

  private DeviceStreamSource(ByteLink link, DeviceProfile profile, RawCaptureWriter capture) {
    this.link = link;
    this.profile = profile;
    this.name = link.describe();
    this.format = profile.streamFormat(name + " (" + profile.name() + ")");
    this.capture = capture;
  }

  /** A TCP client source. */
  public static DeviceStreamSource tcp(
      String host, int port, DeviceProfile profile, RawCaptureWriter capture) {
    return new DeviceStreamSource(new TcpLink(host, port), profile, capture);
  }

  /** A serial-port source; the profile must have serial settings. */
  public static DeviceStreamSource serial(
      String device, DeviceProfile profile, RawCaptureWriter capture) {
    if (profile.serial() == null) {
      throw new IllegalArgumentException(
          "profile " + profile.name() + " (" + profile.origin() + ") has no [transport.serial]");
    }
    return new DeviceStreamSource(new SerialLink(device, profile.serial()), profile, capture);
  }

  @Override
  public StreamFormat format() {
    return format;
  }

  @Override
  public String name() {
    return name;
  }

  @Override
  public boolean live() {
    return true;
  }

  @Override
  public boolean hasSweepTrigger() {
    return profile.hasTrigger();
  }

  public DeviceProfile profile() {
    return profile;
  }

  @Override
  public void attach(EventSink events, StreamClock clock) {
    this.events = events;
    this.clock = clock;
  }

  @Override
  public void run(SampleWriter writer, long maxSamples) throws IOException {
    SampleFeed feed = new SampleFeed(profile, writer);
    feed.limit(maxSamples);
    StreamDecoder decoder = profile.newDecoder(feed, writer.counters());
    StreamFaultReporter reporter =
        new StreamFaultReporter(events, clock, format, writer, decoder, feed);
    this.reporter = reporter;
    byte[] buf = new byte[READ_BYTES];
    long backoffMs = MIN_BACKOFF_MS;
    long nextAttemptNs = System.nanoTime();
    long startNs = nextAttemptNs;
    long openedNs = startNs;
    boolean lostNewsPending = false;
    try {
      while (!stopped && writer.nextSampleIndex() < maxSamples) {
        long now = System.nanoTime();
        if (!link.isOpen()) {
          if (now - nextAttemptNs >= 0) {
            try {
              link.open();
              openedNs = now;
              feed.linkReopened();
              backoffMs = MIN_BACKOFF_MS;
              if (lostNewsPending || now - startNs > SILENCE_MS * 1_000_000) {
                reporter.link(link.describe() + ": connected again", now);
              }
              lostNewsPending = false;
            } catch (IOException e) {
              reporter.link(
                  e.getMessage() + "; retrying every " + backoffMs + "–" + MAX_BACKOFF_MS + " ms",
                  now);
              nextAttemptNs = now + backoffMs * 1_000_000;
              backoffMs = Math.min(2 * backoffMs, MAX_BACKOFF_MS);
            }
          }
          if (!link.isOpen()) {
            checkSilence(feed, now, startNs);
            reporter.poll(now);
            LockSupport.parkNanos(Math.max(1, Math.min(50_000_000, nextAttemptNs - now)));
            continue;
          }
        }
        int n;
        try {
          n = link.read(buf, 0, buf.length);
        } catch (IOException e) {
          reporter.link(link.describe() + ": read failed: " + e.getMessage(), now);
          n = -1;
        }
        now = System.nanoTime();
        if (n < 0) {
          closeLink(decoder, feed, now);
          reporter.link(
              link.describe() + ": link closed by the device; reconnecting with back-off", now);
          lostNewsPending = true;
          nextAttemptNs = now + backoffMs * 1_000_000;
          continue;
        }
        if (n > 0) {
          captureBytes(buf, n, now);
          feed.at(now);
          decoder.accept(buf, 0, n);
          writer.flush();
        }
        checkSilence(feed, now, startNs);
        long quietSince = Math.max(feed.lastFrameNanos(), openedNs);
        if (now - quietSince > RECONNECT_SILENCE_MS * 1_000_000) {
          closeLink(decoder, feed, now);
          reporter.link(
              link.describe()
                  + ": no frames for "
                  + RECONNECT_SILENCE_MS
                  + " ms; reopening the link",
              now);
          lostNewsPending = true;
          nextAttemptNs = now;
        }
        reporter.poll(now);
      }
    } finally {
      link.close();
      writer.flush();
      reporter.finish();
    }
  }

  private void checkSilence(SampleFeed feed, long now, long startNs) {
    long since = feed.lastFrameNanos() == 0 ? startNs : feed.lastFrameNanos();
    if (!feed.signalDown() && now - since > SILENCE_MS * 1_000_000) {
      feed.signalLost();
      recordLoss(now);
    }
  }

  private void closeLink(StreamDecoder decoder, SampleFeed feed, long now) {
    link.close();
    decoder.reset();
    if (!feed.signalDown()) {
      feed.signalLost();
    }
    recordLoss(now);
  }

  private void recordLoss(long now) {
    if (capture != null) {
      try {
        capture.linkLost(now);
      } catch (IOException e) {
        captureFailed(e, now);
      }
    }
  }

  private void captureBytes(byte[] buf, int n, long now) {
    if (capture != null) {
      try {
        capture.bytes(buf, 0, n, now);
      } catch (IOException e) {
        captureFailed(e, now);
      }
    }
  }

  /** A full disk must not stop the monitor: the capture ends, loudly, and watching goes on. */
  private void captureFailed(IOException e, long now) {
    reporter.link(
        "capture " + capture.file() + ": write failed (" + e.getMessage() + "); capture stopped",
        now);
    try {
      capture.close();
    } catch (IOException again) {
      reporter.link("capture " + capture.file() + ": close failed too: " + again.getMessage(), now);
    }
    capture = null;
  }

  @Override
  public void stop() {
    stopped = true;
  }
}
