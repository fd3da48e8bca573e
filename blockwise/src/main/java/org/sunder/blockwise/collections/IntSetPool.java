package org.sunder.blockwise.collections;

import java.util.Arrays;

/**
 * A fixed number of hash sets of ints in {@code 0 .. 2^31 - 2}, sets {@code 0 .. setCount - 1}, stored
 * together in one pooled array: each set is an open-addressing table (linear probing, deletion
 * by backward shift, so no tombstones) of a power-of-two capacity of at least 4, at most 3/4
 * full, grown by doubling. A slot holds its value plus one, so 0 is empty and fresh pool memory
 * (zeroed by the JVM) needs no filling. Freed tables are zeroed while still in cache and go to
 * one free list per capacity for reuse.
 * Expected {@code O(1)} per operation; a set's members lie together, so walking a set reads one
 * run of memory.
 *
 * <p>Each set also carries one int of the caller's ({@link #tag}), kept beside the set's own
 * bookkeeping so that both come in one cache line: 16 bytes per set plus 4 bytes per slot.
 * Not thread-safe.
 */
public final class IntSetPool {
  private static final int TAG = 0;
  private static final int START = 1;
  private static final int COUNT = 2;
  private static final int LOG = 3;
  private static final int EMPTY = 0;
  private static final int MIN_LOG = 2;
  /** Per set {@code s}: {@code meta[4 s + TAG | START | COUNT | LOG]}; START -1: no table. */
  private final int[] meta;
  private int[] pool;
  private int used;
  /** Start of the first free table of capacity {@code 1 << log}, or -1; chained through slot 0. */
  private final int[] freeHead = new int[32];

  /** Empty sets {@code 0 .. setCount - 1} with tag 0 and room for about {@code expected} slots. */
  public IntSetPool(int setCount, int expected) {
    if (setCount < 0 || expected < 0) {
      throw new IllegalArgumentException("setCount " + setCount + ", expected " + expected
          + "; expected non-negative numbers");
    }
    meta = new int[4 * setCount];
    for (int s = 0; s < setCount; s++) {
      meta[4 * s + START] = -1;
    }
    pool = new int[Math.max(16, expected)];
    Arrays.fill(freeHead, -1);
  }

  public int setCount() {
    return meta.length / 4;
  }

  /** The caller's int of {@code set} (0 at first). */
  public int tag(int set) {
    return meta[4 * set + TAG];
  }

  public void setTag(int set, int value) {
    meta[4 * set + TAG] = value;
  }

  /** Number of members of {@code set}. */
  public int size(int set) {
    return meta[4 * set + COUNT];
  }

  /** Whether {@code value} is in {@code set}. */
  public boolean contains(int set, int value) {
    int m = 4 * set;
    if (meta[m + COUNT] == 0) {
      return false;
    }
    int[] p = pool;
    int start = meta[m + START];
    int log = meta[m + LOG];
    int mask = (1 << log) - 1;
    int stored = value + 1;
    for (int i = slot(value, log); ; i = (i + 1) & mask) {
      int x = p[start + i];
      if (x == stored) {
        return true;
      }
      if (x == EMPTY) {
        return false;
      }
    }
  }

  /** Adds {@code value} (0 .. 2^31 - 2) to {@code set}; false if it was there. */
  public boolean add(int set, int value) {
    if (value < 0 || value == Integer.MAX_VALUE) {
      throw new IllegalArgumentException("value " + value + "; expected 0 .. 2^31 - 2");
    }
    int m = 4 * set;
    if (meta[m + START] < 0) {
      meta[m + START] = allocate(MIN_LOG);
      meta[m + LOG] = MIN_LOG;
    }
    int[] p = pool;
    int start = meta[m + START];
    int log = meta[m + LOG];
    int mask = (1 << log) - 1;
    int stored = value + 1;
    int i = slot(value, log);
    for (int x; (x = p[start + i]) != EMPTY; i = (i + 1) & mask) {
      if (x == stored) {
        return false;
      }
    }
    int count = meta[m + COUNT] + 1;
    if (count > (3 << log) >>> 2) {
      grow(set);
      insertNew(set, value);
    } else {
      p[start + i] = stored;
    }
    meta[m + COUNT] = count;
    return true;
  }

  /** Removes {@code value} from {@code set}; false if it was not there. */
  public boolean remove(int set, int value) {
    int m = 4 * set;
    if (meta[m + COUNT] == 0) {
      return false;
    }
    int[] p = pool;
    int start = meta[m + START];
    int log = meta[m + LOG];
    int mask = (1 << log) - 1;
    int stored = value + 1;
    int i = slot(value, log);
    for (int x; (x = p[start + i]) != stored; i = (i + 1) & mask) {
      if (x == EMPTY) {
        return false;
      }
    }
    // backward shift: move later entries of the run into the hole unless already home
    int hole = i;
    for (int j = (hole + 1) & mask; ; j = (j + 1) & mask) {
      int x = p[start + j];
      if (x == EMPTY) {
        break;
      }
      int home = slot(x - 1, log);
      // x may move to the hole if its home is not in (hole, j] cyclically
      if (((j - home) & mask) >= ((j - hole) & mask)) {
        p[start + hole] = x;
        hole = j;
      }
    }
    p[start + hole] = EMPTY;
    meta[m + COUNT]--;
    return true;
  }

  /**
   * Writes the members of {@code set}, in no particular order, to {@code target} from index 0
   * (it must have room for {@link #size}); returns their number.
   */
  public int copyTo(int set, int[] target) {
    int m = 4 * set;
    int count = meta[m + COUNT];
    if (count == 0) {
      return 0;
    }
    int[] p = pool;
    int start = meta[m + START];
    int end = start + (1 << meta[m + LOG]);
    int n = 0;
    for (int i = start; i < end; i++) {
      int x = p[i];
      if (x != EMPTY) {
        target[n++] = x - 1;
      }
    }
    return n;
  }

  /** Empties {@code set} and frees its table; the tag stays. */
  public void clear(int set) {
    int m = 4 * set;
    if (meta[m + START] >= 0) {
      release(meta[m + START], meta[m + LOG]);
      meta[m + START] = -1;
      meta[m + COUNT] = 0;
    }
  }

  /** Slots in the pool, taken or free: the pool's footprint. */
  public int poolLength() {
    return pool.length;
  }

  private static int slot(int value, int log) {
    return (value * 0x9E3779B9) >>> (32 - log);
  }

  private void grow(int set) {
    int m = 4 * set;
    int oldStart = meta[m + START];
    int oldLog = meta[m + LOG];
    int log = oldLog + 1;
    int start = allocate(log);
    int[] p = pool;
    int mask = (1 << log) - 1;
    for (int i = oldStart, end = oldStart + (1 << oldLog); i < end; i++) {
      int x = p[i];
      if (x != EMPTY) {
        int j = slot(x - 1, log);
        while (p[start + j] != EMPTY) {
          j = (j + 1) & mask;
        }
        p[start + j] = x;
      }
    }
    release(oldStart, oldLog);
    meta[m + START] = start;
    meta[m + LOG] = log;
  }

  /** Puts {@code value}, known absent, into the table of {@code set} (which has room). */
  private void insertNew(int set, int value) {
    int m = 4 * set;
    int[] p = pool;
    int start = meta[m + START];
    int log = meta[m + LOG];
    int mask = (1 << log) - 1;
    int i = slot(value, log);
    while (p[start + i] != EMPTY) {
      i = (i + 1) & mask;
    }
    p[start + i] = value + 1;
  }

  /** A table of {@code 1 << log} empty slots; returns its start. */
  private int allocate(int log) {
    int length = 1 << log;
    int start = freeHead[log];
    if (start >= 0) {
      freeHead[log] = pool[start];
      pool[start] = EMPTY;
    } else {
      if (used + length > pool.length) {
        long wanted = Math.max((long) used + length, pool.length + (long) (pool.length >> 1));
        if (wanted > Integer.MAX_VALUE - 8) {
          wanted = (long) used + length;
          if (wanted > Integer.MAX_VALUE - 8) {
            throw new IllegalStateException("IntSetPool: more than 2^31 slots");
          }
        }
        pool = Arrays.copyOf(pool, (int) wanted);
      }
      start = used;
      used += length;
    }
    return start;
  }

  /** Zeroes a table and puts it on its free list, linked through its slot 0. */
  private void release(int start, int log) {
    Arrays.fill(pool, start, start + (1 << log), EMPTY);
    pool[start] = freeHead[log];
    freeHead[log] = start;
  }
}
