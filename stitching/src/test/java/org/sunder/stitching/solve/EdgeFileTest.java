package org.sunder.stitching.solve;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.Random;
import java.util.zip.CRC32;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;

/** Round trips of the edge file, its layout, and typed errors for damaged files. */
class EdgeFileTest {
  @TempDir
  Path dir;

  private static SolveEdges random(Random random, int m) {
    SolveEdges edges = new SolveEdges(m);
    for (int e = 0; e < m; e++) {
      edges.add(random.nextLong(), random.nextLong(), random.nextGaussian(), random.nextLong(),
          random.nextLong(), (byte) random.nextInt(8));
    }
    return edges;
  }

  @Test
  void roundTripsRandomEdges() {
    Random random = new Random(13);
    for (int m : new int[] {0, 1, 7, 1000}) {
      SolveEdges edges = random(random, m);
      Path file = dir.resolve("part-" + m + ".out");
      EdgeFile.write(file, edges);
      assertEquals(edges, EdgeFile.read(file));
      try {
        assertEquals(24 + 41L * m, Files.size(file), "41 bytes per edge plus 24");
      } catch (IOException ex) {
        throw new AssertionError(ex);
      }
    }
  }

  @Test
  void layoutIsBigEndianColumnsWithACrc32() throws IOException {
    SolveEdges edges = new SolveEdges(2);
    edges.add(5, 6, 0.25, 7, 8, SolveEdges.MIN);
    edges.add(-1, 2, -3.5, 3, 4, SolveEdges.SEPARATED);
    Path file = dir.resolve("layout");
    EdgeFile.write(file, edges);
    ByteBuffer bytes = ByteBuffer.wrap(Files.readAllBytes(file));
    byte[] magic = new byte[8];
    bytes.get(magic);
    assertEquals("SUNDEDGE", new String(magic, java.nio.charset.StandardCharsets.US_ASCII));
    assertEquals(1, bytes.getInt());
    assertEquals(2, bytes.getInt());
    assertEquals(5, bytes.getLong());
    assertEquals(-1, bytes.getLong());
    assertEquals(6, bytes.getLong());
    assertEquals(2, bytes.getLong());
    assertEquals(0.25, bytes.getDouble());
    assertEquals(-3.5, bytes.getDouble());
    bytes.position(bytes.position() + 32);
    assertEquals(SolveEdges.MIN, bytes.get());
    assertEquals(SolveEdges.SEPARATED, bytes.get());
    // java.util.zip.CRC32 is the ISO-HDLC CRC-32 of zlib and PNG
    CRC32 crc = new CRC32();
    crc.update(Files.readAllBytes(file), 0, bytes.position());
    assertEquals(crc.getValue(), bytes.getLong());
    assertEquals(0, bytes.remaining());
  }

  @Test
  void damagedFilesAreTypedErrorsNamingTheFile() throws IOException {
    Path file = dir.resolve("damaged");
    EdgeFile.write(file, random(new Random(3), 20));
    byte[] good = Files.readAllBytes(file);
    byte[] truncated = Arrays.copyOf(good, good.length - 9);
    byte[] flipped = good.clone();
    flipped[40] ^= 1;
    byte[] badMagic = good.clone();
    badMagic[0] = 'X';
    for (byte[] content : new byte[][] {truncated, flipped, badMagic}) {
      Files.write(file, content);
      SunderException error = assertThrows(SunderException.class, () -> EdgeFile.read(file));
      assertEquals(ErrorKind.INVALID_INPUT, error.kind());
      assertTrue(error.getMessage().contains(file.toString()), error.getMessage());
    }
  }
}
