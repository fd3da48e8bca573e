package org.sunder.blockwise.graph;

import java.io.Serializable;
import java.util.Arrays;
import org.sunder.blockwise.ErrorKind;

/**
 * The voxel displacements of the affinity channels, in memory order (dimension 0 fastest).
 * Channel {@code k} at voxel {@code p} relates {@code p} and {@code p + vectors[k]}.
 *
 * <p>Validated on construction: at least one vector, all of one dimension, none zero, none
 * repeated. The arrays are copied in and out, so an instance is immutable. An offset is
 * <em>nearest-neighbour</em> when exactly one component is non-zero and it is {@code ±1};
 * every other offset is <em>long-range</em>.
 */
public record Offsets(int[][] vectors) implements Serializable {

  public Offsets {
    if (vectors == null || vectors.length == 0) {
      throw invalid("offsets: expected at least one offset vector, got none");
    }
    int[][] copy = new int[vectors.length][];
    for (int k = 0; k < vectors.length; k++) {
      if (vectors[k] == null || vectors[k].length == 0) {
        throw invalid("offsets[" + k + "]: expected a vector with one entry per axis, got none");
      }
      if (vectors[k].length != vectors[0].length) {
        throw invalid("offsets[" + k + "] = " + Arrays.toString(vectors[k]) + " has "
            + vectors[k].length + " entries but offsets[0] has " + vectors[0].length);
      }
      if (Arrays.stream(vectors[k]).allMatch(c -> c == 0)) {
        throw invalid("offsets[" + k + "] is the zero vector; an offset must move at least one axis");
      }
      for (int j = 0; j < k; j++) {
        if (Arrays.equals(vectors[j], vectors[k])) {
          throw invalid("offsets[" + k + "] = " + Arrays.toString(vectors[k])
              + " repeats offsets[" + j + "]");
        }
      }
      copy[k] = vectors[k].clone();
    }
    vectors = copy;
  }

  /** Offsets from vectors in memory order (x first). */
  public static Offsets of(int[]... vectors) {
    return new Offsets(vectors);
  }

  /** Offsets from vectors written slowest axis first ("zyx", as configuration files do). */
  public static Offsets fromZyx(int[][] zyxVectors) {
    if (zyxVectors == null) {
      return new Offsets(null);
    }
    int[][] memory = new int[zyxVectors.length][];
    for (int k = 0; k < zyxVectors.length; k++) {
      memory[k] = reversed(zyxVectors[k]);
    }
    return new Offsets(memory);
  }

  /** The vectors slowest axis first ("zyx"), as configuration and attributes write them. */
  public int[][] toZyx() {
    int[][] zyx = new int[vectors.length][];
    for (int k = 0; k < vectors.length; k++) {
      zyx[k] = reversed(vectors[k]);
    }
    return zyx;
  }

  /** A copy of all vectors, memory order. */
  @Override
  public int[][] vectors() {
    int[][] copy = new int[vectors.length][];
    for (int k = 0; k < vectors.length; k++) {
      copy[k] = vectors[k].clone();
    }
    return copy;
  }

  /** Number of offsets (= affinity channels). */
  public int count() {
    return vectors.length;
  }

  /** Number of axes of each vector. */
  public int dimension() {
    return vectors[0].length;
  }

  /** A copy of vector {@code k}. */
  public int[] vector(int k) {
    return vectors[k].clone();
  }

  /** Component {@code d} of vector {@code k}; no copy. */
  public int component(int k, int d) {
    return vectors[k][d];
  }

  /** The longest offset along each axis: {@code max_k |component(k, d)|} per axis {@code d}. */
  public int[] reach() {
    int[] reach = new int[dimension()];
    for (int[] vector : vectors) {
      for (int d = 0; d < reach.length; d++) {
        reach[d] = Math.max(reach[d], Math.abs(vector[d]));
      }
    }
    return reach;
  }

  /** True unless offset {@code k} is a unit step along one axis. */
  public boolean isLongRange(int k) {
    int nonZero = 0;
    int magnitude = 0;
    for (int c : vectors[k]) {
      if (c != 0) {
        nonZero++;
        magnitude = Math.abs(c);
      }
    }
    return !(nonZero == 1 && magnitude == 1);
  }

  /** Throws {@link GraphInputException} naming {@code key} unless the dimension is {@code n}. */
  public void requireDimension(int n, String key) {
    if (dimension() != n) {
      throw invalid(key + ": offsets have " + dimension() + " axes but the data has " + n
          + " spatial axes");
    }
  }

  @Override
  public boolean equals(Object o) {
    return o instanceof Offsets other && Arrays.deepEquals(vectors, other.vectors);
  }

  @Override
  public int hashCode() {
    return Arrays.deepHashCode(vectors);
  }

  @Override
  public String toString() {
    return "Offsets" + Arrays.deepToString(vectors) + " (memory order)";
  }

  private static int[] reversed(int[] v) {
    if (v == null) {
      return null;
    }
    int[] r = new int[v.length];
    for (int d = 0; d < v.length; d++) {
      r[d] = v[v.length - 1 - d];
    }
    return r;
  }

  private static GraphInputException invalid(String message) {
    return new GraphInputException(ErrorKind.INVALID_CONFIG, message);
  }
}
