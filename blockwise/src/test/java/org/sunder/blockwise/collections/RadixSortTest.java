package org.sunder.blockwise.collections;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.Comparator;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.sunder.testing.PythonReference;

class RadixSortTest {

  @Test
  void keyedSortIsStable() {
    Random random = new Random(13);
    int n = 5000;
    long[] keys = new long[n];
    int[] values = new int[n];
    for (int i = 0; i < n; i++) {
      keys[i] = random.nextInt(50) * 0x0101_0000_0000_0001L;
      values[i] = i;
    }
    long[] original = keys.clone();
    RadixSort.sortByKeyUnsigned(keys, values);
    for (int i = 1; i < n; i++) {
      int c = Long.compareUnsigned(keys[i - 1], keys[i]);
      assertEquals(true, c < 0 || (c == 0 && values[i - 1] < values[i]));
      assertEquals(original[values[i]], keys[i]);
    }
  }

  @Test
  void keyedSortMatchesTheJdkStableSortOnRandomKeys() {
    // reference: java.util.Arrays.sort(T[], Comparator), which its specification guarantees
    // to be stable
    Random random = new Random(17);
    for (int trial = 0; trial < 30; trial++) {
      int n = random.nextInt(3000);
      long[] keys = new long[n];
      int[] values = new int[n];
      for (int i = 0; i < n; i++) {
        keys[i] = randomKey(random, trial % 3);
        values[i] = i;
      }
      long[] original = keys.clone();
      Integer[] expected = boxedOrder(n, (a, b) -> Long.compareUnsigned(original[a],
          original[b]));
      RadixSort.sortByKeyUnsigned(keys, values);
      assertArrayEquals(unboxed(expected), values, "trial " + trial);
      for (int i = 0; i < n; i++) {
        assertEquals(original[values[i]], keys[i]);
      }
    }
  }

  @Test
  void prefixSortLeavesTheRestAlone() {
    long[] keys = {5, 3, 5, 1, 9, 0};
    int[] values = {0, 1, 2, 3, 4, 5};
    RadixSort.sortByKeyUnsigned(keys, values, 4);
    assertArrayEquals(new long[] {1, 3, 5, 5, 9, 0}, keys);
    assertArrayEquals(new int[] {3, 1, 0, 2, 4, 5}, values);
  }

  @Test
  void orderOfColumnsMatchesTheJdkStableSortWithTies() {
    // reference: java.util.Arrays.sort(T[], Comparator), stable by its specification; few
    // distinct values per column, so most comparisons tie on some columns and many on all
    Random random = new Random(19);
    for (int trial = 0; trial < 40; trial++) {
      int n = trial == 0 ? 0 : random.nextInt(4000);
      int columns = 1 + random.nextInt(4);
      long[][] data = new long[columns][n];
      for (int c = 0; c < columns; c++) {
        int style = random.nextInt(3);
        for (int i = 0; i < n; i++) {
          data[c][i] = randomKey(random, style);
        }
      }
      RadixSort.KeyColumn[] keyColumns = new RadixSort.KeyColumn[columns];
      for (int c = 0; c < columns; c++) {
        long[] column = data[c];
        keyColumns[c] = i -> column[i];
      }
      Integer[] expected = boxedOrder(n, (a, b) -> {
        for (long[] column : data) {
          int cmp = Long.compareUnsigned(column[a], column[b]);
          if (cmp != 0) {
            return cmp;
          }
        }
        return 0;
      });
      assertArrayEquals(unboxed(expected), RadixSort.order(n, keyColumns), "trial " + trial);
    }
  }

  @Test
  void orderOfColumnsInOrderOrNearlySoMatchesTheJdkStableSort() {
    // lists built in order skip the sort; one pair swapped anywhere (the last pair too) must not
    Random random = new Random(47);
    for (int trial = 0; trial < 60; trial++) {
      int n = 2 + random.nextInt(3000);
      long[] primary = new long[n];
      long[] secondary = new long[n];
      for (int i = 0; i < n; i++) {
        primary[i] = randomKey(random, 1 + trial % 2);
        secondary[i] = randomKey(random, 2);
      }
      Integer[] sorted = boxedOrder(n, (a, b) -> {
        int cmp = Long.compareUnsigned(primary[a], primary[b]);
        return cmp != 0 ? cmp : Long.compareUnsigned(secondary[a], secondary[b]);
      });
      long[] p = new long[n];
      long[] s = new long[n];
      for (int i = 0; i < n; i++) {
        p[i] = primary[sorted[i]];
        s[i] = secondary[sorted[i]];
      }
      if (trial % 3 != 0) {
        int i = trial % 3 == 1 ? n - 2 : random.nextInt(n - 1);
        long t = p[i];
        p[i] = p[i + 1];
        p[i + 1] = t;
        t = s[i];
        s[i] = s[i + 1];
        s[i + 1] = t;
      }
      Integer[] expected = boxedOrder(n, (a, b) -> {
        int cmp = Long.compareUnsigned(p[a], p[b]);
        return cmp != 0 ? cmp : Long.compareUnsigned(s[a], s[b]);
      });
      assertArrayEquals(unboxed(expected), RadixSort.order(n, i -> p[i], i -> s[i]),
          "trial " + trial);
    }
  }

  @Test
  void signedKeyGivesTheSignedOrder() {
    Random random = new Random(23);
    long[] values = {Long.MIN_VALUE, -1, 0, 1, Long.MAX_VALUE, -256, 255};
    for (long a : values) {
      for (long b : values) {
        assertEquals(Long.signum(Long.compare(a, b)),
            Long.signum(Long.compareUnsigned(RadixSort.signedKey(a), RadixSort.signedKey(b))));
      }
    }
    long[] column = new long[2000];
    for (int i = 0; i < column.length; i++) {
      column[i] = random.nextBoolean() ? random.nextLong() : random.nextInt(7) - 3;
    }
    Integer[] expected = boxedOrder(column.length, (a, b) -> Long.compare(column[a],
        column[b]));
    assertArrayEquals(unboxed(expected),
        RadixSort.order(column.length, i -> RadixSort.signedKey(column[i])));
  }

  @Test
  void doubleKeyGivesTheOrderOfDoubleCompare() {
    Random random = new Random(43);
    double[] special = {0.0, -0.0, Double.NaN, Double.POSITIVE_INFINITY,
        Double.NEGATIVE_INFINITY, Double.MIN_VALUE, -Double.MIN_VALUE, Double.MAX_VALUE, -1, 1};
    double[] values = new double[400];
    for (int i = 0; i < values.length; i++) {
      values[i] = i < special.length ? special[i] : random.nextGaussian() * 10;
    }
    for (double a : values) {
      for (double b : values) {
        assertEquals(Integer.signum(Double.compare(a, b)), Integer.signum(
            Long.compareUnsigned(RadixSort.doubleKey(a), RadixSort.doubleKey(b))), a + " vs " + b);
      }
    }
  }

  @Test
  void orderOfColumnsMatchesNumpyLexsort() throws IOException {
    // reference: numpy.lexsort, a stable sort whose last key is the primary one
    PythonReference.requireModules("numpy");
    Random random = new Random(29);
    int n = 5000;
    long[] primary = new long[n];
    long[] secondary = new long[n];
    for (int i = 0; i < n; i++) {
      primary[i] = randomKey(random, 1);
      secondary[i] = randomKey(random, 2);
    }
    Path dir = Files.createTempDirectory("sunder-radix");
    try {
      Files.write(dir.resolve("primary"), littleEndian(primary));
      Files.write(dir.resolve("secondary"), littleEndian(secondary));
      String out = PythonReference.runChecked("""
          import sys, numpy as np
          d = sys.argv[1]
          p = np.fromfile(d + '/primary', '<u8')
          s = np.fromfile(d + '/secondary', '<u8')
          print(' '.join(str(i) for i in np.lexsort((s, p))))
          """, dir.toString());
      int[] expected = Arrays.stream(out.strip().split(" ")).mapToInt(Integer::parseInt)
          .toArray();
      assertArrayEquals(expected, RadixSort.order(n, i -> primary[i], i -> secondary[i]));
    } finally {
      Files.deleteIfExists(dir.resolve("primary"));
      Files.deleteIfExists(dir.resolve("secondary"));
      Files.delete(dir);
    }
  }

  @Test
  void badSizesAreRefused() {
    IllegalArgumentException lengths = assertThrows(IllegalArgumentException.class,
        () -> RadixSort.sortByKeyUnsigned(new long[3], new int[2]));
    assertTrue(lengths.getMessage().contains("3 keys but 2 values"), lengths.getMessage());
    IllegalArgumentException size = assertThrows(IllegalArgumentException.class,
        () -> RadixSort.sortByKeyUnsigned(new long[3], new int[2], 3));
    assertTrue(size.getMessage().contains("size 3 outside 0..2"), size.getMessage());
    IllegalArgumentException negative = assertThrows(IllegalArgumentException.class,
        () -> RadixSort.order(-1, i -> i));
    assertTrue(negative.getMessage().contains("-1 indices"), negative.getMessage());
  }

  /**
   * Style 0: any 64 bits; 1: a few values spread over every byte (ties, high bits set); 2: small
   * values (ties, only the low byte varies).
   */
  private static long randomKey(Random random, int style) {
    return switch (style) {
      case 0 -> random.nextLong();
      case 1 -> (random.nextInt(9) - 4) * 0x0123_4567_89AB_CDEFL;
      default -> random.nextInt(5);
    };
  }

  private static Integer[] boxedOrder(int n, Comparator<Integer> comparator) {
    Integer[] order = new Integer[n];
    for (int i = 0; i < n; i++) {
      order[i] = i;
    }
    Arrays.sort(order, comparator);
    return order;
  }

  private static int[] unboxed(Integer[] boxed) {
    return Arrays.stream(boxed).mapToInt(Integer::intValue).toArray();
  }

  private static byte[] littleEndian(long[] values) {
    ByteBuffer buffer = ByteBuffer.allocate(8 * values.length).order(ByteOrder.LITTLE_ENDIAN);
    for (long v : values) {
      buffer.putLong(v);
    }
    return buffer.array();
  }
}
