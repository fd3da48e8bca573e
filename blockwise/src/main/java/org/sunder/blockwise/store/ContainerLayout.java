package org.sunder.blockwise.store;

import java.nio.file.Path;
import java.util.Map;
import org.sunder.blockwise.StoreException;
import org.sunder.blockwise.store.codec.Codec;

/**
 * Where one format keeps its metadata and how it reads and writes it: groups, dataset metadata
 * and user attributes. Implementations are stateless.
 */
interface ContainerLayout {

  StorageFormat format();

  /** Whether {@code root} holds this format's root metadata. */
  boolean isRoot(Path root);

  /** Checks the root metadata's format version; throws {@link StoreException} if unsupported. */
  void checkRoot(Path root);

  /** Writes the root group metadata if it is absent. */
  void createRoot(Path root);

  boolean isDataset(Path dir);

  boolean isGroup(Path dir);

  /** Makes {@code dir} a group (metadata written if absent). */
  void createGroup(Path dir);

  /** {@code spec} with the fields this format cannot choose set to what it stores. */
  DatasetSpec normalize(DatasetSpec spec);

  void writeDatasetMetadata(Path dir, DatasetSpec spec);

  /** Reads and validates the dataset metadata in {@code dir}. */
  DatasetSpec readDatasetMetadata(Path dir);

  /** User attributes of a group or dataset (format keys left out). */
  Map<String, Object> readAttributes(Path dir, boolean isRoot);

  /** Merges {@code attributes} into those of {@code dir}; rejects format keys. */
  void mergeAttributes(Path dir, Map<String, ?> attributes, boolean isRoot);

  ChunkFormat chunkFormat(DatasetSpec spec, Codec codec);
}
