package org.sunder.stitching.solve;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayInputStream;
import java.io.ByteArrayOutputStream;
import java.io.DataInputStream;
import java.io.DataOutputStream;
import java.io.EOFException;
import java.io.FilterInputStream;
import java.io.IOException;
import java.io.InputStream;
import java.util.Arrays;
import java.util.Random;
import java.util.zip.CRC32;
import org.junit.jupiter.api.Test;

/**
 * {@link ColumnBuffer} against the JDK's {@link DataOutputStream} and {@link DataInputStream}
 * (big-endian by the specification of {@code java.io.DataOutput}) and {@link CRC32}, on random
 * columns long enough to cross the buffer's 128 KiB refills at every alignment.
 */
class ColumnBufferTest {
  /** One random stream: a header int, columns of random lengths, a trailing long. */
  private record Columns(int header, long[] longs, double[] doubles, byte[] bytes, long[] more,
      long trailer) {
    static Columns random(Random random) {
      int scale = random.nextInt(3) == 0 ? 40_000 : 50;
      long[] longs = new long[random.nextInt(scale)];
      double[] doubles = new double[random.nextInt(scale)];
      byte[] bytes = new byte[random.nextInt(scale)];
      long[] more = new long[random.nextInt(scale)];
      Arrays.setAll(longs, i -> random.nextLong());
      Arrays.setAll(doubles, i -> random.nextInt(10) == 0 ? -0.0 : random.nextGaussian());
      random.nextBytes(bytes);
      Arrays.setAll(more, i -> random.nextInt(5) - 2);
      return new Columns(random.nextInt(), longs, doubles, bytes, more, random.nextLong());
    }

    byte[] byJdk() throws IOException {
      ByteArrayOutputStream sink = new ByteArrayOutputStream();
      DataOutputStream out = new DataOutputStream(sink);
      out.writeInt(header);
      for (long x : longs) {
        out.writeLong(x);
      }
      for (double x : doubles) {
        out.writeDouble(x);
      }
      out.write(bytes);
      for (long x : more) {
        out.writeLong(x);
      }
      out.writeLong(trailer);
      out.flush();
      return sink.toByteArray();
    }
  }

  /** A stream that hands out at most a few bytes per call, as a slow source may. */
  private static InputStream trickling(byte[] content, Random random) {
    return new FilterInputStream(new ByteArrayInputStream(content)) {
      @Override
      public int read(byte[] b, int off, int len) throws IOException {
        return super.read(b, off, Math.min(len, 1 + random.nextInt(13)));
      }
    };
  }

  @Test
  void writesTheBytesAndChecksumOfDataOutputStream() throws IOException {
    Random random = new Random(51);
    for (int trial = 0; trial < 30; trial++) {
      Columns c = Columns.random(random);
      ByteArrayOutputStream sink = new ByteArrayOutputStream();
      ColumnBuffer out = ColumnBuffer.writingTo(sink);
      out.putInt(c.header());
      out.putLongs(c.longs(), c.longs().length);
      out.putDoubles(c.doubles(), c.doubles().length);
      out.putBytes(c.bytes(), c.bytes().length);
      out.putLongs(c.more(), c.more().length);
      long checksum = out.checksum();
      out.putLong(c.trailer());
      out.flush();
      byte[] expected = c.byJdk();
      assertArrayEquals(expected, sink.toByteArray(), "trial " + trial);
      CRC32 crc = new CRC32();
      crc.update(expected, 0, expected.length - Long.BYTES);
      assertEquals(crc.getValue(), checksum, "trial " + trial);
    }
  }

  @Test
  void readsWhatDataOutputStreamWrote() throws IOException {
    Random random = new Random(53);
    for (int trial = 0; trial < 30; trial++) {
      Columns c = Columns.random(random);
      byte[] content = c.byJdk();
      InputStream source = trial % 2 == 0 ? new ByteArrayInputStream(content)
          : trickling(content, random);
      ColumnBuffer in = ColumnBuffer.readingFrom(source);
      assertEquals(c.header(), in.getInt());
      long[] longs = new long[c.longs().length];
      in.getLongs(longs, longs.length);
      double[] doubles = new double[c.doubles().length];
      in.getDoubles(doubles, doubles.length);
      byte[] bytes = new byte[c.bytes().length];
      in.getBytes(bytes, bytes.length);
      long[] more = new long[c.more().length];
      in.getLongs(more, more.length);
      long checksum = in.checksum();
      assertFalse(in.atEnd());
      assertEquals(c.trailer(), in.getLong());
      assertTrue(in.atEnd());
      assertArrayEquals(c.longs(), longs, "trial " + trial);
      assertArrayEquals(c.doubles(), doubles, "trial " + trial);
      assertArrayEquals(c.bytes(), bytes, "trial " + trial);
      assertArrayEquals(c.more(), more, "trial " + trial);
      CRC32 crc = new CRC32();
      crc.update(content, 0, content.length - Long.BYTES);
      assertEquals(crc.getValue(), checksum, "trial " + trial);
    }
  }

  @Test
  void aStreamThatEndsEarlyIsAnEofException() throws IOException {
    Random random = new Random(57);
    long[] values = new long[20_000];
    Arrays.setAll(values, i -> random.nextLong());
    ByteArrayOutputStream sink = new ByteArrayOutputStream();
    ColumnBuffer out = ColumnBuffer.writingTo(sink);
    out.putLongs(values, values.length);
    out.flush();
    byte[] cut = Arrays.copyOf(sink.toByteArray(), 8 * values.length - 3);
    ColumnBuffer in = ColumnBuffer.readingFrom(new ByteArrayInputStream(cut));
    assertThrows(EOFException.class, () -> in.getLongs(new long[values.length], values.length));
    ColumnBuffer extra = ColumnBuffer.readingFrom(new ByteArrayInputStream(sink.toByteArray()));
    extra.getLongs(new long[values.length - 1], values.length - 1);
    assertFalse(extra.atEnd(), "one long is left");
  }
}
