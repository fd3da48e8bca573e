package org.sunder.stitching.solve;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;

import java.util.HashSet;
import java.util.List;
import java.util.Random;
import java.util.Set;
import org.junit.jupiter.api.Test;

/** {@link FirstOfPair} against a JDK hash set of (smaller, larger, sign) seen so far. */
class FirstOfPairTest {
  private static boolean[] reference(int[] a, int[] b, boolean[] attractive, int k) {
    Set<List<Object>> seen = new HashSet<>();
    boolean[] first = new boolean[k];
    for (int c = 0; c < k; c++) {
      first[c] = seen.add(List.of(Math.min(a[c], b[c]), Math.max(a[c], b[c]), attractive[c]));
    }
    return first;
  }

  @Test
  void marksTheFirstEntryOfEachPairAndSign() {
    Random random = new Random(91);
    for (int trial = 0; trial < 60; trial++) {
      int n = 1 + random.nextInt(trial % 3 == 0 ? 5 : 400);
      int k = trial == 0 ? 0 : random.nextInt(3000);
      int[] a = new int[k + random.nextInt(3)];
      int[] b = new int[a.length];
      boolean[] attractive = new boolean[a.length];
      for (int c = 0; c < a.length; c++) {
        a[c] = random.nextInt(n);
        b[c] = random.nextInt(n);
        attractive[c] = random.nextBoolean();
      }
      assertArrayEquals(reference(a, b, attractive, k),
          FirstOfPair.firsts(a, b, attractive, k, n), "trial " + trial);
    }
  }

  @Test
  void aWorkedExample() {
    // pairs {2,0}+, {0,2}+, {0,2}-, {1,1}+, {2,0}-, {1,1}+: the first of each pair and sign
    int[] a = {2, 0, 0, 1, 2, 1};
    int[] b = {0, 2, 2, 1, 0, 1};
    boolean[] attractive = {true, true, false, true, false, true};
    assertArrayEquals(new boolean[] {true, false, true, true, false, false},
        FirstOfPair.firsts(a, b, attractive, 6, 3));
  }
}
