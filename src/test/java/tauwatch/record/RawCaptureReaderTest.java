package tauwatch.record;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.EOFException;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** Captures read back exactly as {@link RawCaptureWriter} wrote them, and broken ones refused. */
class RawCaptureReaderTest {
  @TempDir Path dir;

  @Test
  void readsBackEveryRecordAcrossChunkBoundariesAndLargeRecords() throws IOException {
    Path file = dir.resolve("c.twc");
    Random rnd = new Random(5);
    List<byte[]> written = new ArrayList<>();
    try (RawCaptureWriter w = new RawCaptureWriter(file, "tcp://127.0.0.1:9", "[profile]\n")) {
      for (int i = 0; i < 3000; i++) {
        // Mostly a frame or a few, now and then a read of several megabytes (past the buffer).
        int n = i % 997 == 0 ? 3_000_000 + rnd.nextInt(1000) : 1 + rnd.nextInt(4000);
        byte[] b = new byte[n];
        rnd.nextBytes(b);
        w.bytes(b, 0, n, i);
        written.add(b);
        if (i % 500 == 499) {
          w.linkLost(i);
          written.add(null);
        }
      }
    }
    try (RawCaptureReader r = new RawCaptureReader(file)) {
      assertEquals("tcp://127.0.0.1:9", r.sourceName());
      assertEquals("[profile]\n", r.profileToml());
      for (int i = 0; i < written.size(); i++) {
        assertTrue(r.next(), "record " + i);
        byte[] expected = written.get(i);
        if (expected == null) {
          assertEquals(RawCaptureReader.LINK_LOST, r.type());
          assertEquals(0, r.length());
        } else {
          assertEquals(RawCaptureReader.BYTES, r.type());
          byte[] got =
              Arrays.copyOfRange(r.payload(), r.payloadOffset(), r.payloadOffset() + r.length());
          assertArrayEquals(expected, got, "record " + i);
        }
      }
      assertFalse(r.next(), "clean end");
    }
  }

  @Test
  void aRecordCutShortIsAnErrorNamingTheFile() throws IOException {
    Path file = dir.resolve("cut.twc");
    try (RawCaptureWriter w = new RawCaptureWriter(file, "sim", "")) {
      w.bytes(new byte[100], 0, 100, 1);
      w.bytes(new byte[100], 0, 100, 2);
    }
    byte[] all = Files.readAllBytes(file);
    Files.write(file, Arrays.copyOf(all, all.length - 30));
    try (RawCaptureReader r = new RawCaptureReader(file)) {
      assertTrue(r.next());
      EOFException e = assertThrows(EOFException.class, r::next);
      assertTrue(e.getMessage().startsWith(file.toString()), e.getMessage());
    }
  }

  @Test
  void aCorruptLengthOrTypeIsAnErrorNotAnAttemptToBufferIt() throws IOException {
    Path file = dir.resolve("bad.twc");
    try (RawCaptureWriter w = new RawCaptureWriter(file, "sim", "")) {
      w.bytes(new byte[10], 0, 10, 1);
    }
    byte[] all = Files.readAllBytes(file);
    int header = all.length - 10 - RawCaptureWriter.RECORD_HEADER_BYTES;
    byte[] hugeLength = all.clone();
    hugeLength[header + 12] = 0x7f; // length's top byte: about 2 GB
    Files.write(file, hugeLength);
    try (RawCaptureReader r = new RawCaptureReader(file)) {
      IOException e = assertThrows(IOException.class, r::next);
      assertTrue(e.getMessage().contains("malformed record"), e.getMessage());
    }
    byte[] badType = all.clone();
    badType[header] = 9;
    Files.write(file, badType);
    try (RawCaptureReader r = new RawCaptureReader(file)) {
      IOException e = assertThrows(IOException.class, r::next);
      assertTrue(e.getMessage().contains("type 9"), e.getMessage());
    }
  }
}
