package org.sunder.blockwise.partition.fragments;

import java.util.Arrays;

/**
 * Regional maxima of a scalar box restricted to the eligible voxels: connected plateaus of
 * equal value (full connectivity, {@code 3^d − 1} neighbours, inside slice planes when a slice
 * axis is given) with no eligible neighbour of larger value. Voxels with {@code eligible[i] == 0}
 * take no part at all, so every connected component of eligible voxels holds at least one
 * maximum. With every voxel eligible these are the ordinary regional maxima. Plateaus are
 * numbered 1, 2, … in the order of their first voxel in memory order. Time
 * {@code O(n · 3^d)}, memory {@code O(n)}.
 */
public final class RegionalMaxima {
  private RegionalMaxima() {}

  /** Seed labels: {@code > 0} on each maximal plateau, 0 elsewhere. */
  public static int[] label(double[] values, byte[] eligible, int[] shape, int sliceAxis) {
    int n = VoxelBox.size(shape);
    if (values.length != n || eligible.length != n) {
      throw new IllegalArgumentException("arrays do not match the box " + Arrays.toString(shape));
    }
    Neighbourhood hood = new Neighbourhood(shape, sliceAxis);
    byte[] state = new byte[n];
    for (int i = 0; i < n; i++) {
      if (eligible[i] != 0 && hasHigherNeighbour(values, eligible, hood, i)) {
        state[i] = LOWER;
      }
    }
    // A walk crosses only voxels without a larger neighbour: the part of a plateau they connect
    // is the whole plateau, or touches one of its other voxels, which has a larger neighbour.
    int[] labels = new int[n];
    int[] plateau = new int[64];
    int next = 0;
    for (int start = 0; start < n; start++) {
      if (state[start] != 0 || eligible[start] == 0) {
        continue;
      }
      double value = values[start];
      int size = 0;
      boolean maximal = true;
      plateau[size++] = start;
      state[start] = VISITED;
      for (int head = 0; head < size; head++) {
        int i = plateau[head];
        hood.locate(i);
        boolean all = hood.interior();
        for (int k = 0; k < hood.count(); k++) {
          if (!all && !hood.inside(k)) {
            continue;
          }
          int j = i + hood.delta(k);
          if (eligible[j] == 0 || values[j] != value || state[j] == VISITED) {
            continue;
          }
          if (state[j] == LOWER) {
            maximal = false;
            continue;
          }
          state[j] = VISITED;
          if (size == plateau.length) {
            plateau = Arrays.copyOf(plateau, size * 2);
          }
          plateau[size++] = j;
        }
      }
      if (maximal) {
        next++;
        for (int p = 0; p < size; p++) {
          labels[plateau[p]] = next;
        }
      }
    }
    return labels;
  }

  private static final byte LOWER = 1;
  private static final byte VISITED = 2;

  private static boolean hasHigherNeighbour(double[] values, byte[] eligible,
      Neighbourhood hood, int i) {
    double value = values[i];
    hood.locate(i);
    boolean all = hood.interior();
    for (int k = 0; k < hood.count(); k++) {
      if (all || hood.inside(k)) {
        int j = i + hood.delta(k);
        if (eligible[j] != 0 && values[j] > value) {
          return true;
        }
      }
    }
    return false;
  }

  /** The full neighbourhood of a voxel, with bounds checks by coordinate. */
  static final class Neighbourhood {
    private final int[] shape;
    private final int[] strides;
    private final int[][] steps;
    private final int[] deltas;
    private final int[] coordinate;
    private final boolean[] spans;

    Neighbourhood(int[] shape, int sliceAxis) {
      this.shape = shape;
      this.strides = VoxelBox.strides(shape);
      int dims = shape.length;
      int total = 1;
      for (int d = 0; d < dims; d++) {
        total *= d == sliceAxis ? 1 : 3;
      }
      steps = new int[total - 1][];
      deltas = new int[total - 1];
      int k = 0;
      int[] step = new int[dims];
      for (int code = 0; code < total; code++) {
        int rest = code;
        boolean zero = true;
        int delta = 0;
        for (int d = 0; d < dims; d++) {
          if (d == sliceAxis) {
            step[d] = 0;
          } else {
            step[d] = rest % 3 - 1;
            rest /= 3;
          }
          zero &= step[d] == 0;
          delta += step[d] * strides[d];
        }
        if (!zero) {
          steps[k] = step.clone();
          deltas[k++] = delta;
        }
      }
      coordinate = new int[dims];
      spans = new boolean[dims];
      for (int d = 0; d < dims; d++) {
        spans[d] = d != sliceAxis;
      }
    }

    void locate(int index) {
      int rest = index;
      for (int d = shape.length - 1; d >= 0; d--) {
        coordinate[d] = rest / strides[d];
        rest -= coordinate[d] * strides[d];
      }
    }

    int count() {
      return deltas.length;
    }

    /** Whether every neighbour of the located voxel lies in the box. */
    boolean interior() {
      for (int d = 0; d < shape.length; d++) {
        if (steps.length > 0 && (coordinate[d] == 0 || coordinate[d] == shape[d] - 1)
            && spans[d]) {
          return false;
        }
      }
      return true;
    }

    int delta(int k) {
      return deltas[k];
    }

    boolean inside(int k) {
      int[] step = steps[k];
      for (int d = 0; d < step.length; d++) {
        int c = coordinate[d] + step[d];
        if (c < 0 || c >= shape[d]) {
          return false;
        }
      }
      return true;
    }
  }
}
