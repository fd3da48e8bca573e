package org.sunder.blockwise.metrics;

import java.io.Serializable;
import java.util.Arrays;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.grid.Shapes;

/**
 * The counts behind a {@link SeamAudit}, accumulated box by box and mergeable, so that a huge
 * volume can be audited from the two voxel layers around each plane ({@link SeamPlanes#slabsOf})
 * read in separate tasks.
 *
 * <p>Counted pairs. A pair is two face-adjacent voxels {@code p} (lower layer) and {@code q}
 * (upper layer) straddling an audited plane, both inside a box given to {@link #add}, with
 * non-zero segmentation labels (segmentation 0, masked or background, is ignored). Per plane
 * the tally keeps the pairs and the boundary pairs ({@code seg(p) != seg(q)}); with ground
 * truth, per (plane, object {@code O != 0}) the pairs with {@code gt(p) = gt(q) = O} and how many
 * of those are cut ({@code seg(p) != seg(q)}). Counts are sums, so the tally of a volume is the
 * merge of the tallies of any boxes that together hold every counted pair exactly once (the
 * caller's contract: no two boxes given for one axis may both hold the two layers around the same
 * plane at the same lateral position; the slabs of {@link SeamPlanes#slabsOf} over all faces
 * of a grid satisfy it).
 *
 * <p>Storage: two {@code long}s per plane, an open-addressing table of about 40 bytes per
 * (plane, object) entry. {@link #add} costs O(pairs in the box), one table update per run of
 * equal objects along the fastest lateral axis. Not thread-safe: one tally per thread,
 * {@link #merge}d.
 */
public final class SeamTally implements Serializable {
  private static final long serialVersionUID = 1L;
  private static final int MIN_CAPACITY = 16;

  private final SeamPlanes planes;
  private final boolean withGroundTruth;
  private final long[] planePairs;
  private final long[] planeBoundaryPairs;
  private int[] entryPlane;
  private long[] entryObject;
  private long[] entryPairs;
  private long[] entryCutPairs;
  private int entries;

  /**
   * An empty tally.
   *
   * @param withGroundTruth whether ground-truth labels will be given to {@link #add}
   */
  public SeamTally(SeamPlanes planes, boolean withGroundTruth) {
    this.planes = planes;
    this.withGroundTruth = withGroundTruth;
    planePairs = new long[planes.planeCount()];
    planeBoundaryPairs = new long[planes.planeCount()];
    allocate(MIN_CAPACITY);
  }

  public SeamPlanes planes() {
    return planes;
  }

  public boolean withGroundTruth() {
    return withGroundTruth;
  }

  /**
   * Counts the pairs across every audited plane normal to {@code axis} whose two voxel layers lie
   * in the box {@code [min, max]} (global coordinates, memory order, inclusive). The arrays hold
   * the box's labels, dimension 0 fastest; they are read, not kept. O(pairs counted + box
   * extent along the axis).
   *
   * @param groundTruth ground-truth labels, or {@code null} exactly when the tally has none
   * @throws SunderException {@link ErrorKind#INVALID_INPUT} if the box leaves the volume or an
   *     array's length is not the box's voxel count
   */
  public void add(int axis, long[] min, long[] max, long[] groundTruth, long[] segmentation) {
    int[] dims = requireBox(min, max);
    if (axis < 0 || axis >= dims.length) {
      throw new SunderException(ErrorKind.INVALID_INPUT, "seam audit: axis " + axis
          + " outside 0.." + (dims.length - 1));
    }
    long voxels = Shapes.elementCount(dims);
    requireLength("segmentation", segmentation, voxels);
    if (withGroundTruth) {
      requireLength("ground truth", groundTruth, voxels);
    } else if (groundTruth != null) {
      throw new SunderException(ErrorKind.INVALID_INPUT, "seam audit: ground-truth labels given"
          + " to a tally made without ground truth");
    }
    for (long position = min[axis] + 1; position <= max[axis]; position++) {
      int plane = planes.planeIndex(axis, position);
      if (plane >= 0) {
        countPlane(plane, axis, (int) (position - 1 - min[axis]), dims, groundTruth,
            segmentation);
      }
    }
  }

  /** {@link #add} over the whole volume along every axis: arrays of {@code planes().volumeShape()}. */
  public void addVolume(long[] groundTruth, long[] segmentation) {
    long[] max = planes.volumeShape();
    for (int d = 0; d < max.length; d++) {
      max[d]--;
    }
    for (int axis = 0; axis < max.length; axis++) {
      add(axis, new long[max.length], max, groundTruth, segmentation);
    }
  }

  private void countPlane(int plane, int axis, int lower, int[] dims, long[] gt, long[] seg) {
    int n = dims.length;
    int[] stride = new int[n];
    stride[0] = 1;
    for (int d = 1; d < n; d++) {
      stride[d] = stride[d - 1] * dims[d - 1];
    }
    int up = stride[axis];
    int inner = n == 1 ? -1 : axis == 0 ? 1 : 0;
    int innerLength = inner < 0 ? 1 : dims[inner];
    int innerStride = inner < 0 ? 1 : stride[inner];
    int[] position = new int[n];
    long pairs = 0;
    long boundary = 0;
    long runObject = 0;
    long runPairs = 0;
    long runCut = 0;
    while (true) {
      int row = lower * stride[axis];
      for (int d = 0; d < n; d++) {
        row += position[d] * stride[d];
      }
      for (int t = 0; t < innerLength; t++) {
        int p = row + t * innerStride;
        int q = p + up;
        long sp = seg[p];
        long sq = seg[q];
        if (sp == 0 || sq == 0) {
          continue;
        }
        pairs++;
        boolean cut = sp != sq;
        if (cut) {
          boundary++;
        }
        if (gt != null) {
          long g = gt[p];
          if (g != 0 && g == gt[q]) {
            if (g != runObject) {
              addEntry(plane, runObject, runPairs, runCut);
              runObject = g;
              runPairs = 0;
              runCut = 0;
            }
            runPairs++;
            if (cut) {
              runCut++;
            }
          }
        }
      }
      int d = 0;
      while (d < n) {
        if (d != axis && d != inner) {
          if (++position[d] < dims[d]) {
            break;
          }
          position[d] = 0;
        }
        d++;
      }
      if (d == n) {
        break;
      }
    }
    addEntry(plane, runObject, runPairs, runCut);
    planePairs[plane] += pairs;
    planeBoundaryPairs[plane] += boundary;
  }

  /** Adds every count of {@code other}, a tally over the same planes; {@code other} is unchanged. */
  public void merge(SeamTally other) {
    if (!planes.equals(other.planes) || withGroundTruth != other.withGroundTruth) {
      throw new IllegalArgumentException("cannot merge a tally over " + other.planes
          + (other.withGroundTruth ? " with" : " without") + " ground truth into one over "
          + planes + (withGroundTruth ? " with" : " without") + " ground truth");
    }
    for (int i = 0; i < planePairs.length; i++) {
      planePairs[i] += other.planePairs[i];
      planeBoundaryPairs[i] += other.planeBoundaryPairs[i];
    }
    for (int i = 0; i < other.entryPairs.length; i++) {
      if (other.entryPairs[i] != 0) {
        addEntry(other.entryPlane[i], other.entryObject[i], other.entryPairs[i],
            other.entryCutPairs[i]);
      }
    }
  }

  /** The pairs counted across {@code plane}. */
  public long pairs(int plane) {
    return planePairs[plane];
  }

  /** The boundary pairs ({@code seg(p) != seg(q)}) counted across {@code plane}. */
  public long boundaryPairs(int plane) {
    return planeBoundaryPairs[plane];
  }

  /** The pairs inside object {@code object} across {@code plane}. */
  public long objectPairs(int plane, long object) {
    return entryPairs[find(plane, object)];
  }

  /** Of {@link #objectPairs}, those with different segment labels. */
  public long objectCutPairs(int plane, long object) {
    return entryCutPairs[find(plane, object)];
  }

  /**
   * Whether {@code object} is cut at {@code plane}: at least {@link SeamAudit#MIN_PAIRS} of its
   * pairs straddle the plane and at least half of them are cut.
   */
  public boolean isCut(int plane, long object) {
    int slot = find(plane, object);
    return isCut(entryPairs[slot], entryCutPairs[slot]);
  }

  private static boolean isCut(long pairs, long cut) {
    return pairs >= SeamAudit.MIN_PAIRS && 2 * cut >= pairs;
  }

  /**
   * The distinct ground-truth objects cut at some face ({@code control = false}) or at some
   * control plane, ascending as unsigned values. O(e log e) for e (plane, object) entries.
   */
  public long[] cutObjects(boolean control) {
    return objects(control, true);
  }

  /** The distinct objects with at least {@link SeamAudit#MIN_PAIRS} pairs across some plane. */
  public long[] crossingObjects(boolean control) {
    return objects(control, false);
  }

  private long[] objects(boolean control, boolean cutOnly) {
    long[] found = new long[entries];
    int count = 0;
    for (int i = 0; i < entryPairs.length; i++) {
      long pairs = entryPairs[i];
      if (pairs >= SeamAudit.MIN_PAIRS && planes.isControl(entryPlane[i]) == control
          && (!cutOnly || isCut(pairs, entryCutPairs[i]))) {
        found[count++] = entryObject[i] ^ Long.MIN_VALUE;
      }
    }
    Arrays.sort(found, 0, count);
    int distinct = 0;
    for (int i = 0; i < count; i++) {
      if (distinct == 0 || found[i] != found[distinct - 1]) {
        found[distinct++] = found[i];
      }
    }
    long[] out = Arrays.copyOf(found, distinct);
    for (int i = 0; i < distinct; i++) {
      out[i] ^= Long.MIN_VALUE;
    }
    return out;
  }

  /** The audit of everything counted so far. */
  public SeamAudit audit() {
    long facePairs = 0;
    long faceBoundary = 0;
    long controlPairs = 0;
    long controlBoundary = 0;
    for (int plane = 0; plane < planePairs.length; plane++) {
      if (planes.isControl(plane)) {
        controlPairs += planePairs[plane];
        controlBoundary += planeBoundaryPairs[plane];
      } else {
        facePairs += planePairs[plane];
        faceBoundary += planeBoundaryPairs[plane];
      }
    }
    return new SeamAudit(withGroundTruth, planes.facePlaneCount(),
        crossingObjects(false).length, cutObjects(false).length,
        crossingObjects(true).length, cutObjects(true).length,
        facePairs, faceBoundary, controlPairs, controlBoundary);
  }

  private void addEntry(int plane, long object, long pairs, long cut) {
    if (pairs == 0) {
      return;
    }
    int slot = find(plane, object);
    if (entryPairs[slot] == 0) {
      entryPlane[slot] = plane;
      entryObject[slot] = object;
      entries++;
    }
    entryPairs[slot] += pairs;
    entryCutPairs[slot] += cut;
    if (entries * 4L > entryPairs.length * 3L) {
      rehash(entryPairs.length * 2);
    }
  }

  private int find(int plane, long object) {
    int mask = entryPairs.length - 1;
    int slot = (int) mix(object * 0x9E3779B97F4A7C15L + plane) & mask;
    while (entryPairs[slot] != 0 && (entryPlane[slot] != plane || entryObject[slot] != object)) {
      slot = (slot + 1) & mask;
    }
    return slot;
  }

  private void rehash(int capacity) {
    int[] oldPlane = entryPlane;
    long[] oldObject = entryObject;
    long[] oldPairs = entryPairs;
    long[] oldCut = entryCutPairs;
    allocate(capacity);
    for (int i = 0; i < oldPairs.length; i++) {
      if (oldPairs[i] != 0) {
        int slot = find(oldPlane[i], oldObject[i]);
        entryPlane[slot] = oldPlane[i];
        entryObject[slot] = oldObject[i];
        entryPairs[slot] = oldPairs[i];
        entryCutPairs[slot] = oldCut[i];
      }
    }
  }

  private void allocate(int capacity) {
    entryPlane = new int[capacity];
    entryObject = new long[capacity];
    entryPairs = new long[capacity];
    entryCutPairs = new long[capacity];
  }

  private static long mix(long z) {
    z = (z ^ (z >>> 30)) * 0xBF58476D1CE4E5B9L;
    z = (z ^ (z >>> 27)) * 0x94D049BB133111EBL;
    return z ^ (z >>> 31);
  }

  private int[] requireBox(long[] min, long[] max) {
    long[] shape = planes.volumeShape();
    int n = shape.length;
    boolean inside = min.length == n && max.length == n;
    long voxels = 1;
    int[] dims = new int[n];
    for (int d = 0; inside && d < n; d++) {
      inside = min[d] >= 0 && max[d] >= min[d] && max[d] < shape[d];
      voxels *= max[d] - min[d] + 1;
      dims[d] = (int) Math.min(Integer.MAX_VALUE, max[d] - min[d] + 1);
    }
    if (!inside || voxels > Integer.MAX_VALUE) {
      throw new SunderException(ErrorKind.INVALID_INPUT, "seam audit: box "
          + Arrays.toString(min) + ".." + Arrays.toString(max) + " (memory order) is not a"
          + " non-empty box of at most " + Integer.MAX_VALUE + " voxels inside the volume "
          + Arrays.toString(shape));
    }
    return dims;
  }

  private static void requireLength(String what, long[] labels, long voxels) {
    if (labels == null || labels.length != voxels) {
      throw new SunderException(ErrorKind.INVALID_INPUT, "seam audit: " + what + " labels have "
          + (labels == null ? "no array" : labels.length + " values") + "; expected " + voxels
          + " (one per voxel of the box)");
    }
  }

  @Override
  public String toString() {
    return "SeamTally[" + planes + ", " + entries + " (plane, object) entries]";
  }
}
