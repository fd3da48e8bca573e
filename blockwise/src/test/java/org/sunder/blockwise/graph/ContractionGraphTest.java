package org.sunder.blockwise.graph;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Random;
import java.util.Set;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.collections.IntIntHashMap;
import org.sunder.blockwise.collections.IntList;

class ContractionGraphTest {

  /**
   * Random contractions against a plain model: a map from each unordered pair of live nodes to
   * the summed weight of the input edges between their members. After every contraction the
   * graph's live edges, their ends, merged weights and the degrees must match the model, and
   * every live edge whose weight or ends changed must be among the touched. The last trials
   * are larger and denser, so that maps grow and shrink.
   */
  @Test
  void randomContractionsMatchAPairMapModel() {
    Random random = new Random(5);
    for (int trial = 0; trial < 43; trial++) {
      int n = trial < 40 ? 2 + random.nextInt(30) : 100 + random.nextInt(30);
      int m = random.nextInt(trial < 40 ? 4 * n : 12 * n);
      int[] u = new int[m];
      int[] v = new int[m];
      double[] weight = new double[m];
      int[] owner = new int[n];
      for (int i = 0; i < n; i++) {
        owner[i] = i;
      }
      for (int e = 0; e < m; e++) {
        u[e] = random.nextInt(n);
        v[e] = random.nextInt(n);
        weight[e] = random.nextInt(7) - 3;
      }
      double[] input = weight.clone();
      ContractionGraph.EdgeMerge sum = (into, from) -> weight[into] += weight[from];
      ContractionGraph graph = ContractionGraph.build(n, u, v, sum);
      List<Integer> live = new ArrayList<>();
      for (int i = 0; i < n; i++) {
        live.add(i);
      }
      IntList touched = new IntList(4);
      while (true) {
        assertMatchesModel(graph, m, u, v, input, weight, owner, live, trial);
        if (live.size() < 2) {
          break;
        }
        int into = live.get(random.nextInt(live.size()));
        int from = live.get(random.nextInt(live.size()));
        if (into == from) {
          continue;
        }
        double[] weightBefore = weight.clone();
        long[] endsBefore = new long[m];
        for (int e = 0; e < m; e++) {
          endsBefore[e] = ((long) graph.endA(e) << 32) | graph.endB(e);
        }
        touched.clear();
        graph.contract(into, from, sum, touched);
        Set<Integer> listed = new HashSet<>();
        for (int t = 0; t < touched.size(); t++) {
          int e = touched.get(t);
          assertTrue(graph.alive(e) && (graph.endA(e) == into || graph.endB(e) == into));
          listed.add(e);
        }
        for (int e = 0; e < m; e++) {
          boolean changed = weight[e] != weightBefore[e]
              || endsBefore[e] != (((long) graph.endA(e) << 32) | graph.endB(e));
          assertTrue(!graph.alive(e) || !changed || listed.contains(e),
              "trial " + trial + ": edge " + e + " changed but is not among the touched");
        }
        for (int i = 0; i < n; i++) {
          owner[i] = owner[i] == from ? into : owner[i];
        }
        live.remove(Integer.valueOf(from));
      }
    }
  }

  private static void assertMatchesModel(ContractionGraph graph, int m, int[] u, int[] v,
      double[] input, double[] weight, int[] owner, List<Integer> live, int trial) {
    Map<Long, Double> model = new HashMap<>();
    for (int e = 0; e < m; e++) {
      int a = Math.min(owner[u[e]], owner[v[e]]);
      int b = Math.max(owner[u[e]], owner[v[e]]);
      if (a != b) {
        model.merge(((long) a << 32) | b, input[e], Double::sum);
      }
    }
    Map<Long, Double> actual = new HashMap<>();
    for (int e = 0; e < m; e++) {
      if (graph.alive(e)) {
        assertTrue(graph.endA(e) < graph.endB(e));
        Double before = actual.put(((long) graph.endA(e) << 32) | graph.endB(e), weight[e]);
        assertEquals(null, before, "trial " + trial + ": two live edges for one pair");
      }
    }
    assertEquals(model, actual, "trial " + trial);
    for (int node : live) {
      Map<Integer, Integer> expected = new HashMap<>();
      for (int e = 0; e < m; e++) {
        if (graph.alive(e) && (graph.endA(e) == node || graph.endB(e) == node)) {
          expected.put(graph.endA(e) == node ? graph.endB(e) : graph.endA(e), e);
        }
      }
      IntIntHashMap around = graph.neighbours(node);
      Map<Integer, Integer> listed = new HashMap<>();
      for (int slot = 0; slot < around.capacity(); slot++) {
        if (around.keyAt(slot) >= 0) {
          listed.put(around.keyAt(slot), around.valueAt(slot));
        }
      }
      assertEquals(expected, listed, "trial " + trial + ", node " + node);
      assertEquals(expected.size(), graph.degree(node));
    }
  }
}
