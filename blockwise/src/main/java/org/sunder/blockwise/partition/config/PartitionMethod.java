package org.sunder.blockwise.partition.config;

import com.fasterxml.jackson.annotation.JsonCreator;
import com.fasterxml.jackson.annotation.JsonValue;
import java.io.Serializable;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.graph.Subsampling;
import org.sunder.blockwise.graph.WeightRule;
import org.sunder.blockwise.partition.PartitionConfigException;
import org.sunder.blockwise.partition.Partitioner;
import org.sunder.blockwise.partition.ReducedGraphSolver;
import org.sunder.blockwise.partition.agglomeration.Linkage;
import org.sunder.blockwise.partition.fragments.BlockFragments;
import org.sunder.blockwise.partition.fragments.FragmentOptions;
import org.sunder.blockwise.partition.sizefilter.SizeFilteredPartitioner;

/**
 * A partition method: its name in the configuration ({@code "method"} of a
 * {@link PartitionConfig}), which keys it takes and their defaults, its checks, the
 * {@link Partitioner} of a block and the {@link ReducedGraphSolver} that continues it across
 * blocks in the global solve. Each permitted type is a record without components (stateless,
 * value-equal, serialisable); the parameters live in the {@link PartitionConfig}, which hands
 * itself to the hooks.
 *
 * <p>Extension point: a new method is a record implementing this interface, added to the
 * {@code permits} clause; {@link #all()} finds it there, so the configuration's JSON, the
 * global solve and the tests that iterate over {@link #all()} take it up with no other change.
 */
public sealed interface PartitionMethod extends Serializable
    permits MutexWatershedMethod, AgglomerationMethod, FragmentsMulticutMethod,
        FragmentsAgglomerationMethod {

  /** The name in the configuration, e.g. {@code "mutex-watershed"}. */
  @JsonValue
  String jsonName();

  /**
   * Whether the method partitions fragments ({@link BlockFragments}) rather than voxels: it
   * takes {@code fragments} options, and its blocks give back the fragments of the clusters
   * they could not settle, which the global solve first rejoins across faces.
   */
  default boolean usesFragments() {
    return false;
  }

  /**
   * How many halos wide a block's fragment context is around its extended box (the partition
   * stage reads it so that a block makes the whole volume's fragments near its faces): one for
   * a fragment method, none for the others.
   */
  default int contextHalos() {
    return usesFragments() ? 1 : 0;
  }

  /**
   * Whether the method moves the border voxels of fragments made per section
   * ({@link org.sunder.blockwise.partition.fragments.FragmentBorders}): its block context then
   * holds every channel, not only the nearest-neighbour ones.
   */
  default boolean movesFragmentBorders() {
    return false;
  }

  /** Whether the method takes {@code linkage}, {@code constraints} and {@code threshold}. */
  default boolean takesLinkage() {
    return true;
  }

  /** The linkage when the configuration names none. */
  default Linkage defaultLinkage() {
    return Linkage.MEAN;
  }

  /** The weight rule when the configuration names none. */
  default WeightRule defaultWeights() {
    return WeightRule.byValue(WeightRule.Transform.LOGIT, null);
  }

  /** Which long-range edges the method reads when the configuration names no subsampling. */
  default Subsampling defaultSubsampling() {
    return Subsampling.none();
  }

  /**
   * Refuses keys the method does not take, given as configured ({@code linkage} null when
   * absent; {@code constraints} and {@code threshold} with their defaults filled in).
   *
   * @throws PartitionConfigException (INVALID_CONFIG) naming the key
   */
  default void checkKeys(Linkage linkage, boolean constraints, double threshold) {}

  /** Method-specific checks of a configuration against the dataset's offsets. */
  default void validate(PartitionConfig config, Offsets offsets) {}

  /** The block partitioner of {@code config} (of this method), before any size filter. */
  Partitioner partitioner(PartitionConfig config);

  /**
   * Bytes the method's kernel allocates per voxel of its block, besides the affinities and the
   * labels: the memory estimate of a partition task. Measured by {@code KernelBenchmark} (bytes
   * allocated by the calling thread, 13 offsets, float32, central 128 x 128 x 64 blocks of the
   * realistic tissue presets) where the method says so; allocated bytes bound the peak above.
   */
  int workingBytesPerVoxel();

  /**
   * CPU nanoseconds the reduced-graph solve spends per edge: the solve's time estimate in
   * {@code plan}. Each method names the run its figure was measured on.
   */
  double solveNanosPerEdge();

  /** The global solve's solver for {@code config} (of this method). */
  ReducedGraphSolver solver(PartitionConfig config);

  /** Which segment pairs the method kept apart by a constraint, for the size filter. */
  default SizeFilteredPartitioner.CannotLink cannotLink(PartitionConfig config) {
    return config.constraints() ? SizeFilteredPartitioner.CannotLink.NONZERO_LINKAGE
        : SizeFilteredPartitioner.CannotLink.NONE;
  }

  /**
   * This method with every key at its default, fragments (for a fragment method)
   * {@link FragmentOptions#fittedTo fitted} to the voxel size (memory order; null: isotropic
   * unit voxels, 3D flooding), and this {@code minSegmentSize} (null: off).
   */
  default PartitionConfig fittedTo(double[] voxelSizeOrNull, Integer minSegmentSize) {
    FragmentOptions fragments = !usesFragments() ? null
        : voxelSizeOrNull == null ? FragmentOptions.defaults()
            : FragmentOptions.fittedTo(voxelSizeOrNull);
    return new PartitionConfig(this, null, null, null, null, null, fragments, minSegmentSize);
  }

  /** The method a run uses when its configuration names none (see README, "Choosing a method"). */
  static PartitionMethod robustDefault() {
    return new FragmentsMulticutMethod();
  }

  /** Every method, in the order of the {@code permits} clause. */
  static List<PartitionMethod> all() {
    return Registry.ALL;
  }

  /** The method of this configuration name, if any. */
  static Optional<PartitionMethod> byName(String name) {
    for (PartitionMethod m : all()) {
      if (m.jsonName().equals(name)) {
        return Optional.of(m);
      }
    }
    return Optional.empty();
  }

  /**
   * The method of this configuration name.
   *
   * @throws PartitionConfigException (INVALID_CONFIG) listing the known names
   */
  @JsonCreator
  static PartitionMethod fromName(String name) {
    return byName(name).orElseThrow(() -> new PartitionConfigException(
        ErrorKind.INVALID_CONFIG, "method: unknown value \"" + name + "\"; expected one of "
            + names(false, ", ")));
  }

  /**
   * The methods' names, quoted when {@code quoted}, joined by {@code separator}; the last two
   * by " or " when quoted.
   */
  static String names(boolean quoted, String separator) {
    List<String> names = new ArrayList<>();
    for (PartitionMethod m : all()) {
      names.add(quoted ? "\"" + m.jsonName() + "\"" : m.jsonName());
    }
    return Registry.join(names, separator, quoted);
  }

  /** The fragment methods' names, quoted, joined by ", " and the last two by " or ". */
  static String fragmentNames() {
    List<String> names = new ArrayList<>();
    for (PartitionMethod m : all()) {
      if (m.usesFragments()) {
        names.add("\"" + m.jsonName() + "\"");
      }
    }
    return Registry.join(names, ", ", true);
  }

  /** The instances of the permitted records, built once. */
  final class Registry {
    private static final List<PartitionMethod> ALL = instances();

    private Registry() {}

    private static List<PartitionMethod> instances() {
      List<PartitionMethod> methods = new ArrayList<>();
      for (Class<?> type : PartitionMethod.class.getPermittedSubclasses()) {
        try {
          methods.add((PartitionMethod) type.getDeclaredConstructor().newInstance());
        } catch (ReflectiveOperationException e) {
          throw new IllegalStateException("partition method " + type.getName()
              + " must be a record without components", e);
        }
      }
      return List.copyOf(methods);
    }

    private static String join(List<String> names, String separator, boolean lastByOr) {
      StringBuilder out = new StringBuilder();
      for (int i = 0; i < names.size(); i++) {
        if (i > 0) {
          out.append(lastByOr && i == names.size() - 1 ? " or " : separator);
        }
        out.append(names.get(i));
      }
      return out.toString();
    }
  }
}
