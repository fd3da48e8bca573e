package org.sunder.spark.bench;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.HashMap;
import java.util.Map;
import java.util.stream.Stream;

/**
 * CPU seconds of this JVM's threads by kind, from {@code /proc/self/task} (Linux; elsewhere
 * every figure reads 0): Spark's task threads, the JIT compiler's threads and the garbage
 * collector's worker threads. A process's CPU time counts them all, where a thread's own CPU
 * time (a kernel measured alone) counts neither the compiler nor the collector working for it.
 * Resolution: the kernel's clock tick (10 ms).
 */
final class ThreadKindCpu {
  enum Kind {
    TASKS("Spark tasks"),
    COMPILER("JIT compiler"),
    COLLECTOR("garbage collector");

    final String label;

    Kind(String label) {
      this.label = label;
    }

    /** The kind of a thread by its name as the kernel shows it (15 characters at most). */
    static Kind ofThread(String name) {
      if (name.startsWith("Executor task")) {
        return TASKS;
      }
      if (name.contains("CompilerThre")) {
        return COMPILER;
      }
      if (name.startsWith("GC Thread")) {
        return COLLECTOR;
      }
      return null;
    }
  }

  private static final Path TASKS = Path.of("/proc/self/task");
  private static final double TICKS_PER_SECOND = 100;

  /** CPU seconds so far per live thread id, with its kind (null: none of the kinds). */
  private final Map<String, Double> seconds = new HashMap<>();
  private final Map<String, Kind> kinds = new HashMap<>();

  private ThreadKindCpu() {}

  static ThreadKindCpu now() {
    ThreadKindCpu snapshot = new ThreadKindCpu();
    if (!Files.isDirectory(TASKS)) {
      return snapshot;
    }
    try (Stream<Path> threads = Files.list(TASKS)) {
      threads.forEach(thread -> {
        String stat;
        try {
          stat = Files.readString(thread.resolve("stat"));
        } catch (IOException e) {
          return;  // the thread ended while listed
        }
        String name = stat.substring(stat.indexOf('(') + 1, stat.lastIndexOf(')'));
        // fields after the name: state is field 3 of stat(5); utime and stime are 14 and 15
        String[] fields = stat.substring(stat.lastIndexOf(')') + 2).split(" ");
        double cpu = (Long.parseLong(fields[11]) + Long.parseLong(fields[12])) / TICKS_PER_SECOND;
        String id = thread.getFileName().toString();
        snapshot.seconds.put(id, cpu);
        snapshot.kinds.put(id, Kind.ofThread(name));
      });
    } catch (IOException e) {
      throw new IllegalStateException("cannot list " + TASKS, e);
    }
    return snapshot;
  }

  /** CPU seconds of {@code kind}'s threads since {@code earlier} (threads that ended: lost). */
  double since(ThreadKindCpu earlier, Kind kind) {
    double total = 0;
    for (Map.Entry<String, Double> thread : seconds.entrySet()) {
      if (kinds.get(thread.getKey()) == kind) {
        total += thread.getValue() - earlier.seconds.getOrDefault(thread.getKey(), 0.0);
      }
    }
    return total;
  }
}
