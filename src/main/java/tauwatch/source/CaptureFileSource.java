package tauwatch.source;

import java.io.IOException;
import java.nio.file.Path;
import tauwatch.event.EventSink;
import tauwatch.event.StreamClock;
import tauwatch.record.RawCaptureReader;
import tauwatch.stream.SampleWriter;
import tauwatch.stream.StreamFormat;
import tauwatch.wire.DeviceProfile;
import tauwatch.wire.DeviceProfileLoader;
import tauwatch.wire.ProfileException;
import tauwatch.wire.SampleFeed;
import tauwatch.wire.StreamDecoder;

/**
 * Replays a Tauwatch raw capture through the same decoder and feed as the live source, with the
 * device profile stored in the capture: corrupt frames, gaps and losses of signal come out as they
 * did live.
 *
 * <p>Not live: runs as fast as the analysis takes the samples. {@link #run} runs on the source
 * thread; the receive times recorded with each chunk stand in for the wall clock.
 */
public final class CaptureFileSource implements SampleSource {
  private final Path file;
  private final DeviceProfile profile;
  private final StreamFormat format;
  private volatile boolean stopped;
  private EventSink events;
  private StreamClock clock;

  public CaptureFileSource(Path file) throws IOException {
    this.file = file;
    try (RawCaptureReader r = new RawCaptureReader(file)) {
      try {
        profile =
            DeviceProfileLoader.parse(file + " (profile in the capture header)", r.profileToml());
      } catch (ProfileException e) {
        throw new SourceException(e.getMessage());
      }
      format = profile.streamFormat("capture " + file.getFileName() + " of " + r.sourceName());
    }
  }

  public DeviceProfile profile() {
    return profile;
  }

  @Override
  public StreamFormat format() {
    return format;
  }

  @Override
  public String name() {
    return "file:" + file.getFileName();
  }

  @Override
  public boolean live() {
    return false;
  }

  @Override
  public boolean hasSweepTrigger() {
    return profile.hasTrigger();
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
    try (RawCaptureReader r = new RawCaptureReader(file)) {
      while (!stopped && writer.nextSampleIndex() < maxSamples && r.next()) {
        if (r.type() == RawCaptureReader.BYTES) {
          feed.at(r.nanos());
          decoder.accept(r.payload(), r.payloadOffset(), r.length());
        } else {
          decoder.reset();
          feed.signalLost();
        }
        reporter.poll(r.nanos());
      }
    } catch (IOException e) {
      throw new SourceException(e.getMessage());
    } finally {
      writer.flush();
      reporter.finish();
    }
  }

  @Override
  public void stop() {
    stopped = true;
  }
}
