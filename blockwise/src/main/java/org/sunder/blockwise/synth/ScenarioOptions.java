package org.sunder.blockwise.synth;

import java.util.Arrays;
import java.util.Objects;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.store.DataType;

/**
 * How {@link SyntheticScenario} writes a scenario.
 *
 * @param group the container group the two datasets go in ({@code ""}: the root)
 * @param offsets the affinity offsets (memory order)
 * @param degradation what to spoil the exact affinities with
 * @param affinityType {@link DataType#FLOAT32} or {@link DataType#UINT8} ({@code a = v / 255})
 * @param chunkShape spatial chunk shape, memory order; affinity chunks hold all channels
 */
public record ScenarioOptions(String group, Offsets offsets, Degradation degradation,
    DataType affinityType, int[] chunkShape) {

  /** Root group, {@link SyntheticScenario#defaultOffsets()}, no degradation, float32, 32x32x16. */
  public static ScenarioOptions defaults() {
    return new ScenarioOptions("", SyntheticScenario.defaultOffsets(), Degradation.none(),
        DataType.FLOAT32, new int[] {32, 32, 16});
  }

  public ScenarioOptions {
    Objects.requireNonNull(group, "group");
    Objects.requireNonNull(offsets, "offsets");
    Objects.requireNonNull(degradation, "degradation");
    Objects.requireNonNull(affinityType, "affinityType");
    chunkShape = Objects.requireNonNull(chunkShape, "chunkShape").clone();
    offsets.requireDimension(3, "offsets");
    if (affinityType != DataType.FLOAT32 && affinityType != DataType.UINT8) {
      throw new SunderException(ErrorKind.INVALID_CONFIG, "affinity type " + affinityType
          + ": expected FLOAT32 or UINT8");
    }
    if (chunkShape.length != 3 || Arrays.stream(chunkShape).anyMatch(c -> c < 1)) {
      throw new SunderException(ErrorKind.INVALID_CONFIG, "chunk shape "
          + Arrays.toString(chunkShape) + ": expected 3 sizes >= 1 (memory order x, y, z)");
    }
  }

  @Override
  public int[] chunkShape() {
    return chunkShape.clone();
  }

  public ScenarioOptions withGroup(String newGroup) {
    return new ScenarioOptions(newGroup, offsets, degradation, affinityType, chunkShape);
  }

  public ScenarioOptions withOffsets(Offsets newOffsets) {
    return new ScenarioOptions(group, newOffsets, degradation, affinityType, chunkShape);
  }

  public ScenarioOptions withDegradation(Degradation newDegradation) {
    return new ScenarioOptions(group, offsets, newDegradation, affinityType, chunkShape);
  }

  public ScenarioOptions withAffinityType(DataType newType) {
    return new ScenarioOptions(group, offsets, degradation, newType, chunkShape);
  }

  public ScenarioOptions withChunkShape(int... newChunkShape) {
    return new ScenarioOptions(group, offsets, degradation, affinityType, newChunkShape);
  }

  @Override
  public boolean equals(Object o) {
    return o instanceof ScenarioOptions s && s.group.equals(group) && s.offsets.equals(offsets)
        && s.degradation.equals(degradation) && s.affinityType == affinityType
        && Arrays.equals(s.chunkShape, chunkShape);
  }

  @Override
  public int hashCode() {
    return Objects.hash(group, offsets, degradation, affinityType, Arrays.hashCode(chunkShape));
  }
}
