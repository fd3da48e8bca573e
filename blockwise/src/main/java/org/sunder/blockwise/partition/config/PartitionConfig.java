package org.sunder.blockwise.partition.config;

import com.fasterxml.jackson.annotation.JsonCreator;
import com.fasterxml.jackson.annotation.JsonIgnore;
import com.fasterxml.jackson.annotation.JsonInclude;
import com.fasterxml.jackson.annotation.JsonProperty;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.JsonMappingException;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.util.Objects;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.graph.Subsampling;
import org.sunder.blockwise.graph.WeightRule;
import org.sunder.blockwise.partition.PartitionConfigException;
import org.sunder.blockwise.partition.Partitioner;
import org.sunder.blockwise.partition.ReducedGraphSolver;
import org.sunder.blockwise.partition.agglomeration.Linkage;
import org.sunder.blockwise.partition.fragments.FragmentOptions;
import org.sunder.blockwise.partition.sizefilter.SizeFilter;
import org.sunder.blockwise.partition.sizefilter.SizeFilteredPartitioner;

/**
 * How blocks are partitioned: the method and its parameters, read from JSON, e.g.
 * <pre>{@code
 * {"method": "agglomeration", "linkage": "mean", "constraints": false, "threshold": 0.0,
 *  "weights": {"kind": "value", "transform": "logit"},
 *  "subsampling": {"kind": "hash", "keepFraction": 0.1, "seed": 7}}
 * }</pre>
 *
 * <p>Keys: {@code method} ({@code "mutex-watershed"}, {@code "agglomeration"},
 * {@code "fragments-multicut"} or {@code "fragments-agglomeration"}); {@code linkage}
 * (not for the Mutex Watershed; {@code sum}, {@code mean}, {@code max}, {@code min},
 * {@code abs-max}; default {@code mean}, for {@code fragments-multicut} {@code sum}: the
 * multicut cost of a fragment pair); {@code constraints} (cannot-link constraints, default false);
 * {@code threshold} (merge while the linkage exceeds it, default 0; must be 0 with constraints);
 * {@code weights} (a {@link WeightRule}; default channel roles for the Mutex Watershed and
 * {@code logit} by value for agglomeration); {@code subsampling} (a {@link Subsampling}; default
 * none, for the Mutex Watershed {@link MutexWatershedMethod#LONG_RANGE_KEPT} of the long-range
 * edges; {@code {"kind": "none"}} reads them all); {@code fragments} (fragment methods only: a
 * {@link FragmentOptions}, defaults if omitted); {@code minSegmentSize} (any method, default
 * 0 = off; see below); {@code sizeFilter} (how {@code minSegmentSize} treats the method's
 * constraints: {@code "complete"}, the default, or {@code "within-constraints"}; only with
 * {@code minSegmentSize} above 1); {@code kernighanLin} ({@code fragments-multicut} only:
 * refine each multicut by Kernighan–Lin after the greedy additive contraction, default false: on
 * the realistic tissue presets it changed the adapted Rand error by under 0.001 and cost a fifth
 * of the partition). {@link #validate(Offsets)} checks them against the dataset's offsets.
 *
 * <p>The size filter ({@link SizeFilter}), applied after the method: smallest segment first, a
 * segment with fewer than {@code minSegmentSize} voxels joins the adjacent segment it is most
 * attracted to, ranked by the mean weight of the voxel edges between them (mean linkage; ties
 * to the lower label), preferring neighbours the method did not keep apart by a constraint.
 * With {@code "complete"} it joins a constrained neighbour (across repulsion) when it has no
 * other, so afterwards no segment below the size remains unless it touches no other segment.
 * With {@code "within-constraints"} it never crosses the method's constraints (the Mutex
 * Watershed's repulsive edges, constrained agglomeration's constrained pairs), and a small
 * segment with only constrained neighbours stays. Under both, two segments that each hold at
 * least {@code minSegmentSize} voxels are never joined, and masked voxels stay 0. In a blockwise
 * run the fragment methods filter only after the global solve, over the whole volume's
 * segments; with the voxel methods each block filters only segments that lie wholly inside its
 * core away from the faces and the rest is decided after the global solve (see the stitching
 * module's {@code GlobalSolve}).
 *
 * <p>Extension point: each method is a {@link PartitionMethod} (its JSON name, the keys it
 * takes and their defaults, its checks, its partitioner and its global solver); a new method is
 * a new record there, and this class does not change. Immutable, serialisable.
 */
public final class PartitionConfig implements java.io.Serializable {
  /** 3: the {@code kernighanLin} key. */
  private static final long serialVersionUID = 3L;

  private final PartitionMethod method;
  private final Linkage linkage;
  private final boolean constraints;
  private final double threshold;
  private final WeightRule weights;
  private final Subsampling subsampling;
  private final FragmentOptions fragments;
  private final int minSegmentSize;
  private final SizeFilter.Rule sizeFilter;
  private final boolean kernighanLin;

  /** As the full constructor without fragment options and size filter. */
  public PartitionConfig(PartitionMethod method, Linkage linkage, Boolean constraints,
      Double threshold, WeightRule weights, Subsampling subsampling) {
    this(method, linkage, constraints, threshold, weights, subsampling, null, null, null);
  }

  /** As the full constructor with the default size filter rule. */
  public PartitionConfig(PartitionMethod method, Linkage linkage, Boolean constraints,
      Double threshold, WeightRule weights, Subsampling subsampling, FragmentOptions fragments,
      Integer minSegmentSize) {
    this(method, linkage, constraints, threshold, weights, subsampling, fragments,
        minSegmentSize, null);
  }

  /** As the full constructor without Kernighan–Lin refinement. */
  public PartitionConfig(PartitionMethod method, Linkage linkage, Boolean constraints,
      Double threshold, WeightRule weights, Subsampling subsampling, FragmentOptions fragments,
      Integer minSegmentSize, SizeFilter.Rule sizeFilter) {
    this(method, linkage, constraints, threshold, weights, subsampling, fragments,
        minSegmentSize, sizeFilter, null);
  }

  /** Null arguments take their defaults (see the class comment); {@code method} is required. */
  @JsonCreator
  public PartitionConfig(@JsonProperty("method") PartitionMethod method,
      @JsonProperty("linkage") Linkage linkage,
      @JsonProperty("constraints") Boolean constraints,
      @JsonProperty("threshold") Double threshold,
      @JsonProperty("weights") WeightRule weights,
      @JsonProperty("subsampling") Subsampling subsampling,
      @JsonProperty("fragments") FragmentOptions fragments,
      @JsonProperty("minSegmentSize") Integer minSegmentSize,
      @JsonProperty("sizeFilter") SizeFilter.Rule sizeFilter,
      @JsonProperty("kernighanLin") Boolean kernighanLin) {
    if (method == null) {
      throw invalid("method: missing; expected " + PartitionMethod.names(true, ", "));
    }
    this.method = method;
    this.linkage = linkage != null ? linkage : method.defaultLinkage();
    this.constraints = constraints != null && constraints;
    this.threshold = threshold != null ? threshold : 0;
    if (!Double.isFinite(this.threshold)) {
      throw invalid("threshold: " + threshold + "; expected a finite number");
    }
    if (this.constraints && this.threshold != 0) {
      throw invalid("threshold: " + threshold + " with constraints; constrained agglomeration "
          + "stops where no linkage is positive, so the threshold must be 0");
    }
    method.checkKeys(linkage, this.constraints, this.threshold);
    this.weights = weights != null ? weights : method.defaultWeights();
    this.subsampling = subsampling != null ? subsampling : method.defaultSubsampling();
    boolean fromFragments = method.usesFragments();
    if (fragments != null && !fromFragments) {
      throw invalid("fragments: not used by method \"" + method.jsonName() + "\"; remove it or "
          + "use " + PartitionMethod.fragmentNames());
    }
    this.fragments = fromFragments
        ? (fragments != null ? fragments : FragmentOptions.defaults()) : null;
    if (minSegmentSize != null && minSegmentSize < 0) {
      throw invalid("minSegmentSize: " + minSegmentSize + "; expected an integer >= 0");
    }
    this.minSegmentSize = minSegmentSize != null ? minSegmentSize : 0;
    if (sizeFilter != null && this.minSegmentSize <= 1) {
      throw invalid("sizeFilter: \"" + sizeFilter.jsonName() + "\" without a size filter; "
          + "set minSegmentSize above 1 or remove sizeFilter");
    }
    this.sizeFilter = sizeFilter != null ? sizeFilter : SizeFilter.Rule.COMPLETE;
    if (kernighanLin != null && !(method instanceof FragmentsMulticutMethod)) {
      throw invalid("kernighanLin: not used by method \"" + method.jsonName()
          + "\"; only \"fragments-multicut\" solves a multicut");
    }
    this.kernighanLin = kernighanLin != null && kernighanLin;
  }

  /**
   * The method a run uses when its configuration names none: {@code fragments-multicut} with
   * logit weights over every offset, fragments {@link FragmentOptions#fittedTo fitted} to the
   * voxel size (memory order; null: isotropic unit voxels, 3D flooding) and the size filter at
   * {@link #defaultMinSegmentSize}. Chosen by measurement on the realistic tissue presets
   * (README, "Choosing a method").
   */
  public static PartitionConfig robustDefault(double[] voxelSizeOrNull) {
    return PartitionMethod.robustDefault().fittedTo(voxelSizeOrNull,
        defaultMinSegmentSize(voxelSizeOrNull));
  }

  /** Radius, nm, of the smallest ball the default keeps as a segment of its own. */
  public static final double MIN_SEGMENT_RADIUS_NM = 50;
  /** The same radius in voxels when the voxel size is unknown. */
  public static final double MIN_SEGMENT_RADIUS_VOXELS = 3;

  /**
   * The default's {@code minSegmentSize}: the voxels in a ball of radius
   * {@value #MIN_SEGMENT_RADIUS_NM} nm (the thinnest neurites are about 100 nm across, so a
   * smaller segment is no object a network resolves), or of {@value #MIN_SEGMENT_RADIUS_VOXELS}
   * voxels when the voxel size is unknown (null); at least 2. The axis order of the voxel size
   * does not matter.
   */
  public static int defaultMinSegmentSize(double[] voxelSizeOrNull) {
    double radius = voxelSizeOrNull == null ? MIN_SEGMENT_RADIUS_VOXELS : MIN_SEGMENT_RADIUS_NM;
    int dims = voxelSizeOrNull == null ? 3 : voxelSizeOrNull.length;
    double voxelVolume = 1;
    for (int d = 0; d < dims; d++) {
      voxelVolume *= voxelSizeOrNull == null ? 1 : voxelSizeOrNull[d];
    }
    double ball = dims == 2 ? Math.PI * radius * radius
        : 4.0 / 3 * Math.PI * radius * radius * radius;
    return (int) Math.max(2, Math.round(ball / voxelVolume));
  }

  public static PartitionConfig mutexWatershed(WeightRule weights, Subsampling subsampling) {
    return new PartitionConfig(new MutexWatershedMethod(), null, null, null, weights,
        subsampling);
  }

  public static PartitionConfig agglomeration(Linkage linkage, boolean constraints,
      WeightRule weights, Subsampling subsampling) {
    return new PartitionConfig(new AgglomerationMethod(), linkage, constraints, null, weights,
        subsampling);
  }

  /**
   * Reads a configuration from JSON; every mistake becomes a {@link SunderException} of kind
   * {@link ErrorKind#INVALID_CONFIG} whose message names the key.
   */
  public static PartitionConfig fromJson(String json) {
    ObjectMapper mapper = new ObjectMapper()
        .enable(DeserializationFeature.FAIL_ON_UNKNOWN_PROPERTIES);
    try {
      return mapper.readValue(json, PartitionConfig.class);
    } catch (JsonProcessingException e) {
      for (Throwable t = e; t != null; t = t.getCause()) {
        if (t instanceof SunderException s) {
          throw new PartitionConfigException(ErrorKind.INVALID_CONFIG, s.getMessage());
        }
      }
      String where = e instanceof JsonMappingException m && !m.getPath().isEmpty()
          ? pathOf(m) : "partition";
      throw invalid(where + ": " + e.getOriginalMessage());
    }
  }

  private static String pathOf(JsonMappingException e) {
    StringBuilder path = new StringBuilder();
    for (JsonMappingException.Reference r : e.getPath()) {
      if (r.getFieldName() != null) {
        path.append(path.length() == 0 ? "" : ".").append(r.getFieldName());
      } else {
        path.append('[').append(r.getIndex()).append(']');
      }
    }
    return path.toString();
  }

  /** Throws {@link SunderException} (INVALID_CONFIG) naming the key unless all fits. */
  public void validate(Offsets offsets) {
    weights.validate(offsets);
    subsampling.validate(offsets);
    method.validate(this, offsets);
  }

  /** The configured partitioner: the method's, then the size filter if one is set. */
  public Partitioner create() {
    Partitioner partitioner = method.partitioner(this);
    if (minSegmentSize <= 1) {
      return partitioner;
    }
    return new SizeFilteredPartitioner(partitioner, createSizeFilter(), weights, subsampling,
        sizeFilterCannotLink(), linkage);
  }

  /** The global solve's solver of the reduced graph for this configuration's method. */
  public ReducedGraphSolver createSolver() {
    return method.solver(this);
  }

  /** The configured size filter (mean linkage), or null when {@code minSegmentSize <= 1}. */
  public SizeFilter createSizeFilter() {
    return minSegmentSize <= 1 ? null
        : new SizeFilter(minSegmentSize, Linkage.MEAN, sizeFilter);
  }

  /** Which segment pairs the method kept apart by a constraint, for the size filter. */
  @JsonIgnore
  public SizeFilteredPartitioner.CannotLink sizeFilterCannotLink() {
    return method.cannotLink(this);
  }

  @JsonProperty("method")
  public PartitionMethod method() {
    return method;
  }

  @JsonProperty("linkage")
  public Linkage linkage() {
    return method.takesLinkage() ? linkage : null;
  }

  @JsonProperty("constraints")
  public boolean constraints() {
    return constraints;
  }

  @JsonProperty("threshold")
  public double threshold() {
    return threshold;
  }

  @JsonProperty("weights")
  public WeightRule weights() {
    return weights;
  }

  @JsonProperty("subsampling")
  public Subsampling subsampling() {
    return subsampling;
  }

  /** Fragment options of the fragment-based methods, else null. */
  @JsonProperty("fragments")
  @JsonInclude(JsonInclude.Include.NON_NULL)
  public FragmentOptions fragments() {
    return fragments;
  }

  /** Segments with fewer voxels are merged away (see the class comment); 0 or 1 = off. */
  @JsonProperty("minSegmentSize")
  public int minSegmentSize() {
    return minSegmentSize;
  }

  /** How the size filter treats the method's constraints; null when the filter is off. */
  @JsonProperty("sizeFilter")
  @JsonInclude(JsonInclude.Include.NON_NULL)
  public SizeFilter.Rule sizeFilter() {
    return minSegmentSize > 1 ? sizeFilter : null;
  }

  /** Whether each multicut is refined by Kernighan–Lin; null for the methods without one. */
  @JsonProperty("kernighanLin")
  @JsonInclude(JsonInclude.Include.NON_NULL)
  public Boolean kernighanLinOrNull() {
    return method instanceof FragmentsMulticutMethod ? kernighanLin : null;
  }

  /** Whether each multicut is refined by Kernighan–Lin (false for the other methods). */
  @JsonIgnore
  public boolean kernighanLin() {
    return kernighanLin;
  }

  @JsonIgnore
  public boolean isMutexWatershed() {
    return method instanceof MutexWatershedMethod;
  }

  @Override
  public boolean equals(Object o) {
    return o instanceof PartitionConfig c && method.equals(c.method) && linkage == c.linkage
        && constraints == c.constraints && threshold == c.threshold && weights.equals(c.weights)
        && subsampling.equals(c.subsampling) && Objects.equals(fragments, c.fragments)
        && minSegmentSize == c.minSegmentSize && Objects.equals(sizeFilter(), c.sizeFilter())
        && kernighanLin == c.kernighanLin;
  }

  @Override
  public int hashCode() {
    return Objects.hash(method, linkage, constraints, threshold, weights, subsampling, fragments,
        minSegmentSize, sizeFilter(), kernighanLin);
  }

  @Override
  public String toString() {
    return "PartitionConfig[" + method.jsonName() + (method.takesLinkage()
        ? " " + linkage.jsonName() + (constraints ? " constrained" : "") : "") + ", " + weights
        + ", " + subsampling + (fragments != null ? ", " + fragments : "")
        + (minSegmentSize > 1 ? ", minSegmentSize " + minSegmentSize + " "
            + sizeFilter.jsonName() : "") + (kernighanLin ? ", Kernighan-Lin" : "") + "]";
  }

  private static PartitionConfigException invalid(String message) {
    return new PartitionConfigException(ErrorKind.INVALID_CONFIG, message);
  }
}
