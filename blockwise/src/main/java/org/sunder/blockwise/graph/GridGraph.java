package org.sunder.blockwise.graph;

/**
 * The implicit signed graph of an {@link AffinityBlock}: nodes are the voxels of the box
 * (index in memory order), edges are pairs (voxel {@code p}, offset {@code k}) joining {@code p}
 * and {@code p + d_k}. No edge object exists; the edge id is {@code p + k * nodeCount()}, the
 * flat index of its affinity.
 *
 * <p>An edge is <em>present</em> when both ends lie in the box (edges leaving the box are
 * absent), both ends are inside the mask, and the {@link Subsampling} keeps it. Its weight comes
 * from the {@link WeightRule}; a present edge may have weight 0 (statistics count it, partition
 * algorithms treat it as neither attractive nor repulsive).
 *
 * <p>{@link #forEachEdge} visits all present edges in ascending edge id in
 * {@code O(nodeCount * offsetCount)} time without allocation per edge. Immutable, thread-safe.
 */
public final class GridGraph {
  private final AffinityBlock block;
  private final WeightRule rule;
  private final Subsampling subsampling;
  private final int nodeCount;
  private final int offsetCount;
  private final int[] delta;
  private final float[] parameters;
  private final float[] byteWeights;
  private final boolean[] longRange;

  /** Receives one present edge: source voxel, target voxel, offset index, signed weight. */
  @FunctionalInterface
  public interface EdgeVisitor {
    void visit(int source, int target, int offset, float weight);
  }

  private GridGraph(AffinityBlock block, WeightRule rule, Subsampling subsampling) {
    this.block = block;
    this.rule = rule;
    this.subsampling = subsampling;
    Offsets offsets = block.offsets();
    subsampling.validate(offsets);
    this.parameters = rule.channelParameters(offsets);
    this.nodeCount = block.voxelCount();
    this.offsetCount = offsets.count();
    this.delta = new int[offsetCount];
    this.longRange = new boolean[offsetCount];
    for (int k = 0; k < offsetCount; k++) {
      int step = 1;
      for (int d = 0; d < block.dimension(); d++) {
        delta[k] += offsets.component(k, d) * step;
        step *= block.shape(d);
      }
      longRange[k] = offsets.isLongRange(k);
    }
    this.byteWeights = block.isQuantized() ? byteWeightTable() : null;
  }

  /** The graph of {@code block}; validates rule and subsampling against its offsets. */
  public static GridGraph of(AffinityBlock block, WeightRule rule, Subsampling subsampling) {
    return new GridGraph(block, rule, subsampling);
  }

  public AffinityBlock block() {
    return block;
  }

  public WeightRule weightRule() {
    return rule;
  }

  public Subsampling subsampling() {
    return subsampling;
  }

  public int nodeCount() {
    return nodeCount;
  }

  public int offsetCount() {
    return offsetCount;
  }

  /** Number of edge ids {@code nodeCount * offsetCount}, present or not. */
  public int edgeSlotCount() {
    return nodeCount * offsetCount;
  }

  /** Index difference {@code target - source} of offset {@code k} inside the box. */
  public int delta(int k) {
    return delta[k];
  }

  /** Signed weight of edge slot (voxel, k), whether present or not. */
  public float weight(int voxel, int k) {
    int i = voxel + k * nodeCount;
    if (byteWeights != null) {
      return byteWeights[k * 256 + (block.byteValuesOrNull()[i] & 0xff)];
    }
    return rule.weight(block.floatValuesOrNull()[i], parameters[k]);
  }

  /**
   * The weight table of a quantized block: entry {@code k * 256 + b} is the weight of byte
   * value {@code b} on channel {@code k}; null for float blocks. Do not modify.
   */
  public float[] byteWeightTableOrNull() {
    return byteWeights;
  }

  /** The target voxel of edge (voxel, k) if the edge is present, else -1. Allocates. */
  public int target(int voxel, int k) {
    int[] p = block.position(voxel);
    long[] global = new long[p.length];
    for (int d = 0; d < p.length; d++) {
      int t = p[d] + block.offsets().component(k, d);
      if (t < 0 || t >= block.shape(d)) {
        return -1;
      }
      global[d] = block.globalMin(d) + p[d];
    }
    int target = voxel + delta[k];
    if (!block.inside(voxel) || !block.inside(target)) {
      return -1;
    }
    if (longRange[k] && !subsampling.keepsLongRange(global, k)) {
      return -1;
    }
    return target;
  }

  /** True when edge (voxel, k) is present. Allocates; use {@link #forEachEdge} in bulk. */
  public boolean hasEdge(int voxel, int k) {
    return target(voxel, k) >= 0;
  }

  /** Visits every present edge in ascending edge id. */
  public void forEachEdge(EdgeVisitor visitor) {
    for (int k = 0; k < offsetCount; k++) {
      forEachEdge(k, visitor);
    }
  }

  /** Visits the present edges of offset {@code k} in ascending source voxel. */
  public void forEachEdge(int k, EdgeVisitor visitor) {
    forEachRow(k, (start, length, global, thin, decisions, mask) ->
        visitRow(k, start, length, global, thin, decisions, mask, null, null, false, visitor));
  }

  /**
   * Visits the present edges whose ends carry different labels ({@code labels} per voxel of the
   * box; label 0 is a label like any other here): the same edges and weights as
   * {@link #forEachEdge} with a {@code labels[s] != labels[t]} test in the visitor, but the
   * weight is computed only for the edges visited (the cheap pass over a segmentation's
   * boundaries, where most edges join voxels of one segment), and in another order: slice by
   * slice along the last axis, in each slice every offset in turn, its sources ascending. So a
   * visitor that sums edges per pair of labels in a hash table touches, for a while, only the
   * pairs of a few slices, which stay in the processor's cache; in edge-id order every offset
   * swept the whole table again.
   */
  public void forEachEdgeAcross(int[] labels, EdgeVisitor visitor) {
    requireLabels(labels.length);
    forEachRowBySlice((k, start, length, global, thin, decisions, mask) ->
        visitRow(k, start, length, global, thin, decisions, mask, labels, null, false,
            visitor));
  }

  /**
   * As {@link #forEachEdgeAcross(int[], EdgeVisitor)}, passing each edge's affinity (in [0, 1];
   * {@code value / 255} when quantized) where the weight would be: for visitors that apply the
   * {@link #rule()} themselves, once per run of edges rather than per edge.
   */
  public void forEachAffinityAcross(int[] labels, EdgeVisitor visitor) {
    requireLabels(labels.length);
    forEachRowBySlice((k, start, length, global, thin, decisions, mask) ->
        visitRow(k, start, length, global, thin, decisions, mask, labels, null, true, visitor));
  }

  /**
   * Visits the present edges with an end where {@code marked} is not 0 (one flag per voxel of
   * the box), in the order of {@link #forEachEdgeAcross(int[], EdgeVisitor)}; the weight is
   * computed only for the edges visited.
   */
  public void forEachEdgeTouching(byte[] marked, EdgeVisitor visitor) {
    visitTouching(marked, false, visitor);
  }

  /**
   * As {@link #forEachEdgeTouching(byte[], EdgeVisitor)}, passing each edge's affinity where the
   * weight would be (see {@link #forEachAffinityAcross(int[], EdgeVisitor)}).
   */
  public void forEachAffinityTouching(byte[] marked, EdgeVisitor visitor) {
    visitTouching(marked, true, visitor);
  }

  private void visitTouching(byte[] marked, boolean affinities, EdgeVisitor visitor) {
    requireLabels(marked.length);
    int[] touching = new int[block.shape(0)];
    forEachRowBySlice((k, start, length, global, thin, decisions, mask) ->
        visitRowTouching(k, start, length, global, thin, decisions, mask, marked, touching,
            affinities, visitor));
  }

  /** The rule that makes this graph's weights. */
  public WeightRule rule() {
    return rule;
  }

  /** As {@link #forEachEdgeAcross(int[], EdgeVisitor)} for 64-bit labels. */
  public void forEachEdgeAcross(long[] labels, EdgeVisitor visitor) {
    requireLabels(labels.length);
    forEachRowBySlice((k, start, length, global, thin, decisions, mask) ->
        visitRow(k, start, length, global, thin, decisions, mask, null, labels, false,
            visitor));
  }

  /** As {@link #forEachAffinityAcross(int[], EdgeVisitor)} for 64-bit labels. */
  public void forEachAffinityAcross(long[] labels, EdgeVisitor visitor) {
    requireLabels(labels.length);
    forEachRowBySlice((k, start, length, global, thin, decisions, mask) ->
        visitRow(k, start, length, global, thin, decisions, mask, null, labels, true, visitor));
  }

  /** A row of offset {@code k}; see {@link RowVisitor}. */
  private interface OffsetRowVisitor {
    void row(int k, int start, int length, long[] global, boolean thin,
        Subsampling.RowDecisions decisions, byte[] mask);
  }

  /**
   * Every offset's rows, slice by slice along the last axis (a one-dimensional box is one
   * slice), each slice's offsets in turn.
   */
  private void forEachRowBySlice(OffsetRowVisitor visitor) {
    int last = block.dimension() - 1;
    int slices = last == 0 ? 1 : block.shape(last);
    Subsampling.RowDecisions[] decisionsOf = new Subsampling.RowDecisions[offsetCount];
    for (int k = 0; k < offsetCount; k++) {
      decisionsOf[k] = rowDecisions(k);
    }
    for (int slice = 0; slice < slices; slice++) {
      for (int k = 0; k < offsetCount; k++) {
        int kk = k;
        forEachRow(k, last == 0 ? -1 : slice, decisionsOf[k],
            (start, length, global, thin, decisions, mask) ->
                visitor.row(kk, start, length, global, thin, decisions, mask));
      }
    }
  }

  private void requireLabels(int length) {
    if (length != nodeCount) {
      throw new GraphInputException(org.sunder.blockwise.ErrorKind.INVALID_INPUT,
          "labels: " + length + " values but the block has " + nodeCount + " voxels");
    }
  }

  /**
   * Marks every present edge slot: {@code present[voxel + k * nodeCount()]} becomes 1 where the
   * edge is present, 0 elsewhere. The loop over slots has no call per edge, so bulk consumers
   * stay fast whatever other visitors the JVM has seen.
   */
  public byte[] presentSlots() {
    byte[] present = new byte[edgeSlotCount()];
    for (int k = 0; k < offsetCount; k++) {
      int base = k * nodeCount;
      int dk = delta[k];
      int kk = k;
      forEachRow(k, (start, length, global, thin, decisions, mask) -> {
        long x0 = global[0];
        for (int i = 0; i < length; i++) {
          int source = start + i;
          if (kept(source, source + dk, kk, global, x0, i, thin, decisions, mask)) {
            present[base + source] = 1;
          }
        }
        global[0] = x0;
      });
    }
    return present;
  }

  /** Receives one row of sources along axis 0 whose targets stay in the box. */
  private interface RowVisitor {
    /**
     * {@code global}: global coordinates of the row's first source (may be changed at [0] if
     * restored); {@code thin}: long-range subsampling applies; {@code decisions}: its hash
     * decisions along every row of the offset, or null (see {@link Subsampling#rowDecisions});
     * {@code mask}: null or the mask.
     */
    void row(int start, int length, long[] global, boolean thin,
        Subsampling.RowDecisions decisions, byte[] mask);
  }

  private void forEachRow(int k, RowVisitor visitor) {
    forEachRow(k, -1, rowDecisions(k), visitor);
  }

  /**
   * The hash decisions of offset {@code k}'s long-range subsampling, shared by all its rows
   * (every row starts at the same first coordinate), or null without subsampling or rows.
   */
  private Subsampling.RowDecisions rowDecisions(int k) {
    if (!longRange[k] || subsampling.keepsAll()) {
      return null;
    }
    int o = block.offsets().component(k, 0);
    int lo = Math.max(0, -o);
    int hi = Math.min(block.shape(0), block.shape(0) - o);
    return lo < hi ? subsampling.rowDecisions(k, block.globalMin(0) + lo, hi - lo) : null;
  }

  /**
   * The rows of offset {@code k} whose sources lie in {@code slice} along the last axis, or
   * every row when {@code slice < 0}; {@code decisions} from {@link #rowDecisions}.
   */
  private void forEachRow(int k, int slice, Subsampling.RowDecisions decisions,
      RowVisitor visitor) {
    int n = block.dimension();
    int[] lo = new int[n];
    int[] hi = new int[n];
    for (int d = 0; d < n; d++) {
      int o = block.offsets().component(k, d);
      lo[d] = Math.max(0, -o);
      hi[d] = Math.min(block.shape(d), block.shape(d) - o);
      if (slice >= 0 && d == n - 1) {
        lo[d] = Math.max(lo[d], slice);
        hi[d] = Math.min(hi[d], slice + 1);
      }
      if (lo[d] >= hi[d]) {
        return;
      }
    }
    int[] row = lo.clone();
    long[] global = new long[n];
    boolean thin = longRange[k] && !subsampling.keepsAll();
    byte[] mask = block.maskOrNull();
    while (true) {
      int start = 0;
      int step = 1;
      for (int d = 0; d < n; d++) {
        start += row[d] * step;
        step *= block.shape(d);
        global[d] = block.globalMin(d) + row[d];
      }
      visitor.row(start, hi[0] - lo[0], global, thin, decisions, mask);
      int d = 1;
      while (d < n && ++row[d] >= hi[d]) {
        row[d] = lo[d];
        d++;
      }
      if (d >= n) {
        return;
      }
    }
  }

  /**
   * One row of edges; with {@code intLabels} or {@code longLabels}, only edges across labels;
   * {@code affinities}: pass the affinity instead of the weight.
   */
  private void visitRow(int k, int start, int length, long[] global, boolean thin,
      Subsampling.RowDecisions decisions, byte[] mask, int[] intLabels, long[] longLabels,
      boolean affinities, EdgeVisitor visitor) {
    int dk = delta[k];
    int base = k * nodeCount;
    long x0 = global[0];
    byte[] bytes = block.byteValuesOrNull();
    float[] floats = block.floatValuesOrNull();
    float p = parameters[k];
    for (int i = 0; i < length; i++) {
      int source = start + i;
      int target = source + dk;
      if (intLabels != null ? intLabels[source] == intLabels[target]
          : longLabels != null && longLabels[source] == longLabels[target]) {
        continue;
      }
      if (!kept(source, target, k, global, x0, i, thin, decisions, mask)) {
        continue;
      }
      visitor.visit(source, target, k,
          slotValue(bytes, floats, base + source, k, p, affinities));
    }
    global[0] = x0;
  }

  /**
   * One row of edges with a marked end. Apart from {@link #visitRow} on purpose: the JIT
   * inlines a visitor at a call site that has seen one or two kinds, and the label passes'
   * visitors run far more often than this one.
   */
  private void visitRowTouching(int k, int start, int length, long[] global, boolean thin,
      Subsampling.RowDecisions decisions, byte[] mask, byte[] marked, int[] touching,
      boolean affinities, EdgeVisitor visitor) {
    int dk = delta[k];
    int base = k * nodeCount;
    long x0 = global[0];
    byte[] bytes = block.byteValuesOrNull();
    float[] floats = block.floatValuesOrNull();
    float p = parameters[k];
    // the row's slots with a marked end, listed without a branch per slot: where a quarter of
    // the slots have one, a branch on each is mispredicted too often
    int count = 0;
    for (int i = 0; i < length; i++) {
      int either = marked[start + i] | marked[start + i + dk];
      touching[count] = i;
      count += (either | -either) >>> 31;
    }
    for (int j = 0; j < count; j++) {
      int i = touching[j];
      int source = start + i;
      int target = source + dk;
      if (!kept(source, target, k, global, x0, i, thin, decisions, mask)) {
        continue;
      }
      visitor.visit(source, target, k,
          slotValue(bytes, floats, base + source, k, p, affinities));
    }
    global[0] = x0;
  }

  /**
   * The affinity of edge slot {@code slot} of offset {@code k} (in [0, 1]; {@code value / 255}
   * when quantized), or its weight ({@code p}: the offset's channel parameter).
   */
  private float slotValue(byte[] bytes, float[] floats, int slot, int k, float p,
      boolean affinities) {
    if (affinities) {
      return bytes != null ? (bytes[slot] & 0xff) / 255f : floats[slot];
    }
    return bytes != null ? byteWeights[(k << 8) + (bytes[slot] & 0xff)]
        : rule.weight(floats[slot], p);
  }

  /**
   * Mask and subsampling test of the {@code i}-th edge of a row starting at global {@code x0},
   * whose ends lie in the box; may set {@code global[0]}.
   */
  private boolean kept(int source, int target, int k, long[] global, long x0, int i,
      boolean thin, Subsampling.RowDecisions decisions, byte[] mask) {
    if (mask != null && (mask[source] == 0 || mask[target] == 0)) {
      return false;
    }
    if (!thin) {
      return true;
    }
    if (decisions != null) {
      return decisions.keeps(i, global);
    }
    global[0] = x0 + i;
    return subsampling.keepsLongRange(global, k);
  }

  /** Counts present edges; one pass over all slots. */
  public long presentEdgeCount() {
    long[] count = new long[1];
    forEachEdge((s, t, k, w) -> count[0]++);
    return count[0];
  }

  /** A sparse copy holding every present edge (edge order = ascending edge id). Allocates. */
  public SignedGraph toSignedGraph() {
    int m = Math.toIntExact(presentEdgeCount());
    int[] u = new int[m];
    int[] v = new int[m];
    double[] w = new double[m];
    int[] next = new int[1];
    forEachEdge((s, t, k, weight) -> {
      int e = next[0]++;
      u[e] = s;
      v[e] = t;
      w[e] = weight;
    });
    return SignedGraph.of(nodeCount, u, v, w);
  }

  private float[] byteWeightTable() {
    float[] table = new float[offsetCount * 256];
    for (int k = 0; k < offsetCount; k++) {
      for (int b = 0; b < 256; b++) {
        table[k * 256 + b] = rule.weight(b / 255f, parameters[k]);
      }
    }
    return table;
  }
}
