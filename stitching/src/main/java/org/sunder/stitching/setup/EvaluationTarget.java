package org.sunder.stitching.setup;

/**
 * Which two label datasets to compare (and where), as absolute container paths.
 *
 * @param segmentationContainer container of the segmentation
 * @param segmentation segmentation dataset
 * @param truthContainer container of the ground truth
 * @param truth ground-truth dataset ({@code null} only for a seam audit without ground truth)
 * @param maskContainer container of the mask, or {@code null}
 * @param mask uint8 mask dataset (1 = evaluate), or {@code null}
 * @param ignoreBackground ignore ground-truth label 0
 */
public record EvaluationTarget(String segmentationContainer, String segmentation,
    String truthContainer, String truth, String maskContainer, String mask,
    boolean ignoreBackground) implements java.io.Serializable {}
