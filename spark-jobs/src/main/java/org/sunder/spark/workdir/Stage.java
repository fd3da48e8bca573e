package org.sunder.spark.workdir;

import java.util.Arrays;
import java.util.Locale;
import java.util.stream.Collectors;
import org.sunder.spark.config.ConfigException;

/** The stages of a run after planning, in the order they run. */
public enum Stage {
  /** Per block: partition the extended box, write provisional ids, return a block summary. */
  PARTITION,
  /** Per face: aggregate the edges that cross it into seam edges. */
  SEAMS,
  /** On the driver: solve the reduced graph, map provisional ids to final ids. */
  SOLVE,
  /** Per chunk range: rewrite provisional ids as final ids in place. */
  RELABEL,
  /** Optional: score the segmentation against the ground truth. */
  EVALUATE,
  /** Per chunk of each coarser level: the label pyramid for viewers, and its metadata. */
  PYRAMID;

  /** The name used on the command line and in the work dir. */
  public String cliName() {
    return name().toLowerCase(Locale.ROOT);
  }

  /** The stage with that command-line name. */
  public static Stage parse(String name) {
    for (Stage stage : values()) {
      if (stage.cliName().equalsIgnoreCase(name)) {
        return stage;
      }
    }
    throw new ConfigException("unknown stage '" + name + "'; expected one of "
        + Arrays.stream(values()).map(Stage::cliName).collect(Collectors.joining(", ")));
  }
}
