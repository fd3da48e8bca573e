package org.sunder.stitching;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.stitching.task.BlockSummary;
import org.sunder.stitching.task.BlockSummaryFile;
import org.sunder.stitching.task.SeamEdges;
import org.sunder.stitching.task.SeamEdgesFile;
import org.sunder.testing.PythonReference;

/** The work dir's block summary and seam edge files: round trips, damage, and their layout. */
class WorkFilesTest {
  @TempDir
  Path dir;

  static EdgeStatistics randomStatistics(Random random, int rows) {
    long[] u = new long[rows];
    long[] v = new long[rows];
    double[] w = new double[rows];
    for (int i = 0; i < rows; i++) {
      u[i] = Long.MIN_VALUE + random.nextInt(50);
      v[i] = Long.MIN_VALUE + random.nextInt(50);
      w[i] = random.nextGaussian();
    }
    return EdgeStatistics.ofEdges(u, v, w);
  }

  static BlockSummary randomSummary(Random random, int block) {
    int n = 1 + random.nextInt(40);
    long[] sizes = random.longs(n, 1, 1000).toArray();
    int[] boundary = random.ints(1, n + 1).distinct().limit(random.nextInt(n + 1)).sorted()
        .toArray();
    int[] sides = random.ints(boundary.length, 0, 64).toArray();
    int sep = random.nextInt(5);
    long[] su = new long[sep];
    long[] sv = new long[sep];
    for (int i = 0; i < sep; i++) {
      su[i] = Long.MIN_VALUE + 2 * i;
      sv[i] = su[i] + 1;
    }
    long[] firstVoxels = random.longs(boundary.length, 0, Long.MAX_VALUE).toArray();
    return new BlockSummary(block, sizes, boundary, sides, firstVoxels,
        randomStatistics(random, random.nextInt(30)), su, sv,
        random.nextBoolean() ? EdgeStatistics.empty() : randomStatistics(random, 7));
  }

  @Test
  void blockSummariesRoundTripOnRandomInputs() {
    Random random = new Random(13);
    for (int trial = 0; trial < 50; trial++) {
      BlockSummary summary = randomSummary(random, trial);
      Path file = dir.resolve(trial + ".summary");
      BlockSummaryFile.Stored stored = BlockSummaryFile.write(file, summary);
      assertEquals(summary, BlockSummaryFile.read(file, stored), "trial " + trial);
      assertEquals(summary.segmentCount(), stored.segments());
      assertEquals(summary.boundaryLocalIds().length, stored.boundarySegments());
      assertEquals(summary.innerEdges().size(), stored.innerEdges());
      assertEquals(summary.separatedU().length, stored.separatedPairs());
      assertEquals(summary.innerEdges().size() + summary.interiorEdges().size(), stored.pairs());
      assertEquals(stored.bytes(), file.toFile().length());
      assertEquals(stored, BlockSummaryFile.write(file, summary), "a rewrite gives the same file");
    }
  }

  @Test
  void seamEdgesRoundTripOnRandomInputs() {
    Random random = new Random(17);
    for (int trial = 0; trial < 50; trial++) {
      SeamEdges seams = new SeamEdges(trial, randomStatistics(random, random.nextInt(60)),
          random.nextBoolean() ? EdgeStatistics.empty() : randomStatistics(random, 9));
      Path file = dir.resolve(trial + ".seams");
      SeamEdgesFile.Stored stored = SeamEdgesFile.write(file, seams);
      SeamEdges back = SeamEdgesFile.read(file, stored);
      assertEquals(seams.face(), back.face());
      assertEquals(seams.edges(), back.edges(), "trial " + trial);
      assertEquals(seams.continued(), back.continued(), "trial " + trial);
      assertEquals(seams.edges().size(), stored.edges());
      assertEquals(stored.bytes(), file.toFile().length());
    }
  }

  @Test
  void damagedMissingOrForeignFilesAreNamedErrors() throws IOException {
    BlockSummary summary = randomSummary(new Random(5), 3);
    Path file = dir.resolve("3.summary");
    BlockSummaryFile.Stored stored = BlockSummaryFile.write(file, summary);
    byte[] bytes = Files.readAllBytes(file);

    byte[] flipped = bytes.clone();
    flipped[20] ^= 1;
    Files.write(file, flipped);
    SunderException e = assertThrows(SunderException.class,
        () -> BlockSummaryFile.read(file, stored));
    assertTrue(e.getMessage().contains("checksum") && e.getMessage().contains(file.toString()),
        e.getMessage());

    Files.write(file, Arrays.copyOf(bytes, bytes.length / 2));
    assertThrows(SunderException.class, () -> BlockSummaryFile.read(file, -1));

    Files.write(file, bytes);
    e = assertThrows(SunderException.class,
        () -> BlockSummaryFile.read(file, stored.checksum() ^ 1));
    assertEquals(ErrorKind.CONFLICT, e.kind());
    assertTrue(e.getMessage().contains("recorded"), e.getMessage());

    e = assertThrows(SunderException.class, () -> SeamEdgesFile.read(file, -1));
    assertTrue(e.getMessage().contains("SUNDSEAM"), e.getMessage());

    e = assertThrows(SunderException.class,
        () -> BlockSummaryFile.read(dir.resolve("missing.summary"), -1));
    assertTrue(e.getMessage().contains("missing"), e.getMessage());

    BlockSummaryFile.Stored other = new BlockSummaryFile.Stored(4, 0, 0, 0, 0, 0,
        stored.bytes(), stored.checksum());
    e = assertThrows(SunderException.class, () -> BlockSummaryFile.read(file, other));
    assertTrue(e.getMessage().contains("expected block 4"), e.getMessage());
  }

  /**
   * Reference: Python's {@code zlib.crc32} (the CRC-32 of ISO 3309 / ITU-T V.42 that
   * {@code java.util.zip.CRC32} also computes) and {@code struct} big-endian unpacking read the
   * file independently of our reader: checksum, magic, version, block, segment sizes, boundary
   * segments' local ids and first voxels.
   */
  @Test
  void layoutMatchesAnIndependentReader() {
    PythonReference.requireModules("zlib", "struct");
    BlockSummary summary = randomSummary(new Random(30), 11);
    assertTrue(summary.boundaryLocalIds().length > 0, "a summary with boundary segments");
    Path file = dir.resolve("11.summary");
    BlockSummaryFile.write(file, summary);
    String script = String.join("\n",
        "import struct, sys, zlib",
        "data = open(sys.argv[1], 'rb').read()",
        "crc, = struct.unpack('>q', data[-8:])",
        "ok = crc == zlib.crc32(data[:-8])",
        "magic = data[:8].decode('ascii')",
        "version, block, n = struct.unpack('>iii', data[8:20])",
        "sizes = struct.unpack('>%dq' % n, data[20:20 + 8 * n])",
        "at = 20 + 8 * n",
        "b, = struct.unpack('>i', data[at:at + 4])",
        "ids = struct.unpack('>%di' % b, data[at + 4:at + 4 + 4 * b])",
        "first = struct.unpack('>%dq' % b, data[at + 4 + 8 * b:at + 4 + 16 * b])",
        "print(ok, magic, version, block, ' '.join(map(str, sizes)), '|',",
        "      ' '.join(map(str, ids)), '|', ' '.join(map(str, first)))");
    String out = PythonReference.runChecked(script, file.toString()).strip();
    StringBuilder expected = new StringBuilder("True SUNDSUMM 2 11");
    for (long size : summary.segmentSizes()) {
      expected.append(' ').append(size);
    }
    expected.append(" |");
    for (int id : summary.boundaryLocalIds()) {
      expected.append(' ').append(id);
    }
    expected.append(" |");
    for (long first : summary.boundaryFirstVoxels()) {
      expected.append(' ').append(first);
    }
    assertEquals(expected.toString(), out);
  }
}
