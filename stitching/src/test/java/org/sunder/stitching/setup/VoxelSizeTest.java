package org.sunder.stitching.setup;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertNull;

import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;

class VoxelSizeTest {
  @Test
  void ownAttributeFollowsTheDatasetsAxesElseTheConfigurations() {
    assertArrayEquals(new double[] {8, 8, 32}, VoxelSize.fromAttributes(
        Map.of("voxelSize", List.of(32, 8, 8), "axes", "zyx"), 3, "xyz"));
    assertArrayEquals(new double[] {4, 5, 40}, VoxelSize.fromAttributes(
        Map.of("voxelSize", List.of(4, 5, 40), "axes", "xyz"), 3, "zyx"));
    assertArrayEquals(new double[] {4, 5, 40}, VoxelSize.fromAttributes(
        Map.of("voxelSize", List.of(4, 5, 40)), 3, "xyz"));
    assertArrayEquals(new double[] {4, 5, 40}, VoxelSize.fromAttributes(
        Map.of("voxelSize", List.of(40, 4, 5)), 3, "zxy"));
  }

  @Test
  void n5ConventionsAreMemoryOrder() {
    assertArrayEquals(new double[] {4, 4, 40}, VoxelSize.fromAttributes(
        Map.of("resolution", List.of(4, 4, 40)), 3, "zyx"));
    assertArrayEquals(new double[] {4, 4, 40}, VoxelSize.fromAttributes(
        Map.of("pixelResolution", Map.of("dimensions", List.of(4.0, 4.0, 40.0), "unit", "nm")),
        3, "zyx"));
    assertArrayEquals(new double[] {8, 8, 32}, VoxelSize.fromAttributes(Map.of(
        "voxelSize", List.of(32, 8, 8), "resolution", List.of(1, 1, 1)), 3, "zyx"),
        "the tool's own attribute first");
  }

  @Test
  void malformedOrMissingGivesNull() {
    assertNull(VoxelSize.fromAttributes(Map.of(), 3, "zyx"));
    assertNull(VoxelSize.fromAttributes(Map.of("voxelSize", List.of(1, 2)), 3, "zyx"));
    assertNull(VoxelSize.fromAttributes(Map.of("voxelSize", List.of(1, 0, 2)), 3, "zyx"));
    assertNull(VoxelSize.fromAttributes(Map.of("voxelSize", List.of(1, "a", 2)), 3, "zyx"));
    assertNull(VoxelSize.fromAttributes(Map.of("resolution", List.of(1, 2, 3, 1)), 3, "zyx"));
    assertNull(VoxelSize.fromAttributes(Map.of("voxelSize", List.of(1, 2, 3), "axes", "zyq"),
        3, "zyx"));
    assertNull(VoxelSize.fromAttributes(Map.of("pixelResolution", "4,4,40"), 3, "zyx"));
  }
}
