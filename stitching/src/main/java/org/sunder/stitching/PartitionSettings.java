package org.sunder.stitching;

import java.io.Serializable;
import org.sunder.blockwise.graph.Subsampling;
import org.sunder.blockwise.graph.WeightRule;
import org.sunder.blockwise.partition.FragmentOptions;
import org.sunder.blockwise.partition.Linkage;
import org.sunder.blockwise.partition.PartitionConfig;
import org.sunder.blockwise.partition.SizeFilter;

/**
 * The parts of a {@link PartitionConfig}, as a serialisable value that tasks carry.
 *
 * @param method the partition method
 * @param linkage the agglomeration linkage, or null for the Mutex Watershed
 * @param constraints whether agglomeration uses cannot-link constraints
 * @param threshold the agglomeration's merge threshold
 * @param weights how affinities become weights
 * @param subsampling which long-range edges are kept
 * @param fragments the fragment options of the fragment methods, else null
 * @param minSegmentSize the size filter's threshold (1 = off)
 * @param sizeFilter the size filter's rule, or null when the filter is off
 */
public record PartitionSettings(PartitionConfig.Method method, Linkage linkage,
    boolean constraints, double threshold, WeightRule weights, Subsampling subsampling,
    FragmentOptions fragments, int minSegmentSize, SizeFilter.Rule sizeFilter)
    implements Serializable {

  static PartitionSettings of(PartitionConfig config) {
    return new PartitionSettings(config.method(), config.linkage(), config.constraints(),
        config.threshold(), config.weights(), config.subsampling(), config.fragments(),
        config.minSegmentSize(), config.sizeFilter());
  }

  /** The configuration again (validated by its constructor). */
  public PartitionConfig toConfig() {
    return new PartitionConfig(method, linkage, constraints, threshold, weights, subsampling,
        fragments, minSegmentSize, sizeFilter);
  }
}
