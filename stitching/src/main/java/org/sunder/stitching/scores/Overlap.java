package org.sunder.stitching.scores;

/**
 * One row of the worst splits or merges: a ground-truth object spread over several segments
 * (split) or a segment covering several objects (merge).
 *
 * @param label the object's or segment's label (unsigned)
 * @param voxels its voxels that were evaluated
 * @param overlapCount how many labels of the other side it overlaps
 * @param misassignedVoxels its voxels outside its largest overlap
 */
public record Overlap(long label, long voxels, int overlapCount, long misassignedVoxels) {}
