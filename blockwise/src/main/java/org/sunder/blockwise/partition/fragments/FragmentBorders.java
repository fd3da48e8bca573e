package org.sunder.blockwise.partition.fragments;

import java.util.Arrays;
import org.sunder.blockwise.collections.UnionFind;
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
 * therefore moves its voxels in its context (every channel, a halo or more around the block),
 * where their choices are a whole-volume run's wherever the context holds those edges and the
 * watershed's fragments. Time: one pass over the edge slots, reading the affinities of the
 * border voxels' edges only (16–19 % of the voxels on the sectioned presets), with no logarithm
 * per edge under the default logit weights (their sum is the logarithm of a product of odds).
 * Memory: 9 bytes per voxel and {@code 12 · (1 + 2·axes)} per border voxel during the pass over
 * the edges, 21 per voxel in all at a fifth of the voxels on the border; 12 per voxel for the
 * pieces after.
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
    return reassign(labels, graph, ignoredOrNull, sliceAxis, new int[shape.length], shape);
  }

  /**
   * As {@link #reassign(int[], GridGraph, byte[], int)}, moving only the border voxels in the
   * box from {@code movableMin} (inclusive) to {@code movableMax} (exclusive), coordinates in
   * {@code graph}'s box: a block moves the voxels its result keeps, whose moves read the context
   * around them, and leaves the rest of the context as the watershed made it.
   */
  static int[] reassign(int[] labels, GridGraph graph, byte[] ignoredOrNull, int sliceAxis,
      int[] movableMin, int[] movableMax) {
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
      if (own != 0 && (ignoredOrNull == null || ignoredOrNull[i] == 0)
          && within(coordinate, movableMin, movableMax)) {
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
    // per candidate, the product of the odds of its edges under an unbiased logit rule whose
    // products stay in the double range (then no logarithm per edge), else the sum of their
    // weights; NaN until an edge into it counts
    double[] scores = new double[borders * width];
    Arrays.fill(scores, Double.NaN);
    byte[] marked = new byte[n];
    for (int i = 0; i < n; i++) {
      marked[i] = (byte) (slot[i] >= 0 ? 1 : 0);
    }
    // the fragment an edge's end counts for: 0 for ignored voxels, whose edges count for nothing
    // (and which have no slot)
    int[] counting = ignoredOrNull == null ? labels : withoutIgnored(labels, ignoredOrNull);
    int[] table = candidates;
    double clamp = oddsClamp(graph);
    if (Double.isNaN(clamp)) {
      graph.forEachEdgeTouching(marked, (s, t, k, w) -> {
        addWeight(slot[s], counting[t], w, table, scores, width);
        addWeight(slot[t], counting[s], w, table, scores, width);
      });
    } else {
      graph.forEachAffinityTouching(marked, (s, t, k, a) -> {
        double c = Math.min(Math.max(a, clamp), 1 - clamp);
        double odds = c / (1 - c);
        multiplyOdds(slot[s], counting[t], odds, table, scores, width);
        multiplyOdds(slot[t], counting[s], odds, table, scores, width);
      });
    }
    int[] moved = labels.clone();
    for (int i = 0; i < n; i++) {
      int b = slot[i];
      if (b < 0) {
        continue;
      }
      int at = b * width;
      int best = at;
      for (int c = at + 1; c < at + width && table[c] != 0; c++) {
        if (!Double.isNaN(scores[c]) && (Double.isNaN(scores[best]) || scores[c] > scores[best])) {
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
      int label = labels[i];
      boolean left = label != 0 && coordinate[0] > 0 && labels[i - 1] == label;
      parent[i] = left ? UnionFind.root(parent, i - 1) : i;
      int axes = label == 0 ? 0 : shape.length;
      for (int d = 1; d < axes; d++) {
        int below = i - strides[d];
        // when the voxel before and the one below it have this label too, they already tie
        // the voxel below to this one
        if (coordinate[d] > 0 && labels[below] == label
            && !(left && labels[below - 1] == label)) {
          UnionFind.union(parent, i, below);
        }
      }
      VoxelBox.advance(coordinate, shape);
    }
    int[] pieces = new int[n];
    int count = 0;
    for (int i = 0, x = 0; i < n; i++, x = x + 1 == shape[0] ? 0 : x + 1) {
      if (labels[i] == 0) {
        continue;
      }
      if (x > 0 && labels[i - 1] == labels[i]) {
        pieces[i] = pieces[i - 1];
      } else {
        int root = UnionFind.root(parent, i);
        pieces[i] = root == i ? ++count : pieces[root];
      }
    }
    return ignoredOrNull == null ? pieces
        : joinIgnoredPieces(pieces, count, shape, strides, ignoredOrNull);
  }

  /** See {@link #connectedPieces}; {@code pieces} 1..count in order of first voxel. */
  private static int[] joinIgnoredPieces(int[] pieces, int count, int[] shape, int[] strides,
      byte[] ignored) {
    int n = pieces.length;
    int[] parent = UnionFind.singletons(count + 1);
    boolean[] counted = new boolean[count + 1];
    for (int i = 0; i < n; i++) {
      counted[pieces[i]] |= pieces[i] != 0 && ignored[i] == 0;
    }
    int[] coordinate = new int[shape.length];
    boolean joinedAny = false;
    for (boolean joined = true; joined; ) {
      joined = false;
      Arrays.fill(coordinate, 0);
      for (int i = 0; i < n; i++) {
        int touched = pieces[i] == 0 || counted[UnionFind.root(parent, pieces[i])] ? 0
            : countedNeighbour(i, pieces, shape, strides, coordinate, parent, counted);
        if (touched != 0) {
          UnionFind.union(parent, pieces[i], touched);
          counted[UnionFind.root(parent, touched)] = true;
          joined = true;
          joinedAny = true;
        }
        VoxelBox.advance(coordinate, shape);
      }
    }
    if (!joinedAny) {
      return pieces;
    }
    int[] renumbered = new int[count + 1];
    int[] out = new int[n];
    int joinedCount = 0;
    for (int i = 0; i < n; i++) {
      if (pieces[i] != 0) {
        int root = UnionFind.root(parent, pieces[i]);
        out[i] = renumbered[root] != 0 ? renumbered[root] : (renumbered[root] = ++joinedCount);
      }
    }
    return out;
  }

  /**
   * The piece of the first face neighbour (−x, +x, −y, …) of {@code i} in a set of pieces with
   * a counted voxel, or 0.
   */
  private static int countedNeighbour(int i, int[] pieces, int[] shape, int[] strides,
      int[] coordinate, int[] parent, boolean[] counted) {
    for (int d = 0; d < shape.length; d++) {
      int below = i - strides[d];
      if (coordinate[d] > 0 && pieces[below] != 0
          && counted[UnionFind.root(parent, pieces[below])]) {
        return pieces[below];
      }
      int above = i + strides[d];
      if (coordinate[d] < shape[d] - 1 && pieces[above] != 0
          && counted[UnionFind.root(parent, pieces[above])]) {
        return pieces[above];
      }
    }
    return 0;
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

  private static boolean within(int[] coordinate, int[] min, int[] max) {
    for (int d = 0; d < coordinate.length; d++) {
      if (coordinate[d] < min[d] || coordinate[d] >= max[d]) {
        return false;
      }
    }
    return true;
  }

  private static int[] withoutIgnored(int[] labels, byte[] ignored) {
    int[] out = new int[labels.length];
    for (int i = 0; i < labels.length; i++) {
      out[i] = ignored[i] == 0 ? labels[i] : 0;
    }
    return out;
  }

  /**
   * The clamp of {@code graph}'s rule when it is an unbiased logit rule and a voxel's product of
   * odds (at most two edges per offset, each odds within [clamp / (1 − clamp), its inverse])
   * stays within the double range, else NaN.
   */
  static double oddsClamp(GridGraph graph) {
    double clamp = graph.rule().unbiasedLogitClamp();
    double decades = 2 * graph.offsetCount() * Math.log10((1 - clamp) / clamp);
    return decades < 300 ? clamp : Double.NaN;
  }

  private static void addWeight(int border, int label, float w, int[] candidates,
      double[] scores, int width) {
    int c = candidate(border, label, candidates, width);
    if (c >= 0) {
      scores[c] = (Double.isNaN(scores[c]) ? 0 : scores[c]) + w;
    }
  }

  private static void multiplyOdds(int border, int label, double odds, int[] candidates,
      double[] scores, int width) {
    int c = candidate(border, label, candidates, width);
    if (c >= 0) {
      scores[c] = (Double.isNaN(scores[c]) ? 1 : scores[c]) * odds;
    }
  }

  /** Where {@code label} sits among the candidates of border voxel {@code border}, or −1. */
  private static int candidate(int border, int label, int[] candidates, int width) {
    if (border < 0 || label == 0) {
      return -1;
    }
    int at = border * width;
    for (int c = at; c < at + width && candidates[c] != 0; c++) {
      if (candidates[c] == label) {
        return c;
      }
    }
    return -1;
  }
}
