package tauwatch.source;

import java.io.IOException;
import tauwatch.event.EventSink;
import tauwatch.event.StreamClock;
import tauwatch.stream.SampleWriter;
import tauwatch.stream.StreamFormat;

/**
 * A producer of the digitised command and response stream: the simulator, a file, a socket or a
 * serial port.
 *
 * <p>{@link #run} is called once, on the source's own thread, and only feeds the ring through the
 * writer; it knows nothing of pulses. {@link #stop()} may be called from any thread.
 */
public interface SampleSource {

  /** What the samples mean; known before {@link #run} is called. */
  StreamFormat format();

  /** A short name for logs and the session folder, e.g. {@code sim:ra-creep}. */
  String name();

  /**
   * True when samples arrive in real time and cannot wait: a full ring then drops and counts an
   * overrun. False for files and the unpaced simulator, which wait for the analysis instead.
   */
  boolean live();

  /**
   * Feeds samples until the stream ends, {@code maxSamples} have been written, or {@link #stop()}
   * is called. Does not call {@link SampleWriter#endOfStream()}; the caller does.
   *
   * @throws SourceException for input that cannot be read on (a malformed file line, say), with a
   *     one-line message naming the file and line
   */
  void run(SampleWriter writer, long maxSamples) throws IOException;

  /** Whether the stream marks the acquisition program's sweep starts (adds sweep columns). */
  default boolean hasSweepTrigger() {
    return false;
  }

  /**
   * Gives the source the session's event log, for news only the source knows (a link closed, frames
   * rejected as corrupt or as contradicting the device profile). Called once before {@link #run};
   * sources without such news ignore it.
   */
  default void attach(EventSink events, StreamClock clock) {}

  /** Asks {@link #run} to return soon. */
  void stop();
}
