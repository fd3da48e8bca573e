package org.sunder.blockwise.partition.sizefilter;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.opentest4j.AssertionFailedError;
import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.partition.ReferenceFiles;
import org.sunder.blockwise.partition.Segmentation;
import org.sunder.blockwise.partition.agglomeration.Linkage;
import org.sunder.blockwise.partition.fragments.VoxelBox;
import org.sunder.blockwise.partition.sizefilter.SizeFilter.Rule;
import org.sunder.testing.PythonReference;

public class SizeFilterTest {

  @Test
  void smallSegmentJoinsItsMostAttractedNeighbour() {
    int[] labels = {1, 1, 1, 2, 3, 3, 3};
    EdgeStatistics stats = EdgeStatistics.ofEdges(new long[] {1, 2}, new long[] {2, 3},
        new double[] {0.2, 0.7});
    Segmentation out = new SizeFilter(2, Linkage.MEAN, Rule.WITHIN_CONSTRAINTS)
        .apply(new Segmentation(labels, 3), stats, null);
    assertArrayEquals(new int[] {1, 1, 1, 2, 2, 2, 2}, out.labels());
    assertEquals(2, out.segmentCount());
    Segmentation blocked = new SizeFilter(2, Linkage.MEAN, Rule.WITHIN_CONSTRAINTS)
        .apply(new Segmentation(labels, 3), stats, new boolean[] {false, true});
    assertArrayEquals(new int[] {1, 1, 1, 1, 2, 2, 2}, blocked.labels());
  }

  @Test
  void completeRuleCrossesAConstraintOnlyWhenNothingElseIsLeft() {
    int[] labels = {1, 1, 1, 2, 3, 3, 3};
    EdgeStatistics stats = EdgeStatistics.ofEdges(new long[] {1, 2}, new long[] {2, 3},
        new double[] {0.2, -0.7});
    Segmentation in = new Segmentation(labels, 3);
    boolean[] bothConstrained = {true, true};
    assertEquals(in, new SizeFilter(2, Linkage.MEAN, Rule.WITHIN_CONSTRAINTS).apply(in, stats,
        bothConstrained), "the strict rule leaves a small segment boxed in by constraints");
    assertArrayEquals(new int[] {1, 1, 1, 1, 2, 2, 2}, new SizeFilter(2, Linkage.MEAN,
        Rule.COMPLETE).apply(in, stats, bothConstrained).labels(), "most attracted: 0.2 > -0.7");
    assertArrayEquals(new int[] {1, 1, 1, 2, 2, 2, 2}, new SizeFilter(2, Linkage.MEAN,
        Rule.COMPLETE).apply(in, stats, new boolean[] {true, false}).labels(),
        "an unconstrained neighbour wins over a more attracted constrained one");
  }

  @Test
  void segmentsOfExactlyTheThresholdAreNeverMergedAway() {
    // 1 (4 voxels) | 2 (4) | 3 (1) | 4 (6), in a row; threshold 4: only 3 is small.
    int[] labels = {1, 1, 1, 1, 2, 2, 2, 2, 3, 4, 4, 4, 4, 4, 4};
    EdgeStatistics stats = EdgeStatistics.ofEdges(new long[] {1, 2, 3}, new long[] {2, 3, 4},
        new double[] {0.9, 0.1, 0.3});
    Segmentation in = new Segmentation(labels, 4);
    for (Rule rule : Rule.values()) {
      Segmentation out = new SizeFilter(4, Linkage.MEAN, rule).apply(in, stats, null);
      assertArrayEquals(new int[] {1, 1, 1, 1, 2, 2, 2, 2, 3, 3, 3, 3, 3, 3, 3}, out.labels(),
          rule + ": 3 joins 4 (0.3 > 0.1); 1 and 2 hold exactly 4 voxels and stay apart");
      assertAtMostOneLargeInputPerOutput(in, out, 4);
    }
    // The property check catches a filter that treats "<= threshold" as small: that filter
    // would join 1 and 2 (edge 0.9), two segments of exactly 4 voxels.
    Segmentation wrong = new Segmentation(new int[] {1, 1, 1, 1, 1, 1, 1, 1, 2, 2, 2, 2, 2, 2,
        2}, 2);
    assertThrows(AssertionFailedError.class,
        () -> assertAtMostOneLargeInputPerOutput(in, wrong, 4));
  }

  @Test
  void completeRuleLeavesNoSmallSegmentThatTouchesAnother() {
    Random random = new Random(17);
    int[] shape = {13, 9, 6};
    int n = VoxelBox.size(shape);
    int exactSizes = 0;
    for (int trial = 0; trial < 60; trial++) {
      int[] labels = randomSegments(random, shape, 5 + random.nextInt(90));
      byte[] mask = new byte[n];
      for (int i = 0; i < n; i++) {
        mask[i] = (byte) (random.nextDouble() < 0.85 ? 1 : 0);
        if (mask[i] == 0) {
          labels[i] = 0;
        }
      }
      Segmentation input = Segmentation.fromClusters(labels, mask);
      EdgeStatistics stats = faceStatistics(input.labels(), shape, random);
      boolean[] flags = trial % 2 == 0 ? SizeFilter.repulsivePairs(stats)
          : randomFlags(random, stats.size(), 0.5);
      // The threshold is the exact size of some input segment, so segments of exactly the
      // threshold occur in every trial.
      long[] inputSizes = sizes(input);
      int minSize = (int) Math.max(2, inputSizes[1 + random.nextInt(input.segmentCount())]);
      for (int l = 1; l <= input.segmentCount(); l++) {
        exactSizes += inputSizes[l] == minSize ? 1 : 0;
      }
      Segmentation out = new SizeFilter(minSize, Linkage.MEAN, Rule.COMPLETE).apply(input,
          stats, flags);
      int[] outOf = assertUnionOfInputSegments(input, out, mask);
      assertAtMostOneLargeInputPerOutput(input, out, minSize);
      long[] outSizes = sizes(out);
      boolean[] touches = new boolean[out.segmentCount() + 1];
      for (int r = 0; r < stats.size(); r++) {
        int a = outOf[(int) stats.u(r)];
        int b = outOf[(int) stats.v(r)];
        if (a != b) {
          touches[a] = true;
          touches[b] = true;
        }
      }
      for (int l = 1; l <= out.segmentCount(); l++) {
        assertTrue(outSizes[l] >= minSize || !touches[l], "trial " + trial + ": segment " + l
            + " of " + outSizes[l] + " voxels (< " + minSize + ") touches another");
      }
      assertEquals(out, new SizeFilter(minSize, Linkage.MEAN, Rule.COMPLETE).apply(input,
          stats, flags), "deterministic");
    }
    assertTrue(exactSizes >= 60, "segments of exactly the threshold were tested");
  }

  /**
   * External check: a plain Python transcription of the rule (numpy for the region adjacency,
   * a naive loop that rescans all groups before every merge) on random segmentations with
   * repulsive edges, for both rules. Weights are multiples of 1/4, so sums and means are exact
   * in both languages and ties are frequent.
   */
  @Test
  void agreesWithAPlainPythonTranscription(@TempDir Path dir) throws Exception {
    PythonReference.requireModules("numpy");
    Random random = new Random(29);
    int[] shape = {9, 7, 5};
    int n = VoxelBox.size(shape);
    int[] strides = VoxelBox.strides(shape);
    List<String> manifest = new ArrayList<>();
    List<int[]> ours = new ArrayList<>();
    int merges = 0;
    boolean rulesDiffer = false;
    for (int trial = 0; trial < 16; trial++) {
      int[] labels = randomSegments(random, shape, 8 + random.nextInt(50));
      byte[] mask = new byte[n];
      for (int i = 0; i < n; i++) {
        mask[i] = (byte) (random.nextDouble() < 0.9 ? 1 : 0);
      }
      Segmentation input = Segmentation.fromClusters(labels, mask);
      double[] weights = new double[3 * n];
      EdgeStatistics.Accumulator acc = new EdgeStatistics.Accumulator(64);
      int[] c = new int[3];
      for (int i = 0; i < n; i++) {
        for (int d = 0; d < 3; d++) {
          weights[d * n + i] = (random.nextInt(13) - 4) / 4.0;
          int a = input.labels()[i];
          if (c[d] > 0) {
            int b = input.labels()[i - strides[d]];
            if (a != b && a > 0 && b > 0) {
              acc.add(a, b, weights[d * n + i]);
            }
          }
        }
        VoxelBox.advance(c, shape);
      }
      EdgeStatistics stats = acc.build();
      Rule rule = Rule.values()[trial % 2];
      int minSize = 2 + random.nextInt(30);
      Segmentation filtered = new SizeFilter(minSize, Linkage.MEAN, rule).apply(input, stats,
          SizeFilter.repulsivePairs(stats));
      ours.add(filtered.labels());
      merges += input.segmentCount() - filtered.segmentCount();
      Rule other = Rule.values()[(trial + 1) % 2];
      rulesDiffer |= !filtered.equals(new SizeFilter(minSize, Linkage.MEAN, other).apply(input,
          stats, SizeFilter.repulsivePairs(stats)));
      ReferenceFiles.write(dir, "labels" + trial, input.labels());
      ReferenceFiles.write(dir, "weights" + trial, weights);
      manifest.add(trial + " " + shape[0] + " " + shape[1] + " " + shape[2] + " " + minSize
          + " " + rule.jsonName());
    }
    assertTrue(merges > 50 && rulesDiffer, "the cases exercise merging across repulsion");
    Files.write(dir.resolve("manifest"), manifest);
    String out = PythonReference.runChecked("""
        import sys, numpy as np
        d = sys.argv[1]
        for line in open(d + '/manifest'):
            t, sx, sy, sz, T, rule = line.split()
            sx, sy, sz, T = int(sx), int(sy), int(sz), int(T)
            lab = np.fromfile(f'{d}/labels{t}', '<i4').reshape(sz, sy, sx)
            w = np.fromfile(f'{d}/weights{t}', '<f8').reshape(3, sz, sy, sx)
            pairs = {}
            for jd in range(3):  # memory axis jd is numpy axis 2 - jd
                ax = 2 - jd
                hi = [slice(None)] * 3; hi[ax] = slice(1, None)
                lo = [slice(None)] * 3; lo[ax] = slice(None, -1)
                a, b = lab[tuple(hi)].ravel(), lab[tuple(lo)].ravel()
                ww = w[jd][tuple(hi)].ravel()
                keep = (a != b) & (a > 0) & (b > 0)
                for x, y, v in zip(a[keep], b[keep], ww[keep]):
                    k = (min(x, y), max(x, y))
                    s = pairs.setdefault(k, [0.0, 0, np.inf])
                    s[0] += v; s[1] += 1; s[2] = min(s[2], v)
            size = np.bincount(lab.ravel())
            group = {l: {l} for l in range(1, len(size)) if size[l] > 0}
            gsize = {l: int(size[l]) for l in group}
            owner = {l: l for l in group}
            tie = {l: l for l in group}  # lowest label while small, fixed once not
            def links(g):
                out = {}
                for (x, y), (s, c, m) in pairs.items():
                    gx, gy = owner[x], owner[y]
                    if gx == gy or g not in (gx, gy):
                        continue
                    h = gy if gx == g else gx
                    o = out.setdefault(h, [0.0, 0, np.inf])
                    o[0] += s; o[1] += c; o[2] = min(o[2], m)
                return out
            while True:
                best = None
                for g in sorted(group, key=lambda g: (gsize[g], tie[g])):
                    if gsize[g] >= T:
                        break
                    options = [(m >= 0, s / c, -tie[h], h)
                               for h, (s, c, m) in links(g).items()]
                    if rule == 'within-constraints':
                        options = [o for o in options if o[0]]
                    if options:
                        best = (g, max(options)[3])
                        break
                if best is None:
                    break
                g, h = best
                tie[g] = min(tie[g], tie[h]) if gsize[h] < T else tie[h]
                group[g] |= group.pop(h)
                gsize[g] += gsize.pop(h)
                for l in group[g]:
                    owner[l] = g
            flat = lab.ravel()
            result, names = [], {}
            for l in flat:
                if l == 0:
                    result.append(0)
                else:
                    result.append(names.setdefault(owner[l], len(names) + 1))
            print(' '.join(map(str, result)))
        """, dir.toString());
    String[] lines = out.strip().split("\n");
    assertEquals(ours.size(), lines.length);
    for (int t = 0; t < lines.length; t++) {
      int[] reference = Arrays.stream(lines[t].trim().split(" ")).mapToInt(Integer::parseInt)
          .toArray();
      assertArrayEquals(reference, ours.get(t), "trial " + t + " (" + manifest.get(t) + ")");
    }
  }

  /**
   * The property a filter by parts rests on: each connected set of small segments, filtered
   * with only the segments beside it, is grouped as in the whole graph's filter. Random graphs,
   * weights multiples of 1/4 (frequent ties), both rules.
   */
  @Test
  void eachSetOfSmallSegmentsIsFilteredAsIfAlone() {
    Random random = new Random(83);
    int checkedSets = 0;
    for (int trial = 0; trial < 200; trial++) {
      int count = 5 + random.nextInt(40);
      int minSize = 10;
      long[] sizes = new long[count];
      for (int c = 0; c < count; c++) {
        sizes[c] = random.nextInt(3) == 0 ? 10 + random.nextInt(30) : 1 + random.nextInt(6);
      }
      EdgeStatistics.Accumulator acc = new EdgeStatistics.Accumulator(64);
      for (int p = 0; p < 2 * count; p++) {
        int a = random.nextInt(count);
        int b = random.nextInt(count);
        if (a != b) {
          acc.add(a + 1, b + 1, (random.nextInt(9) - 3) / 4.0);
        }
      }
      EdgeStatistics stats = acc.build();
      SizeFilter filter = new SizeFilter(minSize, Linkage.MEAN, Rule.values()[trial % 2]);
      boolean[] flags = SizeFilter.repulsivePairs(stats);
      int[] whole = filter.groups(sizes, stats, flags, null);
      int[] set = new int[count];
      for (int c = 0; c < count; c++) {
        set[c] = c;
      }
      for (int e = 0; e < stats.size(); e++) {
        int a = (int) stats.u(e) - 1;
        int b = (int) stats.v(e) - 1;
        if (sizes[a] < minSize && sizes[b] < minSize) {
          set[root(set, a)] = root(set, b);
        }
      }
      for (int s = 0; s < count; s++) {
        if (sizes[s] >= minSize || root(set, s) != s) {
          continue;
        }
        // the set of s and the large segments beside it, numbered in the whole graph's order
        boolean[] member = new boolean[count];
        List<Integer> rows = new ArrayList<>();
        for (int c = 0; c < count; c++) {
          member[c] |= sizes[c] < minSize && root(set, c) == s;
        }
        for (int e = 0; e < stats.size(); e++) {
          int a = (int) stats.u(e) - 1;
          int b = (int) stats.v(e) - 1;
          if (sizes[a] < minSize && root(set, a) == s || sizes[b] < minSize && root(set, b) == s) {
            member[a] = true;
            member[b] = true;
            rows.add(e);
          }
        }
        int[] index = new int[count];
        int k = 0;
        for (int c = 0; c < count; c++) {
          index[c] = member[c] ? k++ : -1;
        }
        long[] subSizes = new long[k];
        for (int c = 0; c < count; c++) {
          if (member[c]) {
            subSizes[index[c]] = sizes[c];
          }
        }
        int m = rows.size();
        long[] u = new long[m];
        long[] v = new long[m];
        double[] sum = new double[m];
        long[] edges = new long[m];
        double[] min = new double[m];
        double[] max = new double[m];
        boolean[] subFlags = new boolean[m];
        for (int r = 0; r < m; r++) {
          int e = rows.get(r);
          u[r] = index[(int) stats.u(e) - 1] + 1;
          v[r] = index[(int) stats.v(e) - 1] + 1;
          sum[r] = stats.sum(e);
          edges[r] = stats.count(e);
          min[r] = stats.min(e);
          max[r] = stats.max(e);
          subFlags[r] = flags[e];
        }
        // the numbering keeps the order, so the rows (and flags) stay in the same order
        int[] alone = filter.groups(subSizes, EdgeStatistics.of(u, v, sum, edges, min, max),
            subFlags, null);
        for (int a = 0; a < count; a++) {
          for (int b = 0; b < count; b++) {
            if (member[a] && member[b] && (sizes[a] < minSize || sizes[b] < minSize)) {
              assertEquals(whole[a] == whole[b], alone[index[a]] == alone[index[b]],
                  "trial " + trial + ": segments " + a + " and " + b);
            }
          }
        }
        checkedSets++;
      }
    }
    assertTrue(checkedSets > 300, checkedSets + " sets checked");
  }

  private static int root(int[] parent, int x) {
    while (parent[x] != x) {
      x = parent[x];
    }
    return x;
  }

  @Test
  void leftAloneSegmentsAreNeverMergedAwayButMayAbsorb() {
    // 1 (1 voxel, left alone) | 2 (1) | 3 (5); threshold 3.
    int[] labels = {1, 2, 3, 3, 3, 3, 3};
    EdgeStatistics stats = EdgeStatistics.ofEdges(new long[] {1, 2}, new long[] {2, 3},
        new double[] {0.8, 0.1});
    Segmentation in = new Segmentation(labels, 3);
    SizeFilter filter = new SizeFilter(3, Linkage.MEAN, Rule.COMPLETE);
    assertArrayEquals(new int[] {1, 1, 2, 2, 2, 2, 2},
        filter.apply(in, stats, null, new boolean[] {false, true, false, false}).labels(),
        "2 joins the left-alone 1 (0.8 > 0.1); the pair, left alone, stays small");
    assertArrayEquals(new int[] {1, 1, 1, 1, 1, 1, 1},
        filter.apply(in, stats, null, null).labels(), "without it, 1+2 (2 voxels) joins 3");
    int[] groups = filter.groups(new long[] {1, 1, 5}, stats, null, null);
    assertTrue(groups[0] == groups[1] && groups[1] == groups[2],
        "the graph form joins the same three: " + Arrays.toString(groups));
    int[] alone = filter.groups(new long[] {1, 1, 5}, stats, null,
        new boolean[] {true, false, false});
    assertTrue(alone[0] == alone[1] && alone[1] != alone[2], Arrays.toString(alone));
  }

  @Test
  void randomSegmentationsKeepMaskNeverCrossConstraintsAndLeaveOnlyStuckSmallSegments() {
    Random random = new Random(13);
    int[] shape = {13, 9, 6};
    int n = VoxelBox.size(shape);
    for (int trial = 0; trial < 40; trial++) {
      int[] labels = randomSegments(random, shape, 5 + random.nextInt(60));
      byte[] mask = new byte[n];
      for (int i = 0; i < n; i++) {
        mask[i] = (byte) (random.nextDouble() < 0.9 ? 1 : 0);
        if (mask[i] == 0) {
          labels[i] = 0;
        }
      }
      Segmentation input = Segmentation.fromClusters(labels, mask);
      EdgeStatistics stats = faceStatistics(input.labels(), shape, random);
      boolean[] flags = new boolean[stats.size()];
      for (int r = 0; r < flags.length; r++) {
        flags[r] = trial % 3 != 0 && random.nextDouble() < 0.25;
      }
      int minSize = 2 + random.nextInt(40);
      Linkage linkage = Linkage.values()[trial % Linkage.values().length];
      Segmentation out = new SizeFilter(minSize, linkage, Rule.WITHIN_CONSTRAINTS).apply(input,
          stats, flags);
      int[] outOf = assertUnionOfInputSegments(input, out, mask);
      for (int r = 0; r < stats.size(); r++) {
        if (flags[r]) {
          assertNotEquals(outOf[(int) stats.u(r)], outOf[(int) stats.v(r)],
              "pair " + r + " was merged across a constraint");
        }
      }
      assertSmallSegmentsAreStuck(out, stats, flags, outOf, minSize);
    }
  }

  @Test
  void thresholdOfOneOrZeroChangesNothing() {
    int[] labels = {1, 2, 3};
    Segmentation s = new Segmentation(labels, 3);
    EdgeStatistics stats = EdgeStatistics.ofEdges(new long[] {1}, new long[] {2},
        new double[] {1});
    assertEquals(s, new SizeFilter(1, Linkage.SUM, Rule.COMPLETE).apply(s, stats, null));
    assertEquals(s, new SizeFilter(0, Linkage.SUM, Rule.COMPLETE).apply(s, stats, null));
  }

  /**
   * Merges only ever join a segment below the threshold to another, so no output segment holds
   * two input segments of at least {@code minSize} voxels.
   */
  private static void assertAtMostOneLargeInputPerOutput(Segmentation in, Segmentation out,
      int minSize) {
    long[] inSizes = sizes(in);
    int[] largeInputs = new int[out.segmentCount() + 1];
    boolean[] counted = new boolean[in.segmentCount() + 1];
    for (int i = 0; i < in.labels().length; i++) {
      int a = in.labels()[i];
      if (a > 0 && !counted[a] && inSizes[a] >= minSize) {
        counted[a] = true;
        int b = out.labels()[i];
        assertTrue(++largeInputs[b] <= 1, "output segment " + b + " joins two input segments "
            + "of at least " + minSize + " voxels");
      }
    }
  }

  private static long[] sizes(Segmentation s) {
    long[] sizes = new long[s.segmentCount() + 1];
    for (int l : s.labels()) {
      sizes[l]++;
    }
    return sizes;
  }

  private static boolean[] randomFlags(Random random, int count, double share) {
    boolean[] flags = new boolean[count];
    for (int r = 0; r < count; r++) {
      flags[r] = random.nextDouble() < share;
    }
    return flags;
  }

  private static int[] assertUnionOfInputSegments(Segmentation in, Segmentation out,
      byte[] mask) {
    int[] outOf = new int[in.segmentCount() + 1];
    int next = 0;
    for (int i = 0; i < in.labels().length; i++) {
      int a = in.labels()[i];
      int b = out.labels()[i];
      assertEquals(mask[i] == 0, b == 0, "masked voxels stay 0, others get a label");
      if (a > 0) {
        assertTrue(outOf[a] == 0 || outOf[a] == b, "an input segment was split");
        outOf[a] = b;
        assertTrue(b <= next + 1, "labels numbered in order of first voxel");
        next = Math.max(next, b);
      }
    }
    assertEquals(next, out.segmentCount());
    return outOf;
  }

  private static void assertSmallSegmentsAreStuck(Segmentation out, EdgeStatistics stats,
      boolean[] flags, int[] outOf, int minSize) {
    int[] size = new int[out.segmentCount() + 1];
    for (int l : out.labels()) {
      size[l]++;
    }
    Map<Long, Boolean> constrained = new HashMap<>();
    for (int r = 0; r < stats.size(); r++) {
      int a = outOf[(int) stats.u(r)];
      int b = outOf[(int) stats.v(r)];
      if (a != b) {
        constrained.merge((long) Math.min(a, b) << 32 | Math.max(a, b), flags[r],
            Boolean::logicalOr);
      }
    }
    for (Map.Entry<Long, Boolean> pair : constrained.entrySet()) {
      int a = (int) (pair.getKey() >>> 32);
      int b = (int) (long) pair.getKey();
      if (!pair.getValue()) {
        assertTrue(size[a] >= minSize && size[b] >= minSize, "segments " + a + " (" + size[a]
            + ") and " + b + " (" + size[b] + ") could still merge; minimum " + minSize);
      }
    }
  }

  public static int[] randomSegments(Random random, int[] shape, int seeds) {
    int n = VoxelBox.size(shape);
    int[][] points = new int[seeds][3];
    for (int[] p : points) {
      for (int d = 0; d < 3; d++) {
        p[d] = random.nextInt(shape[d]);
      }
    }
    int[] labels = new int[n];
    int[] c = new int[3];
    for (int i = 0; i < n; i++) {
      int best = 0;
      long bestDistance = Long.MAX_VALUE;
      for (int s = 0; s < seeds; s++) {
        long d = 0;
        for (int k = 0; k < 3; k++) {
          long x = c[k] - points[s][k];
          d += x * x;
        }
        if (d < bestDistance) {
          bestDistance = d;
          best = s;
        }
      }
      labels[i] = best;
      VoxelBox.advance(c, shape);
    }
    return labels;
  }

  static EdgeStatistics faceStatistics(int[] labels, int[] shape, Random random) {
    int[] strides = VoxelBox.strides(shape);
    EdgeStatistics.Accumulator acc = new EdgeStatistics.Accumulator(64);
    int[] c = new int[3];
    for (int i = 0; i < labels.length; i++) {
      for (int d = 0; d < 3; d++) {
        if (c[d] > 0) {
          int j = i - strides[d];
          if (labels[i] != labels[j] && labels[i] > 0 && labels[j] > 0) {
            acc.add(labels[i], labels[j], random.nextGaussian());
          }
        }
      }
      VoxelBox.advance(c, shape);
    }
    return acc.build();
  }
}
