package org.sunder.blockwise.partition.agglomeration;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;

/**
 * For each cluster {@code 0..n-1}, a map from neighbour cluster to the id of the edge joining
 * them, all on primitive arrays. A cluster starts in a packed block of {@code packedCapacity}
 * (neighbour, edge) pairs inside one shared array, searched linearly; when it outgrows the block
 * it moves to its own open-addressing table (linear probing, load at most 3/4, backward-shift
 * deletion, no tombstones) that doubles when full. Tables given up (by {@link #clear} or by
 * growing) are emptied and kept for reuse, so a run allocates about its peak of live tables.
 * Keys and edges are non-negative ints.
 *
 * <p>Cost: {@code O(packedCapacity)} per operation on a packed cluster, expected {@code O(1)}
 * on a table. Memory: {@code 8 * packedCapacity} bytes per cluster plus {@code 11} to
 * {@code 21} bytes per entry of tabled clusters. Not thread-safe.
 */
final class ClusterAdjacency {
  static final int ABSENT = -1;
  private static final int MIN_TABLE = 16;

  private final int packedCapacity;
  private final int[] packed;
  private final int[] size;
  private final int[][] table;
  /** Emptied tables by capacity: {@code spare.get(i)} holds tables of {@code MIN_TABLE << i}. */
  private final List<List<int[]>> spare = new ArrayList<>();

  /** Empty maps for {@code clusterCount} clusters, each with a packed block of the capacity. */
  ClusterAdjacency(int clusterCount, int packedCapacity) {
    if (packedCapacity < 1) {
      throw new IllegalArgumentException("packed capacity " + packedCapacity + " < 1");
    }
    this.packedCapacity = packedCapacity;
    this.packed = new int[Math.multiplyExact(2 * packedCapacity, clusterCount)];
    this.size = new int[clusterCount];
    this.table = new int[clusterCount][];
  }

  /** The number of neighbours of {@code c}. */
  int size(int c) {
    return size[c];
  }

  /** The edge joining {@code c} to {@code neighbour}, or {@link #ABSENT}. */
  int get(int c, int neighbour) {
    int[] t = table[c];
    if (t == null) {
      int at = packedIndex(c, neighbour);
      return at < 0 ? ABSENT : packed[at + 1];
    }
    int i = tableIndex(t, neighbour);
    return t[i] == ABSENT ? ABSENT : t[i + 1];
  }

  /**
   * Gives {@code c}, still without neighbours, a table for {@code neighbours} entries at once
   * when they would outgrow its packed block; no effect otherwise. Building then never grows it.
   */
  void reserve(int c, int neighbours) {
    if (neighbours <= packedCapacity || table[c] != null || size[c] != 0) {
      return;
    }
    int capacity = MIN_TABLE;
    while (4L * neighbours > 3L * capacity) {
      capacity <<= 1;
    }
    table[c] = newTable(capacity);
  }

  /** Adds a neighbour known to be absent (building); cheaper than {@link #put}. */
  void addNew(int c, int neighbour, int edge) {
    if (table[c] == null && size[c] < packedCapacity) {
      int at = 2 * (c * packedCapacity + size[c]++);
      packed[at] = neighbour;
      packed[at + 1] = edge;
      return;
    }
    put(c, neighbour, edge);
  }

  /**
   * Maps {@code neighbour} to {@code edge} unless it is mapped already; returns the edge it
   * had or {@link #ABSENT} (then {@code edge} was inserted). One search.
   */
  int putIfAbsent(int c, int neighbour, int edge) {
    int[] t = table[c];
    if (t == null) {
      int at = packedIndex(c, neighbour);
      if (at >= 0) {
        return packed[at + 1];
      }
      if (size[c] < packedCapacity) {
        at = 2 * (c * packedCapacity + size[c]++);
        packed[at] = neighbour;
        packed[at + 1] = edge;
        return ABSENT;
      }
      t = toTable(c);
    }
    int i = tableIndex(t, neighbour);
    if (t[i] != ABSENT) {
      return t[i + 1];
    }
    insertAt(c, t, i, neighbour, edge);
    return ABSENT;
  }

  /** Maps {@code neighbour} to {@code edge}, inserting or overwriting. */
  void put(int c, int neighbour, int edge) {
    int[] t = table[c];
    if (t == null) {
      int at = packedIndex(c, neighbour);
      if (at >= 0) {
        packed[at + 1] = edge;
        return;
      }
      if (size[c] < packedCapacity) {
        at = 2 * (c * packedCapacity + size[c]++);
        packed[at] = neighbour;
        packed[at + 1] = edge;
        return;
      }
      t = toTable(c);
    }
    int i = tableIndex(t, neighbour);
    if (t[i] != ABSENT) {
      t[i + 1] = edge;
      return;
    }
    insertAt(c, t, i, neighbour, edge);
  }

  /** Inserts at empty slot {@code i} of {@code c}'s table, growing it first if full. */
  private void insertAt(int c, int[] t, int i, int neighbour, int edge) {
    if (4 * (size[c] + 1) > 3 * (t.length / 2)) {
      t = grow(c, t);
      i = tableIndex(t, neighbour);
    }
    t[i] = neighbour;
    t[i + 1] = edge;
    size[c]++;
  }

  /** Removes {@code neighbour}; returns its edge or {@link #ABSENT}. */
  int remove(int c, int neighbour) {
    int[] t = table[c];
    if (t == null) {
      int at = packedIndex(c, neighbour);
      if (at < 0) {
        return ABSENT;
      }
      int edge = packed[at + 1];
      int last = 2 * (c * packedCapacity + --size[c]);
      packed[at] = packed[last];
      packed[at + 1] = packed[last + 1];
      return edge;
    }
    int i = tableIndex(t, neighbour);
    if (t[i] == ABSENT) {
      return ABSENT;
    }
    int edge = t[i + 1];
    deleteAt(t, i);
    size[c]--;
    return edge;
  }

  /**
   * Renames neighbour {@code from} (present) to {@code to} with edge {@code edge}: if {@code to}
   * is already a neighbour its edge becomes {@code edge} and {@code from} goes; on a packed
   * cluster one scan.
   */
  void rename(int c, int from, int to, int edge) {
    if (table[c] != null) {
      remove(c, from);
      put(c, to, edge);
      return;
    }
    int start = 2 * c * packedCapacity;
    int end = start + 2 * size[c];
    int atFrom = -1;
    int atTo = -1;
    for (int i = start; i < end; i += 2) {
      int key = packed[i];
      if (key == from) {
        atFrom = i;
      } else if (key == to) {
        atTo = i;
      }
    }
    if (atFrom < 0) {
      throw new IllegalStateException("cluster " + c + " has no neighbour " + from);
    }
    if (atTo < 0) {
      packed[atFrom] = to;
      packed[atFrom + 1] = edge;
      return;
    }
    packed[atTo + 1] = edge;
    int last = end - 2;
    packed[atFrom] = packed[last];
    packed[atFrom + 1] = packed[last + 1];
    size[c]--;
  }

  /** Forgets every neighbour of {@code c} and frees its table. */
  void clear(int c) {
    size[c] = 0;
    if (table[c] != null) {
      release(table[c]);
      table[c] = null;
    }
  }

  /**
   * The number of entry slots of {@code c} to visit with {@link #neighbourAt} and
   * {@link #edgeAt}; a slot whose neighbour is {@link #ABSENT} is empty.
   */
  int slotCount(int c) {
    int[] t = table[c];
    return t == null ? size[c] : t.length / 2;
  }

  int neighbourAt(int c, int slot) {
    int[] t = table[c];
    return t == null ? packed[2 * (c * packedCapacity + slot)] : t[2 * slot];
  }

  int edgeAt(int c, int slot) {
    int[] t = table[c];
    return t == null ? packed[2 * (c * packedCapacity + slot) + 1] : t[2 * slot + 1];
  }

  /**
   * Reads, and returns, the slot where a search of {@code c}'s map for {@code neighbour} starts
   * (its packed block's first key, or the key's home slot in its table), and does nothing else:
   * a pass that reads these for many clusters before searching them lets their cache misses
   * overlap instead of coming one after another.
   */
  int readAhead(int c, int neighbour) {
    int[] t = table[c];
    if (t == null) {
      return packed[2 * c * packedCapacity];
    }
    return t[home(neighbour, t.length - 2)];
  }

  private int packedIndex(int c, int neighbour) {
    int start = 2 * c * packedCapacity;
    int end = start + 2 * size[c];
    for (int i = start; i < end; i += 2) {
      if (packed[i] == neighbour) {
        return i;
      }
    }
    return -1;
  }

  /** The slot index (times 2) holding {@code key} or the empty slot where it would go. */
  private static int tableIndex(int[] t, int key) {
    int mask = t.length - 2;
    int i = home(key, mask);
    while (t[i] != ABSENT && t[i] != key) {
      i = (i + 2) & mask;
    }
    return i;
  }

  private static int home(int key, int mask) {
    int h = key * 0x9E3779B9;
    return ((h ^ (h >>> 16)) << 1) & mask;
  }

  private static void deleteAt(int[] t, int i) {
    int mask = t.length - 2;
    int j = i;
    while (true) {
      j = (j + 2) & mask;
      int key = t[j];
      if (key == ABSENT) {
        break;
      }
      int k = home(key, mask);
      // move the entry at j into the hole at i unless its home lies cyclically in (i, j]
      boolean stays = i <= j ? (i < k && k <= j) : (i < k || k <= j);
      if (!stays) {
        t[i] = key;
        t[i + 1] = t[j + 1];
        i = j;
      }
    }
    t[i] = ABSENT;
  }

  private int[] toTable(int c) {
    int capacity = MIN_TABLE;
    while (capacity < 2 * (size[c] + 1)) {
      capacity <<= 1;
    }
    int[] t = newTable(capacity);
    int start = 2 * c * packedCapacity;
    for (int i = 0; i < size[c]; i++) {
      insertFresh(t, packed[start + 2 * i], packed[start + 2 * i + 1]);
    }
    table[c] = t;
    return t;
  }

  private int[] grow(int c, int[] old) {
    int[] t = newTable(old.length);
    for (int i = 0; i < old.length; i += 2) {
      if (old[i] != ABSENT) {
        insertFresh(t, old[i], old[i + 1]);
      }
    }
    release(old);
    table[c] = t;
    return t;
  }

  /** An empty table of {@code capacity} (a power of two at least MIN_TABLE) slots. */
  private int[] newTable(int capacity) {
    int index = Integer.numberOfTrailingZeros(capacity / MIN_TABLE);
    if (index < spare.size()) {
      List<int[]> tables = spare.get(index);
      if (!tables.isEmpty()) {
        return tables.remove(tables.size() - 1);
      }
    }
    int[] t = new int[2 * capacity];
    Arrays.fill(t, ABSENT);
    return t;
  }

  private void release(int[] t) {
    Arrays.fill(t, ABSENT);
    int index = Integer.numberOfTrailingZeros(t.length / 2 / MIN_TABLE);
    while (spare.size() <= index) {
      spare.add(new ArrayList<>());
    }
    spare.get(index).add(t);
  }

  private static void insertFresh(int[] t, int key, int edge) {
    int i = tableIndex(t, key);
    t[i] = key;
    t[i + 1] = edge;
  }
}
