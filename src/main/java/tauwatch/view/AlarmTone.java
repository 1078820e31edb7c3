package tauwatch.view;

import java.util.concurrent.atomic.AtomicBoolean;
import javax.sound.sampled.AudioFormat;
import javax.sound.sampled.AudioSystem;
import javax.sound.sampled.LineUnavailableException;
import javax.sound.sampled.SourceDataLine;

/**
 * A short two-tone chime for a new alarm, synthesised and played through {@code javax.sound} on its
 * own daemon thread.
 *
 * <p>Any thread may call {@link #play()}; it returns at once and drops a request while a chime is
 * still playing. Without a sound device (a rig PC with none, a headless test) the first attempt
 * fails quietly, the reason is kept for {@link #problem()} and later requests do nothing: the
 * banner, not the sound, is the alarm. Needs no display and no AWT toolkit.
 */
final class AlarmTone {
  private static final float RATE_HZ = 22_050f;

  private final AtomicBoolean playing = new AtomicBoolean();
  private volatile String problem;

  void play() {
    if (problem != null || !playing.compareAndSet(false, true)) {
      return;
    }
    Thread t = new Thread(this::chime, "tauwatch-alarm-tone");
    t.setDaemon(true);
    t.start();
  }

  /** Why no sound can be played, or null while none failed. */
  String problem() {
    return problem;
  }

  private void chime() {
    AudioFormat f = new AudioFormat(RATE_HZ, 8, 1, true, false);
    try (SourceDataLine line = AudioSystem.getSourceDataLine(f)) {
      line.open(f);
      line.start();
      byte[] pcm = tones(new double[] {880, 660}, 0.18);
      line.write(pcm, 0, pcm.length);
      line.drain();
    } catch (LineUnavailableException | IllegalArgumentException | SecurityException e) {
      problem = "no sound: " + e.getMessage();
    } finally {
      playing.set(false);
    }
  }

  /** Sine tones one after another with short fades (no clicks), 8-bit signed PCM. */
  private static byte[] tones(double[] freqsHz, double eachS) {
    int n = (int) (RATE_HZ * eachS);
    int fade = n / 10;
    byte[] out = new byte[n * freqsHz.length];
    for (int k = 0; k < freqsHz.length; k++) {
      for (int i = 0; i < n; i++) {
        double env = Math.min(1, Math.min(i, n - 1 - i) / (double) fade);
        double s = Math.sin(2 * Math.PI * freqsHz[k] * i / RATE_HZ) * env * 0.6;
        out[k * n + i] = (byte) Math.round(s * 127);
      }
    }
    return out;
  }
}
