package org.sunder.stitching.solve;

import java.nio.file.Path;

/**
 * Where the tasks of a hierarchical solve ({@link LevelTasks}) leave their files, under one
 * folder of the work dir:
 * <pre>
 *   up-&lt;l&gt;/&lt;p&gt;.edges     what part p of level l hands up ({@link EdgeFile})
 *   up-&lt;l&gt;/&lt;p&gt;.merges    its merges ({@link MergeMapFile})
 *   final-&lt;l&gt;/&lt;p&gt;.reps    the final representatives of part p's nodes that have another one
 *                        (level 0: per block)
 *   size-filter/         the same for the size filter after the solve
 * </pre>
 * A plain value; the files are written by tasks, atomically.
 *
 * @param root the folder
 */
public record LevelFiles(Path root) {

  /** The folder of the size filter after the solve, which has the same steps and files. */
  public LevelFiles sizeFilter() {
    return new LevelFiles(root.resolve("size-filter"));
  }

  /** What part {@code part} of {@code level} hands up. */
  public Path edges(int level, int part) {
    return root.resolve("up-" + level).resolve(part + ".edges");
  }

  /** Part {@code part}'s merges at {@code level}. */
  public Path merges(int level, int part) {
    return root.resolve("up-" + level).resolve(part + ".merges");
  }

  /**
   * The final representatives of the nodes of part {@code part} of {@code level} (level 0:
   * block {@code part}) that changed after that level: written by the level above (or the
   * driver), read by the part itself on the way down.
   */
  public Path finals(int level, int part) {
    return root.resolve("final-" + level).resolve(part + ".reps");
  }
}
