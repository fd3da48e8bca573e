package org.sunder.blockwise.store;

/**
 * The element order inside a stored Zarr chunk. {@code C}: Zarr's last axis (memory dimension 0)
 * varies fastest, the same as in memory. {@code F}: Zarr's first axis (the last memory dimension)
 * varies fastest, so chunks are transposed at the store boundary. N5 is always {@code C} in this
 * sense (its first dimension varies fastest and is memory dimension 0).
 */
public enum ChunkOrder {
  C,
  F
}
