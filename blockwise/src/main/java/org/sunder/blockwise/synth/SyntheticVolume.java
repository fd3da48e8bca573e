package org.sunder.blockwise.synth;

import java.util.Objects;

/**
 * A synthetic ground-truth label volume of our own design, deterministic from its
 * {@link SynthSpec}: densely packed, touching, tortuous branching fibres of varying radius,
 * compact cells, large bodies the fibres wrap around, and optionally background (label 0)
 * between them.
 *
 * <p>Construction: objects are placed in physical space ({@code TissueLayout}); each voxel
 * takes the object whose surface it is deepest inside or, outside all, nearest to (within the
 * fill distance); with no background the remaining voxels are grown into from their nearest
 * labelled voxel; finally every label is made one 6-connected object, pieces below
 * {@link SynthSpec#minObjectVoxels()} join their most-touching neighbour, and objects are
 * numbered 1.. in order of first voxel (memory order). Hence: every object is 6-connected,
 * every label in {@code 1..objectCount()} occurs.
 *
 * <p>The whole volume is built in memory: about 13 bytes per voxel while generating.
 * Immutable once built; {@link #labels()} hands out the array itself, not a copy.
 */
public final class SyntheticVolume {
  private final SynthSpec spec;
  private final long[] labels;
  private final ObjectKind[] kindOfLabel;

  private SyntheticVolume(SynthSpec spec, long[] labels, ObjectKind[] kindOfLabel) {
    this.spec = spec;
    this.labels = labels;
    this.kindOfLabel = kindOfLabel;
  }

  /** Builds the volume a spec describes; the same spec gives the same labels. */
  public static SyntheticVolume generate(SynthSpec spec) {
    Objects.requireNonNull(spec, "spec");
    long[] shape = spec.shape();
    int nx = (int) shape[0];
    int ny = (int) shape[1];
    int nz = (int) shape[2];
    TissueLayout layout = new TissueLayout(spec);
    Rasterizer raster = new Rasterizer(shape, spec.voxelSize(), spec.fillDistance());
    for (Ellipsoid e : layout.ellipsoids) {
      raster.draw(e);
    }
    for (Capsule c : layout.capsules) {
      raster.draw(c);
    }
    int[] objects = raster.label;
    if (!spec.background()) {
      GrowthFill.fill(objects, nx, ny, nz, spec.voxelSize());
    }
    ConnectedPieces.Result pieces = ConnectedPieces.of(objects, nx, ny, nz,
        spec.minObjectVoxels(), spec.background());
    int[] objectOf = pieces.objectOfLabel();
    ObjectKind[] kinds = new ObjectKind[objectOf.length];
    for (int label = 1; label < objectOf.length; label++) {
      kinds[label] = layout.kinds.get(objectOf[label] - 1);
    }
    return new SyntheticVolume(spec, pieces.labels(), kinds);
  }

  /**
   * This volume with an empty region: every voxel whose centre lies within {@code radius} (nm)
   * of the z-parallel line through ({@code centreX}, {@code centreY}) (nm) becomes background,
   * like the lumen of a vessel crossing the tissue. Objects are then made connected and
   * renumbered as {@link #generate} does (a piece the cut leaves below
   * {@link SynthSpec#minObjectVoxels()} joins its most-touching neighbour or becomes
   * background), so every object stays one 6-connected piece. {@code O(n)}.
   */
  public SyntheticVolume withEmptyCylinder(double centreX, double centreY, double radius) {
    long[] shape = spec.shape();
    int nx = (int) shape[0];
    int ny = (int) shape[1];
    int nz = (int) shape[2];
    double[] size = spec.voxelSize();
    int[] objects = new int[labels.length];
    for (int i = 0; i < labels.length; i++) {
      double dx = (i % nx + 0.5) * size[0] - centreX;
      double dy = ((i / nx) % ny + 0.5) * size[1] - centreY;
      objects[i] = dx * dx + dy * dy <= radius * radius ? 0 : (int) labels[i];
    }
    ConnectedPieces.Result pieces = ConnectedPieces.of(objects, nx, ny, nz,
        spec.minObjectVoxels(), true);
    int[] objectOf = pieces.objectOfLabel();
    ObjectKind[] kinds = new ObjectKind[objectOf.length];
    for (int label = 1; label < objectOf.length; label++) {
      kinds[label] = kindOfLabel[objectOf[label]];
    }
    return new SyntheticVolume(spec, pieces.labels(), kinds);
  }

  public SynthSpec spec() {
    return spec;
  }

  /** Voxels along x, y, z (memory order). */
  public long[] shape() {
    return spec.shape();
  }

  /** The labels in memory order (x fastest); the array itself, not a copy: do not modify. */
  public long[] labels() {
    return labels;
  }

  /** Objects are labelled {@code 1..objectCount()}; 0 is background. */
  public int objectCount() {
    return kindOfLabel.length - 1;
  }

  /** What an object was drawn as. */
  public ObjectKind kindOf(long label) {
    if (label < 1 || label > objectCount()) {
      throw new IllegalArgumentException("no object " + label + "; labels are 1.."
          + objectCount());
    }
    return kindOfLabel[(int) label];
  }
}
