package org.sunder.blockwise.partition.multicut;

/**
 * A partition of a graph's nodes and its multicut objective.
 *
 * @param labels cluster of each node, 0..clusterCount−1, numbered in order of first node
 * @param clusterCount number of clusters
 * @param objective sum of the weights of the edges whose ends lie in different clusters
 */
public record MulticutResult(int[] labels, int clusterCount, double objective) {}
