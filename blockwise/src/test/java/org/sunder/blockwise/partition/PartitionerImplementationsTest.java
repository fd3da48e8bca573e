package org.sunder.blockwise.partition;

import org.junit.jupiter.api.Nested;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.blockwise.partition.fragments.BaselineWatershed;
import org.sunder.blockwise.partition.mutex.MutexWatershed;
import org.sunder.blockwise.partition.sizefilter.SizeFilteredPartitioner;

/** {@link PartitionerContract} run against every {@link Partitioner} implementation. */
class PartitionerImplementationsTest {

  private static Partitioner configured(String json) {
    return PartitionConfig.fromJson(json).create();
  }

  @Nested
  class MutexWatershed extends PartitionerContract {
    @Override
    Partitioner partitioner() {
      return configured("{\"method\": \"mutex-watershed\"}");
    }
  }

  @Nested
  class MeanAgglomeration extends PartitionerContract {
    @Override
    Partitioner partitioner() {
      return configured("{\"method\": \"agglomeration\", \"linkage\": \"mean\"}");
    }
  }

  @Nested
  class ConstrainedAgglomeration extends PartitionerContract {
    @Override
    Partitioner partitioner() {
      return configured("{\"method\": \"agglomeration\", \"linkage\": \"max\", "
          + "\"constraints\": true}");
    }
  }

  @Nested
  class FragmentsMulticut extends PartitionerContract {
    @Override
    Partitioner partitioner() {
      return configured("{\"method\": \"fragments-multicut\"}");
    }
  }

  @Nested
  class FragmentsAgglomeration extends PartitionerContract {
    @Override
    Partitioner partitioner() {
      return configured("{\"method\": \"fragments-agglomeration\"}");
    }
  }

  @Nested
  class SizeFiltered extends PartitionerContract {
    @Override
    Partitioner partitioner() {
      Partitioner p = configured("{\"method\": \"mutex-watershed\", \"minSegmentSize\": 12}");
      if (!(p instanceof SizeFilteredPartitioner)) {
        throw new AssertionError("minSegmentSize gives a " + p.getClass().getSimpleName());
      }
      return p;
    }
  }

  @Nested
  class Baseline extends PartitionerContract {
    @Override
    Partitioner partitioner() {
      return new BaselineWatershed();
    }
  }
}
