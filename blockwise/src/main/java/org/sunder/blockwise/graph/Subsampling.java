package org.sunder.blockwise.graph;

import com.fasterxml.jackson.annotation.JsonCreator;
import com.fasterxml.jackson.annotation.JsonInclude;
import com.fasterxml.jackson.annotation.JsonProperty;
import java.io.Serializable;
import java.util.Arrays;
import org.sunder.blockwise.ErrorKind;

/**
 * Which long-range edges to keep. Nearest-neighbour edges are always kept. An edge is named by
 * its source voxel {@code p} (the voxel the affinity belongs to) in <b>global</b> coordinates and
 * its offset index {@code k}; the decision depends on nothing else, so every block and every face
 * that sees an edge makes the same decision.
 *
 * <ul>
 *   <li>{@code none}: keep all.</li>
 *   <li>{@code stride}: keep when {@code p[d] mod stride[d] == 0} for every axis {@code d}
 *       (memory order; the JSON array is memory order too).</li>
 *   <li>{@code hash}: keep when a 64-bit mix of {@code (seed, k, p)} falls below
 *       {@code keepFraction}; about that fraction of the edges is kept. The mix (SplitMix64's
 *       finalizer applied per component) is part of the on-disk contract: changing it changes
 *       results.</li>
 * </ul>
 *
 * <p>Jackson: {@code {"kind": "hash", "keepFraction": 0.1, "seed": 7}}. Immutable, thread-safe.
 */
@JsonInclude(JsonInclude.Include.NON_DEFAULT)
public record Subsampling(Kind kind, int[] stride, double keepFraction, long seed)
    implements Serializable {

  private static final long GOLDEN = 0x9E3779B97F4A7C15L;
  private static final double TWO_TO_MINUS_53 = 0x1.0p-53;
  /** Added to each scaled coordinate before it is mixed in. */
  private static final long COMPONENT = 0x632BE59BD9B4E019L;

  public enum Kind {
    @JsonProperty("none") NONE,
    @JsonProperty("stride") STRIDE,
    @JsonProperty("hash") HASH
  }

  @JsonCreator
  public Subsampling(@JsonProperty("kind") Kind kind, @JsonProperty("stride") int[] stride,
      @JsonProperty("keepFraction") double keepFraction, @JsonProperty("seed") long seed) {
    Kind k = kind == null ? Kind.NONE : kind;
    if (k == Kind.STRIDE) {
      if (stride == null || stride.length == 0) {
        throw config("subsampling.stride: missing; expected one positive step per axis");
      }
      for (int d = 0; d < stride.length; d++) {
        if (stride[d] < 1) {
          throw config("subsampling.stride[" + d + "] = " + stride[d]
              + "; expected a positive step");
        }
      }
    }
    if (k == Kind.HASH && !(keepFraction > 0 && keepFraction <= 1)) {
      throw config("subsampling.keepFraction = " + keepFraction + "; expected a number in (0, 1]");
    }
    this.kind = k;
    this.stride = k == Kind.STRIDE ? stride.clone() : null;
    this.keepFraction = k == Kind.HASH ? keepFraction : 0;
    this.seed = k == Kind.HASH ? seed : 0;
  }

  public static Subsampling none() {
    return new Subsampling(Kind.NONE, null, 0, 0);
  }

  /** Keep long-range edges whose source lies on the lattice {@code stride} (memory order). */
  public static Subsampling stride(int... stride) {
    return new Subsampling(Kind.STRIDE, stride, 0, 0);
  }

  /** Keep about {@code keepFraction} of the long-range edges, chosen by a seeded hash. */
  public static Subsampling hash(double keepFraction, long seed) {
    return new Subsampling(Kind.HASH, null, keepFraction, seed);
  }

  @Override
  public int[] stride() {
    return stride == null ? null : stride.clone();
  }

  /** Throws {@link GraphInputException} unless a stride has one step per offset axis. */
  public void validate(Offsets offsets) {
    if (kind == Kind.STRIDE && stride.length != offsets.dimension()) {
      throw config("subsampling.stride: " + stride.length + " entries but offsets have "
          + offsets.dimension() + " axes");
    }
  }

  /** True when nothing is dropped. */
  public boolean keepsAll() {
    return kind == Kind.NONE || (kind == Kind.HASH && keepFraction >= 1);
  }

  /**
   * Whether the edge from global voxel {@code globalVoxel} along offset {@code k} is kept; a
   * pure function of its arguments. Nearest-neighbour offsets are always kept.
   */
  public boolean keeps(long[] globalVoxel, int k, Offsets offsets) {
    return !offsets.isLongRange(k) || keepsLongRange(globalVoxel, k);
  }

  /** The decision for an edge whose offset {@code k} is long-range (see the class comment). */
  public boolean keepsLongRange(long[] globalVoxel, int k) {
    switch (kind) {
      case NONE:
        return true;
      case STRIDE:
        for (int d = 0; d < globalVoxel.length; d++) {
          if (Math.floorMod(globalVoxel[d], stride[d]) != 0) {
            return false;
          }
        }
        return true;
      default:
        if (keepFraction >= 1) {
          return true;
        }
        long h = mix(seed + GOLDEN * (k + 1));
        for (long c : globalVoxel) {
          h = mix(h ^ (c * GOLDEN + COMPONENT));
        }
        return (h >>> 11) * TWO_TO_MINUS_53 < keepFraction;
    }
  }

  /**
   * The decisions of {@link #keepsLongRange} for offset {@code k} along rows of voxels on axis 0
   * that start at global {@code x0} and hold {@code length} voxels: what depends on the first
   * coordinate alone (two of the four mixes in 3D) is computed here once, {@code O(length)}.
   * Null unless the kind is {@code hash} with a fraction below 1.
   */
  public RowDecisions rowDecisions(int k, long x0, int length) {
    if (kind != Kind.HASH || keepFraction >= 1) {
      return null;
    }
    long start = mix(seed + GOLDEN * (k + 1));
    long[] firstMix = new long[length];
    for (int i = 0; i < length; i++) {
      firstMix[i] = mix(start ^ ((x0 + i) * GOLDEN + COMPONENT));
    }
    // (h >>> 11) * 2^-53 < f  iff  (h >>> 11) < ceil(f * 2^53): both sides exact
    return new RowDecisions(firstMix, (long) Math.ceil(keepFraction * 0x1.0p53));
  }

  /** See {@link #rowDecisions}. Immutable. */
  public static final class RowDecisions {
    private final long[] firstMix;
    private final long bound;

    private RowDecisions(long[] firstMix, long bound) {
      this.firstMix = firstMix;
      this.bound = bound;
    }

    /**
     * {@link #keepsLongRange} of the {@code i}-th voxel of a row whose other global coordinates
     * are {@code global[1 ..]} ({@code global[0]} is not read).
     */
    public boolean keeps(int i, long[] global) {
      long h = firstMix[i];
      for (int d = 1; d < global.length; d++) {
        h = mix(h ^ (global[d] * GOLDEN + COMPONENT));
      }
      return (h >>> 11) < bound;
    }
  }

  private static long mix(long z) {
    z = (z ^ (z >>> 30)) * 0xBF58476D1CE4E5B9L;
    z = (z ^ (z >>> 27)) * 0x94D049BB133111EBL;
    return z ^ (z >>> 31);
  }

  @Override
  public boolean equals(Object o) {
    return o instanceof Subsampling s && kind == s.kind && Arrays.equals(stride, s.stride)
        && Double.compare(keepFraction, s.keepFraction) == 0 && seed == s.seed;
  }

  @Override
  public int hashCode() {
    return Arrays.hashCode(stride) * 31 + kind.hashCode() + Double.hashCode(keepFraction)
        + Long.hashCode(seed);
  }

  @Override
  public String toString() {
    return switch (kind) {
      case NONE -> "Subsampling[none]";
      case STRIDE -> "Subsampling[stride " + Arrays.toString(stride) + "]";
      case HASH -> "Subsampling[hash keep " + keepFraction + " seed " + seed + "]";
    };
  }

  private static GraphInputException config(String message) {
    return new GraphInputException(ErrorKind.INVALID_CONFIG, message);
  }
}
