package tauwatch.cli;

import java.io.OutputStream;
import java.io.PrintWriter;
import java.nio.charset.StandardCharsets;

/** Lets a PrintStream write into the command's PrintWriter (so tests can capture the console). */
final class WriterOutputStream extends OutputStream {
  private final PrintWriter out;
  private final java.io.ByteArrayOutputStream line = new java.io.ByteArrayOutputStream();

  WriterOutputStream(PrintWriter out) {
    this.out = out;
  }

  @Override
  public synchronized void write(int b) {
    line.write(b);
    if (b == '\n') {
      flush();
    }
  }

  @Override
  public synchronized void flush() {
    out.write(new String(line.toByteArray(), StandardCharsets.UTF_8));
    out.flush();
    line.reset();
  }
}
