package org.sunder.blockwise.collections;

import java.util.Arrays;

/**
 * A fixed number of hash sets of ints in {@code 0 .. 2^31 - 2}, sets
 * {@code 0 .. setCount - 1}. A set of at most two members keeps them in its own record; the
 * third member moves the set to an open-addressing table (linear probing, deletion by backward
 * shift, so no tombstones) of a power-of-two capacity of at least 4, at most 3/4 full, grown by
 * doubling, which the set keeps until {@link #clear}. Expected {@code O(1)} per operation; a
 * set's members lie together, so walking a set reads one run of memory.
 *
 * <p>Storage: each set has a record of 4 ints (the caller's {@link #tag}, the count, and the
 * two members or the table's address and capacity), so a small set's lookups and the tag come
 * in one cache line and touch no table. Tables are cut from pooled pages of up to {@code 2^20}
 * ints (a table larger than that gets a page of its own), so the pool grows without copying;
 * pages start small and double. A slot holds its value plus one, so 0 is empty and fresh pages
 * (zeroed by the JVM) need no filling. Freed tables are zeroed while still in cache and go to
 * one free list per capacity for reuse. Memory: 16 bytes per set plus 4 bytes per table slot.
 * Not thread-safe.
 */
public final class IntSetPool {
  /** A set's record is {@code meta[set << RECORD_LOG ..]}, {@code 1 << RECORD_LOG} ints. */
  private static final int RECORD_LOG = 2;
  private static final int TAG = 0;
  /** The member count, with {@link #TABLED} set once the set has a table. */
  private static final int COUNT = 1;
  /** With a table: its address and log2 capacity; without: the members, from here. */
  private static final int START = 2;
  private static final int LOG = 3;
  private static final int INLINE = 2;
  private static final int INLINE_CAPACITY = (1 << RECORD_LOG) - INLINE;
  private static final int TABLED = Integer.MIN_VALUE;
  private static final int EMPTY = 0;
  private static final int MIN_LOG = 2;
  /** A table's address is {@code page << PAGE_BITS | offset}. */
  private static final int PAGE_BITS = 20;
  private static final int PAGE_MASK = (1 << PAGE_BITS) - 1;
  private final int[] meta;
  private int[][] pages = new int[4][];
  private int pageCount;
  /** Slots taken, from the start, in the last page. */
  private int used;
  /** Address of the first free table of capacity {@code 1 << log}, or -1; linked via slot 0. */
  private final int[] freeHead = new int[32];
  /** The inline members of a set moving to a table. */
  private final int[] spilled = new int[INLINE_CAPACITY];

  /** Empty sets {@code 0 .. setCount - 1} with tag 0 and room for about {@code expected} slots. */
  public IntSetPool(int setCount, int expected) {
    if (setCount < 0 || expected < 0 || setCount > Integer.MAX_VALUE >> RECORD_LOG) {
      throw new IllegalArgumentException("setCount " + setCount + ", expected " + expected
          + "; expected non-negative numbers, setCount at most 2^29 - 1");
    }
    meta = new int[setCount << RECORD_LOG];
    pages[0] = new int[Math.min(1 << PAGE_BITS, Math.max(16, expected))];
    pageCount = 1;
    Arrays.fill(freeHead, -1);
  }

  public int setCount() {
    return meta.length >> RECORD_LOG;
  }

  /** The caller's int of {@code set} (0 at first). */
  public int tag(int set) {
    return meta[(set << RECORD_LOG) + TAG];
  }

  public void setTag(int set, int value) {
    meta[(set << RECORD_LOG) + TAG] = value;
  }

  /** Number of members of {@code set}. */
  public int size(int set) {
    return meta[(set << RECORD_LOG) + COUNT] & ~TABLED;
  }

  /** Whether {@code value} is in {@code set}. */
  public boolean contains(int set, int value) {
    int[] r = meta;
    int m = set << RECORD_LOG;
    int count = r[m + COUNT];
    if (count >= 0) {
      for (int i = m + INLINE, end = i + count; i < end; i++) {
        if (r[i] == value) {
          return true;
        }
      }
      return false;
    }
    int address = r[m + START];
    int[] p = pages[address >>> PAGE_BITS];
    int base = address & PAGE_MASK;
    return p[base + probe(p, base, r[m + LOG], value)] != EMPTY;
  }

  /**
   * Reads what a lookup of {@code value} in {@code set} reads first (the set's record and, with
   * a table, the home slot of the value) and changes nothing: called for several sets ahead of
   * their lookups, it lets the memory system fetch them in parallel. Returns a number with no
   * meaning that the caller must use (so the reads are not optimized away).
   */
  public int prefetch(int set, int value) {
    int m = set << RECORD_LOG;
    int count = meta[m + COUNT];
    if (count >= 0) {
      return count;
    }
    int address = meta[m + START];
    return pages[address >>> PAGE_BITS][(address & PAGE_MASK) + slot(value, meta[m + LOG])];
  }

  /** Adds {@code value} (0 .. 2^31 - 2) to {@code set}; false if it was there. */
  public boolean add(int set, int value) {
    if (value < 0 || value == Integer.MAX_VALUE) {
      throw new IllegalArgumentException("value " + value + "; expected 0 .. 2^31 - 2");
    }
    int[] r = meta;
    int m = set << RECORD_LOG;
    int count = r[m + COUNT];
    if (count >= 0) {
      int first = m + INLINE;
      for (int i = first, end = first + count; i < end; i++) {
        if (r[i] == value) {
          return false;
        }
      }
      if (count < INLINE_CAPACITY) {
        r[first + count] = value;
        r[m + COUNT] = count + 1;
      } else {
        spill(set, value);
      }
      return true;
    }
    int address = r[m + START];
    int[] p = pages[address >>> PAGE_BITS];
    int base = address & PAGE_MASK;
    int log = r[m + LOG];
    int i = probe(p, base, log, value);
    if (p[base + i] != EMPTY) {
      return false;
    }
    int grown = (count & ~TABLED) + 1;
    if (grown > (3 << log) >>> 2) {
      grow(set);
      insertNew(set, value);
    } else {
      p[base + i] = value + 1;
    }
    r[m + COUNT] = grown | TABLED;
    return true;
  }

  /** Removes {@code value} from {@code set}; false if it was not there. */
  public boolean remove(int set, int value) {
    int[] r = meta;
    int m = set << RECORD_LOG;
    int count = r[m + COUNT];
    if (count >= 0) {
      int first = m + INLINE;
      int last = first + count - 1;
      for (int i = first; i <= last; i++) {
        if (r[i] == value) {
          r[i] = r[last];
          r[m + COUNT] = count - 1;
          return true;
        }
      }
      return false;
    }
    if (count == TABLED) {
      return false;
    }
    int address = r[m + START];
    int[] p = pages[address >>> PAGE_BITS];
    int base = address & PAGE_MASK;
    int log = r[m + LOG];
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
    r[m + COUNT] = count - 1;
    return true;
  }

  /**
   * Writes the members of {@code set}, in no particular order, to {@code target} from index 0
   * (it must have room for {@link #size}); returns their number.
   */
  public int copyTo(int set, int[] target) {
    int m = set << RECORD_LOG;
    int count = meta[m + COUNT];
    if (count >= 0) {
      System.arraycopy(meta, m + INLINE, target, 0, count);
      return count;
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
    int m = set << RECORD_LOG;
    if (meta[m + COUNT] < 0) {
      release(meta[m + START], meta[m + LOG]);
    }
    meta[m + COUNT] = 0;
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

  /** Moves the full inline members of {@code set} and {@code value} into a new table. */
  private void spill(int set, int value) {
    int m = set << RECORD_LOG;
    int[] members = spilled;
    System.arraycopy(meta, m + INLINE, members, 0, INLINE_CAPACITY);
    int log = MIN_LOG;
    while (INLINE_CAPACITY + 1 > (3 << log) >>> 2) {
      log++;
    }
    meta[m + START] = allocate(log);
    meta[m + LOG] = log;
    meta[m + COUNT] = (INLINE_CAPACITY + 1) | TABLED;
    for (int member : members) {
      insertNew(set, member);
    }
    insertNew(set, value);
  }

  private void grow(int set) {
    int m = set << RECORD_LOG;
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
    int m = set << RECORD_LOG;
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
