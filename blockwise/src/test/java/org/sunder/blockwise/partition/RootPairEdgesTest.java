package org.sunder.blockwise.partition;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.HashMap;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * {@link RootPairEdges} against a {@link java.util.HashMap} (reference) that deletes every pair
 * of a node when it stops being a root.
 */
class RootPairEdgesTest {

  @Test
  void answersLikeAHashMapOverTheCurrentRoots() {
    for (long seed = 1; seed <= 20; seed++) {
      Random random = new Random(seed);
      int n = 2 + random.nextInt(200);
      int[] parent = new int[n];
      for (int i = 0; i < n; i++) {
        parent[i] = i;
      }
      int roots = n;
      RootPairEdges map = new RootPairEdges(random.nextInt(4), parent);
      Map<Long, Integer> reference = new HashMap<>();
      for (int step = 0; step < 40 * n; step++) {
        int a = randomRoot(random, parent);
        int b = randomRoot(random, parent);
        if (a == b) {
          continue;
        }
        long key = PairSet.pair(a, b);
        int op = random.nextInt(10);
        if (op < 5) {
          int value = random.nextInt(1000);
          map.put(key, value);
          reference.put(key, value);
        } else if (op < 9 || roots <= 2) {
          assertEquals(reference.getOrDefault(key, -1), map.get(key), "seed " + seed);
        } else {
          parent[a] = b;
          roots--;
          reference.keySet().removeIf(k -> (int) (k >>> 32) == a || (int) (long) k == a);
        }
      }
      for (int a = 0; a < n; a++) {
        for (int b = a + 1; b < n; b++) {
          if (parent[a] == a && parent[b] == b) {
            long key = PairSet.pair(a, b);
            assertEquals(reference.getOrDefault(key, -1), map.get(key), "seed " + seed);
          }
        }
      }
      assertTrue(map.size() >= reference.size(), "seed " + seed);
    }
  }

  private static int randomRoot(Random random, int[] parent) {
    int x = random.nextInt(parent.length);
    while (parent[x] != x) {
      x = parent[x];
    }
    return x;
  }
}
