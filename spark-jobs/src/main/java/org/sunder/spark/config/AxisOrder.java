package org.sunder.spark.config;

import java.util.Arrays;

/**
 * The order in which a configuration file lists coordinates, slowest axis first, as a string of
 * axis letters ({@code "zyx"}, the default, or any permutation of {@code x}, {@code y} and, for
 * volumes, {@code z}). Converts between that order and memory order, where dimension 0 is
 * {@code x} and varies fastest.
 */
public record AxisOrder(String letters) {
  private static final String MEMORY_LETTERS = "xyz";

  /** The default order, as users coming from Python write shapes. */
  public static final AxisOrder ZYX = new AxisOrder("zyx");

  public AxisOrder {
    if (letters == null || letters.length() < 2 || letters.length() > 3) {
      throw new ConfigException("axes: expected a permutation of \"zyx\" or \"yx\", got "
          + (letters == null ? "null" : "\"" + letters + "\""));
    }
    String expected = MEMORY_LETTERS.substring(0, letters.length());
    char[] sorted = letters.toCharArray();
    Arrays.sort(sorted);
    if (!new String(sorted).equals(expected)) {
      throw new ConfigException("axes: expected a permutation of \"" + new StringBuilder(expected)
          .reverse() + "\", got \"" + letters + "\"");
    }
  }

  /** Number of spatial axes. */
  public int dimensions() {
    return letters.length();
  }

  /** Position in the file's list of memory dimension {@code d}. */
  public int filePosition(int d) {
    return letters.indexOf(MEMORY_LETTERS.charAt(d));
  }

  /** A coordinate list in file order, reordered into memory order (a new array). */
  public int[] toMemory(int[] fileOrder) {
    int[] memory = new int[fileOrder.length];
    for (int d = 0; d < memory.length; d++) {
      memory[d] = fileOrder[filePosition(d)];
    }
    return memory;
  }

  /** A coordinate list in memory order, reordered into file order (a new array). */
  public long[] toFile(long[] memory) {
    long[] file = new long[memory.length];
    for (int d = 0; d < memory.length; d++) {
      file[filePosition(d)] = memory[d];
    }
    return file;
  }

  /** A coordinate list in memory order, reordered into file order (a new array). */
  public int[] toFile(int[] memory) {
    int[] file = new int[memory.length];
    for (int d = 0; d < memory.length; d++) {
      file[filePosition(d)] = memory[d];
    }
    return file;
  }

  @Override
  public String toString() {
    return letters;
  }
}
