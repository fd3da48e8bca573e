package org.sunder.stitching.task;

/** Shape and origin of a sub-box given by global corners (memory order). */
public final class BoxIndex {
  private BoxIndex() {}

  public static int[] shape(long[] min, long[] max) {
    int[] shape = new int[min.length];
    for (int d = 0; d < min.length; d++) {
      shape[d] = Math.toIntExact(max[d] - min[d] + 1);
    }
    return shape;
  }

  public static int[] origin(long[] outerMin, long[] innerMin) {
    int[] origin = new int[outerMin.length];
    for (int d = 0; d < outerMin.length; d++) {
      origin[d] = Math.toIntExact(innerMin[d] - outerMin[d]);
    }
    return origin;
  }
}
