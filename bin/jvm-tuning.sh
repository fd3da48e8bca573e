# Sourced by bin/sunder and bin/bench: the JVM flags they add before the user's
# SUNDER_JAVA_OPTS (README "Run on a cluster" gives the same flags to spark-submit users).
# Sets the array jvm_tuning.
jvm_tuning=()
# the heap in 2 MiB pages where the kernel offers them: the partition's and the solve's large
# hash tables and arrays then miss the TLB far less (docs/performance-log.md)
grep -qs '\[always\]\|\[madvise\]' /sys/kernel/mm/transparent_hugepage/enabled \
  && jvm_tuning+=(-XX:+UseTransparentHugePages)
# the throughput collector: batch tasks that allocate large arrays spend less CPU than under
# G1 (docs/performance-log.md); not when the user's options choose a collector, which the JVM
# would refuse as a conflict
grep -Eq -- '-XX:\+Use[A-Za-z0-9]*GC( |$)' <<< "${SUNDER_JAVA_OPTS:-}" \
  || jvm_tuning+=(-XX:+UseParallelGC)
