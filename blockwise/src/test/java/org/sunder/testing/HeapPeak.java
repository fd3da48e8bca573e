package org.sunder.testing;

import java.lang.management.ManagementFactory;
import java.lang.management.MemoryPoolMXBean;
import java.lang.management.MemoryType;

/**
 * The growth of the heap pools' peak usage over a stretch of a benchmark: {@link #start()}
 * resets the peaks, {@link #growth()} is the sum of the peaks less the usage at the start
 * (retained data plus garbage not yet collected, so an upper bound on the live peak).
 */
public final class HeapPeak {
  private final long base;

  private HeapPeak(long base) {
    this.base = base;
  }

  /** Resets the heap pools' peaks and remembers their current usage. */
  public static HeapPeak start() {
    long used = 0;
    for (MemoryPoolMXBean pool : ManagementFactory.getMemoryPoolMXBeans()) {
      if (pool.getType() == MemoryType.HEAP) {
        pool.resetPeakUsage();
        used += pool.getUsage().getUsed();
      }
    }
    return new HeapPeak(used);
  }

  /** Bytes: the sum of the heap pools' peaks since {@link #start()}, less the usage then. */
  public long growth() {
    long peak = 0;
    for (MemoryPoolMXBean pool : ManagementFactory.getMemoryPoolMXBeans()) {
      if (pool.getType() == MemoryType.HEAP) {
        peak += pool.getPeakUsage().getUsed();
      }
    }
    return peak - base;
  }
}
