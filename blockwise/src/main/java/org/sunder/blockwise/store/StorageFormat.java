package org.sunder.blockwise.store;

/** The on-disk container formats Sunder reads and writes, both on the local file system. */
public enum StorageFormat {
  /** N5: big-endian blocks with a header, metadata in {@code attributes.json}. */
  N5,
  /** Zarr version 2: metadata in {@code .zarray}/{@code .zgroup}/{@code .zattrs}. */
  ZARR
}
