package org.sunder.blockwise.graph;

import com.fasterxml.jackson.annotation.JsonCreator;
import com.fasterxml.jackson.annotation.JsonInclude;
import com.fasterxml.jackson.annotation.JsonProperty;
import java.io.Serializable;
import java.util.Arrays;
import java.util.Objects;
import org.sunder.blockwise.ErrorKind;

/**
 * How an affinity {@code a} of channel {@code k} becomes a signed edge weight ({@code > 0}
 * attractive, {@code < 0} repulsive, {@code 0} indifferent).
 *
 * <ul>
 *   <li>{@link Kind#CHANNEL_ROLE} (JSON {@code "channel-role"}): each offset is attractive,
 *       weight {@code a}, or repulsive, weight {@code -(1 - a)}, as in the formulation of "The
 *       Mutex Watershed and its Objective: Efficient, Parameter-Free Graph Partitioning" (TPAMI
 *       2020). {@code attractive} may be omitted: then nearest-neighbour offsets are attractive
 *       and long-range offsets repulsive.</li>
 *   <li>{@link Kind#VALUE} (JSON {@code "value"}): {@code w = logit(a) + bias[k]} with
 *       {@code a} clamped to {@code [clamp, 1 - clamp]} (default {@value #LOGIT_EPSILON}), or
 *       {@code w = a - 0.5 + bias[k]} ({@link Transform#CENTERED}); {@code bias} may be
 *       omitted (all zero).</li>
 * </ul>
 *
 * <p>The clamp bounds what one voxel edge can say: with {@code clamp = 0.01} no edge weighs
 * more than {@code |logit(0.01)| = 4.6}, so affinities a prediction pushed to exactly 0 or 1
 * (noise clipped to [0, 1], 8-bit values 0 and 255) count as very sure, not as 13.8 times
 * surer than {@code a = 0.73}.
 *
 * <p>Jackson reads it as {@code {"kind": "channel-role", "attractive": [true, false]}} or
 * {@code {"kind": "value", "transform": "logit", "bias": [0.0, -0.2], "clamp": 0.01}}. Check
 * it against the offsets with {@link #validate(Offsets)}. Immutable (arrays copied).
 */
@JsonInclude(JsonInclude.Include.NON_NULL)
public record WeightRule(Kind kind, boolean[] attractive, Transform transform, double[] bias,
    Double clamp) implements Serializable {

  /** Clamp used by the logit when none is given, so that 0 and 1 give finite weights. */
  public static final double LOGIT_EPSILON = 1e-6;

  public enum Kind {
    @JsonProperty("channel-role") CHANNEL_ROLE,
    @JsonProperty("value") VALUE
  }

  public enum Transform {
    @JsonProperty("logit") LOGIT,
    @JsonProperty("centered") CENTERED
  }

  @JsonCreator
  public WeightRule(@JsonProperty("kind") Kind kind,
      @JsonProperty("attractive") boolean[] attractive,
      @JsonProperty("transform") Transform transform,
      @JsonProperty("bias") double[] bias,
      @JsonProperty("clamp") Double clamp) {
    if (kind == null) {
      throw config("weights.kind: missing; expected \"channel-role\" or \"value\"");
    }
    if (kind == Kind.VALUE && transform == null) {
      throw config("weights.transform: missing; expected \"logit\" or \"centered\"");
    }
    if (bias != null) {
      for (int k = 0; k < bias.length; k++) {
        if (!Double.isFinite(bias[k])) {
          throw config("weights.bias[" + k + "] = " + bias[k] + "; expected a finite number");
        }
      }
    }
    if (clamp != null && (kind != Kind.VALUE || transform != Transform.LOGIT)) {
      throw config("weights.clamp: only for {\"kind\": \"value\", \"transform\": \"logit\"}");
    }
    if (clamp != null && !(clamp > 0 && clamp < 0.5)) {
      throw config("weights.clamp: " + clamp + "; expected a number in (0, 0.5)");
    }
    this.kind = kind;
    this.attractive = attractive == null ? null : attractive.clone();
    this.transform = kind == Kind.VALUE ? transform : null;
    this.bias = bias == null ? null : bias.clone();
    this.clamp = clamp;
  }

  /** Channel roles given explicitly, one per offset. */
  public static WeightRule byChannelRole(boolean[] attractive) {
    return new WeightRule(Kind.CHANNEL_ROLE, attractive, null, null, null);
  }

  /** Channel roles by offset: nearest-neighbour attractive, long-range repulsive. */
  public static WeightRule byChannelRole() {
    return new WeightRule(Kind.CHANNEL_ROLE, null, null, null, null);
  }

  /** Weights by value; {@code bias} may be null (all zero). */
  public static WeightRule byValue(Transform transform, double[] bias) {
    return new WeightRule(Kind.VALUE, null, transform, bias, null);
  }

  /** Logit weights of affinities clamped to {@code [clamp, 1 - clamp]}; no bias. */
  public static WeightRule logit(double clamp) {
    return new WeightRule(Kind.VALUE, null, Transform.LOGIT, null, clamp);
  }

  @Override
  public boolean[] attractive() {
    return attractive == null ? null : attractive.clone();
  }

  @Override
  public double[] bias() {
    return bias == null ? null : bias.clone();
  }

  /** Throws {@link GraphInputException} naming the key unless array lengths fit the offsets. */
  public void validate(Offsets offsets) {
    if (attractive != null && attractive.length != offsets.count()) {
      throw config("weights.attractive: " + attractive.length + " entries but "
          + offsets.count() + " offsets; expected one per offset");
    }
    if (bias != null && bias.length != offsets.count()) {
      throw config("weights.bias: " + bias.length + " entries but " + offsets.count()
          + " offsets; expected one per offset");
    }
  }

  /** Whether channel {@code k} is attractive under {@link Kind#CHANNEL_ROLE}. */
  public boolean isAttractive(Offsets offsets, int k) {
    return attractive != null ? attractive[k] : !offsets.isLongRange(k);
  }

  /**
   * Per-channel coefficients for {@link #weight}: validated against {@code offsets}.
   * For CHANNEL_ROLE 1 = attractive, 0 = repulsive; for VALUE the bias.
   */
  public float[] channelParameters(Offsets offsets) {
    validate(offsets);
    float[] p = new float[offsets.count()];
    for (int k = 0; k < p.length; k++) {
      if (kind == Kind.CHANNEL_ROLE) {
        p[k] = isAttractive(offsets, k) ? 1f : 0f;
      } else {
        p[k] = bias == null ? 0f : (float) bias[k];
      }
    }
    return p;
  }

  /**
   * The clamp of a logit rule without bias, whose weight is {@code log(c / (1 − c))} of the
   * clamped affinity {@code c} on every channel (so sums of weights may be taken as logarithms
   * of products); NaN for any other rule.
   */
  public double unbiasedLogitClamp() {
    if (kind != Kind.VALUE || transform != Transform.LOGIT) {
      return Double.NaN;
    }
    if (bias != null) {
      for (double b : bias) {
        if ((float) b != 0f) {
          return Double.NaN;
        }
      }
    }
    return clamp == null ? LOGIT_EPSILON : clamp;
  }

  /**
   * {@code log(c / (1 − c))} of an affinity {@code c} already clamped: a weight of an unbiased
   * logit rule before its rounding to a float. Pair sums add these in double precision (a
   * block's {@link RegionGraph} and a face's seam edges alike), so that a pair's sum comes out
   * the same, up to its last bits, however its edges are grouped.
   */
  public static double logitOfClamped(double c) {
    return Math.log(c / (1 - c));
  }

  /** The weight of affinity {@code a} with channel parameter {@code p} (see above). */
  public float weight(float a, float p) {
    if (kind == Kind.CHANNEL_ROLE) {
      return p != 0f ? a : a - 1f;
    }
    if (transform == Transform.CENTERED) {
      return a - 0.5f + p;
    }
    double low = clamp == null ? LOGIT_EPSILON : clamp;
    double c = Math.min(Math.max(a, low), 1 - low);
    return (float) (Math.log(c / (1 - c)) + p);
  }

  @Override
  public boolean equals(Object o) {
    return o instanceof WeightRule r && kind == r.kind && transform == r.transform
        && Arrays.equals(attractive, r.attractive) && Arrays.equals(bias, r.bias)
        && Objects.equals(clamp, r.clamp);
  }

  @Override
  public int hashCode() {
    return Objects.hash(kind, transform, Arrays.hashCode(attractive), Arrays.hashCode(bias),
        clamp);
  }

  @Override
  public String toString() {
    return "WeightRule[" + kind + (kind == Kind.VALUE ? " " + transform : "")
        + (attractive != null ? " attractive=" + Arrays.toString(attractive) : "")
        + (bias != null ? " bias=" + Arrays.toString(bias) : "")
        + (clamp != null ? " clamp=" + clamp : "") + "]";
  }

  private static GraphInputException config(String message) {
    return new GraphInputException(ErrorKind.INVALID_CONFIG, message);
  }
}
