package org.sunder.blockwise.partition.agglomeration;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.util.HashMap;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;

/** {@link ClusterAdjacency} against one {@link HashMap} per cluster (reference). */
class ClusterAdjacencyTest {

  @Test
  void matchesHashMapsUnderRandomOperations() {
    for (long seed = 1; seed <= 12; seed++) {
      Random random = new Random(seed);
      int clusters = 2 + random.nextInt(6);
      int keys = 5 + random.nextInt(seed % 3 == 0 ? 400 : 40);
      ClusterAdjacency adjacency = new ClusterAdjacency(clusters, 1 + random.nextInt(6));
      @SuppressWarnings("unchecked")
      Map<Integer, Integer>[] reference = new HashMap[clusters];
      for (int c = 0; c < clusters; c++) {
        reference[c] = new HashMap<>();
      }
      for (int step = 0; step < 6000; step++) {
        int c = random.nextInt(clusters);
        int key = random.nextInt(keys);
        int edge = random.nextInt(1000);
        Map<Integer, Integer> map = reference[c];
        String at = "seed " + seed + " step " + step;
        switch (random.nextInt(8)) {
          case 0, 1 -> {
            adjacency.put(c, key, edge);
            map.put(key, edge);
          }
          case 2 -> {
            Integer had = map.putIfAbsent(key, edge);
            assertEquals(had == null ? ClusterAdjacency.ABSENT : had,
                adjacency.putIfAbsent(c, key, edge), at);
          }
          case 3 -> {
            if (!map.containsKey(key)) {
              adjacency.addNew(c, key, edge);
              map.put(key, edge);
            }
          }
          case 4 -> {
            Integer removed = map.remove(key);
            assertEquals(removed == null ? ClusterAdjacency.ABSENT : removed,
                adjacency.remove(c, key), at);
          }
          case 5 -> {
            if (!map.isEmpty()) {
              int from = map.keySet().iterator().next();
              int to = random.nextInt(keys);
              if (to != from) {
                adjacency.rename(c, from, to, edge);
                map.remove(from);
                map.put(to, edge);
              }
            }
          }
          case 6 -> {
            if (random.nextInt(40) == 0) {
              adjacency.clear(c);
              map.clear();
            }
          }
          default -> assertEquals(map.getOrDefault(key, ClusterAdjacency.ABSENT),
              adjacency.get(c, key), at);
        }
        assertEquals(map.size(), adjacency.size(c), at);
        if (step % 97 == 0) {
          assertEquals(map, contents(adjacency, c), at);
        }
      }
      for (int c = 0; c < clusters; c++) {
        assertEquals(reference[c], contents(adjacency, c), "seed " + seed);
      }
    }
  }

  @Test
  void renameOfAMissingNeighbourIsAnError() {
    ClusterAdjacency adjacency = new ClusterAdjacency(2, 4);
    adjacency.addNew(0, 1, 7);
    assertThrows(IllegalStateException.class, () -> adjacency.rename(0, 5, 6, 8));
    assertThrows(IllegalArgumentException.class, () -> new ClusterAdjacency(3, 0));
  }

  private static Map<Integer, Integer> contents(ClusterAdjacency adjacency, int c) {
    Map<Integer, Integer> map = new HashMap<>();
    for (int slot = 0; slot < adjacency.slotCount(c); slot++) {
      int key = adjacency.neighbourAt(c, slot);
      if (key != ClusterAdjacency.ABSENT) {
        assertEquals(null, map.put(key, adjacency.edgeAt(c, slot)), "key listed twice");
      }
    }
    return map;
  }
}
