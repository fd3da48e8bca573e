package org.sunder.spark.it;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.stream.Stream;
import net.imglib2.img.array.ArrayImg;
import net.imglib2.img.basictypeaccess.array.LongArray;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.Dataset;
import org.sunder.blockwise.store.StorageFormat;
import org.sunder.blockwise.synth.Degradation;
import org.sunder.blockwise.synth.ScenarioOptions;
import org.sunder.blockwise.synth.SynthSpec;
import org.sunder.blockwise.synth.SyntheticScenario;

/** Synthetic scenes and run configurations for the integration tests (seeded, non-cubic). */
public final class Scenes {
  private static final ObjectMapper JSON = new ObjectMapper();

  private Scenes() {}

  /** A scene: container with {@code affinities} and {@code ground-truth}, and a configuration. */
  public record Scene(Path container, Path config) {}

  /**
   * Writes {@link SynthSpec#small} (64 x 56 x 20 voxels, x y z) with seed 13, chunks
   * {@code chunkXyz}, and a configuration with blocks of one chunk, evaluating against the ground
   * truth.
   */
  public static Scene write(Path dir, StorageFormat format, Degradation degradation,
      int[] chunkXyz, String partitionJson) {
    Path root = dir.resolve(format == StorageFormat.N5 ? "scene.n5" : "scene.zarr");
    SyntheticScenario.write(Container.create(root, format), SynthSpec.small(13),
        ScenarioOptions.defaults().withDegradation(degradation).withChunkShape(chunkXyz));
    Path config = dir.resolve("run.json");
    writeConfig(config, root, chunkXyz, partitionJson, null);
    return new Scene(root, config);
  }

  /** Writes a configuration for {@code root}; {@code workDir} may be null (default). */
  public static void writeConfig(Path config, Path root, int[] chunkXyz, String partitionJson,
      Path workDir) {
    try {
      ObjectNode node = JSON.createObjectNode();
      node.putObject("input").put("container", root.toString());
      node.putObject("blocks").set("shape",
          JSON.valueToTree(new int[] {chunkXyz[2], chunkXyz[1], chunkXyz[0]}));
      node.set("partition", JSON.readTree(partitionJson));
      node.putObject("evaluate").put("groundTruth", SyntheticScenario.GROUND_TRUTH);
      if (workDir != null) {
        node.put("workDir", workDir.toString());
      }
      Files.writeString(config, JSON.writeValueAsString(node));
    } catch (IOException e) {
      throw new UncheckedIOException(e);
    }
  }

  /** Every voxel of a uint64 dataset, memory order. */
  public static long[] labels(Path root, String dataset) {
    Dataset d = Container.open(root).openDataset(dataset);
    long[] max = d.shape();
    long[] min = new long[max.length];
    for (int i = 0; i < max.length; i++) {
      max[i] -= 1;
    }
    ArrayImg<?, ?> img = d.read(new net.imglib2.FinalInterval(min, max));
    return ((LongArray) img.update(null)).getCurrentStorageArray();
  }

  /** Relative path and bytes of every chunk file of a dataset (metadata files left out). */
  public static List<String> chunkFiles(Path datasetDir) {
    List<String> out = new ArrayList<>();
    try (Stream<Path> walk = Files.walk(datasetDir)) {
      for (Path p : walk.filter(Files::isRegularFile).sorted().toList()) {
        String name = p.getFileName().toString();
        if (name.startsWith(".") || name.equals("attributes.json")) {
          continue;
        }
        out.add(datasetDir.relativize(p) + " " + java.util.HexFormat.of()
            .formatHex(java.security.MessageDigest.getInstance("SHA-256")
                .digest(Files.readAllBytes(p))));
      }
    } catch (IOException e) {
      throw new UncheckedIOException(e);
    } catch (java.security.NoSuchAlgorithmException e) {
      throw new IllegalStateException(e);
    }
    return out;
  }

  /** Whether two label arrays are equal up to a one-to-one renaming of labels. */
  public static boolean equalUpToRenaming(long[] a, long[] b) {
    java.util.HashMap<Long, Long> forward = new java.util.HashMap<>();
    java.util.HashMap<Long, Long> backward = new java.util.HashMap<>();
    for (int i = 0; i < a.length; i++) {
      Long f = forward.putIfAbsent(a[i], b[i]);
      Long g = backward.putIfAbsent(b[i], a[i]);
      if ((f != null && f != b[i]) || (g != null && g != a[i])) {
        return false;
      }
    }
    return true;
  }
}
