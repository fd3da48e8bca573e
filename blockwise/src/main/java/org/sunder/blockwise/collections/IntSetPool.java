package org.sunder.blockwise.collections;

import java.util.Arrays;

/**
 * A fixed number of hash sets of ints in {@code 0 .. 2^31 - 2}, sets
 * {@code 0 .. setCount - 1}, stored together in pooled pages: each set is an open-addressing
 * table (linear probing, deletion by backward shift, so no tombstones) of a power-of-two
 * capacity of at least 4, at most 3/4 full, grown by doubling. Expected {@code O(1)} per
 * operation; a set's members lie together, so walking a set reads one run of memory.
 *
 * <p>Storage: tables are cut from pages of up to {@code 2^20} ints (a table larger than that
 * gets a page of its own), so the pool grows without copying; pages start small and double.
 * A slot holds its value plus one, so 0 is empty and fresh pages (zeroed by the JVM) need no
 * filling. Freed tables are zeroed while still in cache and go to one free list per capacity
 * for reuse. Each set also carries one int of the caller's ({@link #tag}), kept beside the
 * set's own bookkeeping so that both come in one cache line: 16 bytes per set plus 4 bytes per
 * slot. Not thread-safe.
 */
public final class IntSetPool {
  private static final int TAG = 0;
  private static final int START = 1;
  private static final int COUNT = 2;
  private static final int LOG = 3;
  private static final int EMPTY = 0;
  private static final int MIN_LOG = 2;
  /** A table's address is {@code page << PAGE_BITS | offset}. */
  private static final int PAGE_BITS = 20;
  private static final int PAGE_MASK = (1 << PAGE_BITS) - 1;
  /** Per set {@code s}: {@code meta[4 s + TAG | START | COUNT | LOG]}; START -1: no table. */
  private final int[] meta;
  private int[][] pages = new int[4][];
  private int pageCount;
  /** Slots taken, from the start, in the last page. */
  private int used;
  /** Address of the first free table of capacity {@code 1 << log}, or -1; linked via slot 0. */
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
    pages[0] = new int[Math.min(1 << PAGE_BITS, Math.max(16, expected))];
    pageCount = 1;
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
    int address = meta[m + START];
    int[] p = pages[address >>> PAGE_BITS];
    int base = address & PAGE_MASK;
    int log = meta[m + LOG];
    return p[base + probe(p, base, log, value)] != EMPTY;
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
    int address = meta[m + START];
    int[] p = pages[address >>> PAGE_BITS];
    int base = address & PAGE_MASK;
    int log = meta[m + LOG];
    int i = probe(p, base, log, value);
    if (p[base + i] != EMPTY) {
      return false;
    }
    int count = meta[m + COUNT] + 1;
    if (count > (3 << log) >>> 2) {
      grow(set);
      insertNew(set, value);
    } else {
      p[base + i] = value + 1;
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
    int address = meta[m + START];
    int[] p = pages[address >>> PAGE_BITS];
    int base = address & PAGE_MASK;
    int log = meta[m + LOG];
    int mask = (1 << log) - 1;
    int i = probe(p, base, log, value);
    if (p[base + i] == EMPTY) {
      return false;
    }
    // backward shift: move later entries of the run into the hole unless already home
    int hole = i;
    for (int j = (hole + 1) & mask; ; j = (j + 1) & mask) {
      int x = p[base + j];
      if (x == EMPTY) {
        break;
      }
      int home = slot(x - 1, log);
      // x may move to the hole if its home is not in (hole, j] cyclically
      if (((j - home) & mask) >= ((j - hole) & mask)) {
        p[base + hole] = x;
        hole = j;
      }
    }
    p[base + hole] = EMPTY;
    meta[m + COUNT]--;
    return true;
  }

  /**
   * Writes the members of {@code set}, in no particular order, to {@code target} from index 0
   * (it must have room for {@link #size}); returns their number.
   */
  public int copyTo(int set, int[] target) {
    int m = 4 * set;
    if (meta[m + COUNT] == 0) {
      return 0;
    }
    int address = meta[m + START];
    int[] p = pages[address >>> PAGE_BITS];
    int base = address & PAGE_MASK;
    int end = base + (1 << meta[m + LOG]);
    int n = 0;
    for (int i = base; i < end; i++) {
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

  /** Slots in the pages, taken or free: the pool's footprint. */
  public long poolLength() {
    long total = 0;
    for (int i = 0; i < pageCount; i++) {
      total += pages[i].length;
    }
    return total;
  }

  /** The slot of {@code value} in the table at {@code base}, or the empty slot ending its run. */
  private static int probe(int[] p, int base, int log, int value) {
    int mask = (1 << log) - 1;
    int stored = value + 1;
    int i = slot(value, log);
    for (int x; (x = p[base + i]) != stored && x != EMPTY; i = (i + 1) & mask) {
      // linear probing
    }
    return i;
  }

  private static int slot(int value, int log) {
    return (value * 0x9E3779B9) >>> (32 - log);
  }

  private void grow(int set) {
    int m = 4 * set;
    int oldAddress = meta[m + START];
    int oldLog = meta[m + LOG];
    int log = oldLog + 1;
    int address = allocate(log);
    int[] source = pages[oldAddress >>> PAGE_BITS];
    int oldBase = oldAddress & PAGE_MASK;
    int[] p = pages[address >>> PAGE_BITS];
    int base = address & PAGE_MASK;
    int mask = (1 << log) - 1;
    for (int i = oldBase, end = oldBase + (1 << oldLog); i < end; i++) {
      int x = source[i];
      if (x != EMPTY) {
        int j = slot(x - 1, log);
        while (p[base + j] != EMPTY) {
          j = (j + 1) & mask;
        }
        p[base + j] = x;
      }
    }
    release(oldAddress, oldLog);
    meta[m + START] = address;
    meta[m + LOG] = log;
  }

  /** Puts {@code value}, known absent, into the table of {@code set} (which has room). */
  private void insertNew(int set, int value) {
    int m = 4 * set;
    int address = meta[m + START];
    int[] p = pages[address >>> PAGE_BITS];
    int base = address & PAGE_MASK;
    int mask = (1 << meta[m + LOG]) - 1;
    int i = slot(value, meta[m + LOG]);
    while (p[base + i] != EMPTY) {
      i = (i + 1) & mask;
    }
    p[base + i] = value + 1;
  }

  /** An empty table of {@code 1 << log} slots; returns its address. */
  private int allocate(int log) {
    int address = freeHead[log];
    if (address >= 0) {
      int[] p = pages[address >>> PAGE_BITS];
      int base = address & PAGE_MASK;
      freeHead[log] = p[base];
      p[base] = EMPTY;
      return address;
    }
    int length = 1 << log;
    int[] last = pages[pageCount - 1];
    if (used + length > last.length) {
      freeTail(last);
      if (pageCount == 1 << (31 - PAGE_BITS)) {
        throw new IllegalStateException("IntSetPool: more than " + pageCount + " pages");
      }
      if (pageCount == pages.length) {
        pages = Arrays.copyOf(pages, 2 * pageCount);
      }
      int pageLength = Math.max(length, Math.min(1 << PAGE_BITS, 2 * last.length));
      pages[pageCount++] = new int[pageLength];
      used = 0;
    }
    address = ((pageCount - 1) << PAGE_BITS) | used;
    // a table larger than a page fills its own page, whose offsets then exceed PAGE_MASK
    used = length > (1 << PAGE_BITS) ? Integer.MAX_VALUE / 2 : used + length;
    return address;
  }

  /** Puts what is left of the last page on the free lists, as tables of falling capacity. */
  private void freeTail(int[] last) {
    int page = pageCount - 1;
    while (last.length - used >= 1 << MIN_LOG && used <= PAGE_MASK) {
      int log = 31 - Integer.numberOfLeadingZeros(last.length - used);
      int address = (page << PAGE_BITS) | used;
      last[used] = freeHead[log];
      freeHead[log] = address;
      used += 1 << log;
    }
  }

  /** Zeroes a table and puts it on its free list, linked through its slot 0. */
  private void release(int address, int log) {
    int[] p = pages[address >>> PAGE_BITS];
    int base = address & PAGE_MASK;
    Arrays.fill(p, base, base + (1 << log), EMPTY);
    p[base] = freeHead[log];
    freeHead[log] = address;
  }
}
