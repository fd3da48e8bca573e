package org.sunder.blockwise.partition.fragments;

import java.util.Arrays;
import org.sunder.blockwise.graph.GridGraph;

/**
 * Puts the voxels along fragment borders on the side their edges say they belong to.
 *
 * <p>A network predicts boundaries a voxel or two too wide, and its nearest-neighbour
 * affinities then read "boundary" on both sides of the true one, so the watershed's line runs
 * anywhere in that band: on the presets 2.5–5 % of the voxels lie in a fragment of another
 * object, and each such voxel's long-range edges then repel its fragment from its own object.
 * The long-range channels are not widened: an edge from such a voxel three voxels into its own
 * object reads "same object". So each <em>border voxel</em> (a face neighbour, in its slice when
 * fragments are made per slice, lies in another fragment) moves to the fragment, among its own
 * and its face neighbours', whose voxels its edges attract most: the largest sum of the weights
 * of its edges (every offset, both directions) into that fragment. One simultaneous pass from
 * the watershed's labels, as a sweep of iterated conditional modes ("On the statistical
 * analysis of dirty pictures", 1986); ties and voxels with no such edge keep their fragment,
 * and the fragment a voxel has no edge into cannot win. Edges with an end in {@code ignored}
 * count for nothing.
 *
 * <p>Only fragments made per section move ({@link BlockFragments}): a block's 3D fragments
 * differ from the whole volume's near its sides (they flood from beyond its context), and moves,
 * which read labels up to the longest offset away, carried those differences that far inward
 * (compact cells, 27 blocks: 0.015–0.038 bits from the whole-volume result, 0.024 and 0.031 on
 * average over two sets of seeds, against about 0.008, though the whole volume's error fell by
 * a third).
 *
 * <p>A voxel's choice reads the edges and labels within the graph's longest offset; a block
 * therefore moves the voxels of its context (every channel, a halo or more around the block),
 * whose choices are a whole-volume run's wherever the context holds those edges and the
 * watershed's fragments. Time: one pass over the edge slots, weights computed for the border
 * voxels' edges only; memory about {@code 13 · (1 + 2·axes)} bytes per border voxel and 20 per
 * voxel.
 */
final class FragmentBorders {
  private FragmentBorders() {}

  /**
   * The labels with every border voxel moved as above, then split into face-connected pieces
   * (every axis), renumbered 1..count in order of first voxel (a fragment all of whose voxels
   * moved is gone); 0 stays 0.
   *
   * @param labels fragments of {@code graph}'s box, 1..count, 0 where masked; not modified
   * @param ignoredOrNull per voxel, non-zero where the voxel's edges count for nothing
   * @param sliceAxis the axis whose planes hold the fragments apart, or −1
   */
  static int[] reassign(int[] labels, GridGraph graph, byte[] ignoredOrNull, int sliceAxis) {
    int[] shape = graph.block().shape();
    int n = labels.length;
    int[] strides = VoxelBox.strides(shape);
    int width = 1 + 2 * (sliceAxis >= 0 ? shape.length - 1 : shape.length);
    // per border voxel, `width` candidate fragments: its own first, then its face neighbours'
    int[] slot = new int[n];
    Arrays.fill(slot, -1);
    int borders = 0;
    int[] candidates = new int[Math.max(16, n / 8) * width];
    int[] coordinate = new int[shape.length];
    for (int i = 0; i < n; i++) {
      int own = labels[i];
      if (own != 0 && (ignoredOrNull == null || ignoredOrNull[i] == 0)) {
        int at = borders * width;
        if (at + width > candidates.length) {
          candidates = Arrays.copyOf(candidates, 2 * candidates.length);
        }
        int count = 1;
        for (int d = 0; d < shape.length; d++) {
          if (d == sliceAxis) {
            continue;
          }
          if (coordinate[d] > 0) {
            count = addCandidate(candidates, at, count, own, labels[i - strides[d]]);
          }
          if (coordinate[d] < shape[d] - 1) {
            count = addCandidate(candidates, at, count, own, labels[i + strides[d]]);
          }
        }
        if (count > 1) {
          candidates[at] = own;
          Arrays.fill(candidates, at + count, at + width, 0);
          slot[i] = borders++;
        }
      }
      VoxelBox.advance(coordinate, shape);
    }
    double[] sums = new double[borders * width];
    byte[] counted = new byte[borders * width];
    byte[] marked = new byte[n];
    for (int i = 0; i < n; i++) {
      marked[i] = (byte) (slot[i] >= 0 ? 1 : 0);
    }
    int[] table = candidates;
    graph.forEachEdgeTouching(marked, (s, t, k, w) -> {
      if (ignoredOrNull != null && (ignoredOrNull[s] | ignoredOrNull[t]) != 0) {
        return;
      }
      add(slot[s], labels[t], w, table, sums, counted, width);
      add(slot[t], labels[s], w, table, sums, counted, width);
    });
    int[] moved = labels.clone();
    for (int i = 0; i < n; i++) {
      int b = slot[i];
      if (b < 0) {
        continue;
      }
      int at = b * width;
      int best = at;
      for (int c = at + 1; c < at + width && table[c] != 0; c++) {
        if (counted[c] != 0 && (counted[best] == 0 || sums[c] > sums[best])) {
          best = c;
        }
      }
      moved[i] = table[best];
    }
    return connectedPieces(moved, shape, strides, ignoredOrNull);
  }

  /**
   * Each label's face-connected pieces as labels 1..count in order of first voxel: a move can
   * cut a fragment's narrow neck, and a fragment must be one piece. All axes: a fragment made
   * per slice lies in one plane, but a defective plane shares the fragments of its sound
   * neighbour ({@link DefectiveSections#adopt}). A piece of ignored voxels only (which stay put
   * and whose edges count for nothing, so they would stay a segment of their own) joins the
   * first piece with a counted voxel that it touches, in voxel order, sweeping until none
   * joins.
   */
  private static int[] connectedPieces(int[] labels, int[] shape, int[] strides,
      byte[] ignoredOrNull) {
    int n = labels.length;
    int[] parent = new int[n];
    int[] coordinate = new int[shape.length];
    for (int i = 0; i < n; i++) {
      parent[i] = i;
      for (int d = 0; d < shape.length; d++) {
        if (coordinate[d] > 0 && labels[i] != 0
            && labels[i - strides[d]] == labels[i]) {
          union(parent, i, i - strides[d]);
        }
      }
      VoxelBox.advance(coordinate, shape);
    }
    if (ignoredOrNull != null) {
      joinIgnoredPieces(labels, shape, strides, ignoredOrNull, parent);
    }
    int[] pieces = new int[n];
    int count = 0;
    for (int i = 0; i < n; i++) {
      if (labels[i] != 0) {
        int root = find(parent, i);
        pieces[i] = root == i ? ++count : pieces[root];
      }
    }
    return pieces;
  }

  private static void joinIgnoredPieces(int[] labels, int[] shape, int[] strides,
      byte[] ignored, int[] parent) {
    int n = labels.length;
    boolean[] counted = new boolean[n];
    for (int i = 0; i < n; i++) {
      counted[find(parent, i)] |= labels[i] != 0 && ignored[i] == 0;
    }
    int[] coordinate = new int[shape.length];
    boolean joined = true;
    while (joined) {
      joined = false;
      Arrays.fill(coordinate, 0);
      for (int i = 0; i < n; i++) {
        int touched = labels[i] == 0 || counted[find(parent, i)] ? -1
            : countedNeighbour(i, labels, shape, strides, coordinate, parent, counted);
        if (touched >= 0) {
          union(parent, i, touched);
          counted[find(parent, i)] = true;
          joined = true;
        }
        VoxelBox.advance(coordinate, shape);
      }
    }
  }

  /** The first face neighbour (−x, +x, −y, …) of {@code i} in a piece with a counted voxel. */
  private static int countedNeighbour(int i, int[] labels, int[] shape, int[] strides,
      int[] coordinate, int[] parent, boolean[] counted) {
    for (int d = 0; d < shape.length; d++) {
      int below = i - strides[d];
      if (coordinate[d] > 0 && labels[below] != 0 && counted[find(parent, below)]) {
        return below;
      }
      int above = i + strides[d];
      if (coordinate[d] < shape[d] - 1 && labels[above] != 0 && counted[find(parent, above)]) {
        return above;
      }
    }
    return -1;
  }

  private static int find(int[] parent, int i) {
    while (parent[i] != i) {
      parent[i] = parent[parent[i]];
      i = parent[i];
    }
    return i;
  }

  /** Joins the sets of {@code i} and {@code j}, the smaller root becoming the root. */
  private static void union(int[] parent, int i, int j) {
    int a = find(parent, i);
    int b = find(parent, j);
    if (a != b) {
      parent[Math.max(a, b)] = Math.min(a, b);
    }
  }

  /** Appends {@code label} to the candidates at {@code at} unless it is 0 or there already. */
  private static int addCandidate(int[] candidates, int at, int count, int own, int label) {
    if (label == 0 || label == own) {
      return count;
    }
    for (int c = at + 1; c < at + count; c++) {
      if (candidates[c] == label) {
        return count;
      }
    }
    candidates[at + count] = label;
    return count + 1;
  }

  private static void add(int border, int label, float w, int[] candidates, double[] sums,
      byte[] counted, int width) {
    if (border < 0 || label == 0) {
      return;
    }
    int at = border * width;
    for (int c = at; c < at + width && candidates[c] != 0; c++) {
      if (candidates[c] == label) {
        sums[c] += w;
        counted[c] = 1;
        return;
      }
    }
  }
}
