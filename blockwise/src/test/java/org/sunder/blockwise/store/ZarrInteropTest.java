package org.sunder.blockwise.store;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.io.InputStream;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;
import java.util.Random;
import net.imglib2.FinalInterval;
import net.imglib2.img.array.ArrayImg;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.blockwise.StoreException;
import org.sunder.testing.PythonReference;

/**
 * Interoperability with the Zarr v2 reference implementation, Debian's python3-zarr 2.13 with
 * numcodecs 0.11 (its {@code N5FSStore} for N5), in both directions. Each direction runs one
 * Python process for all of its arrays.
 */
class ZarrInteropTest {
  private static final String REFERENCE = "zarr 2.13 / numcodecs 0.11 (python3-zarr)";

  @TempDir
  Path tmp;

  /**
   * Arrays written by zarr/numcodecs with every codec, dtype and layout read back equal, and so
   * do their user attributes.
   */
  @Test
  void arraysWrittenByPythonReadEqual() throws IOException {
    PythonReference.requireModules("zarr", "numcodecs", "numpy");
    String count = PythonReference.runChecked(script("python_writes.py"), tmp.toString()).strip();
    List<Map<String, Object>> manifest = manifest(tmp.resolve("manifest.json"));
    assertEquals(Integer.parseInt(count), manifest.size());
    assertTrue(manifest.size() > 150, "the reference script wrote " + manifest.size());
    List<String> failures = new ArrayList<>();
    for (Map<String, Object> entry : manifest) {
      String failure = compare(entry);
      if (failure != null) {
        failures.add(entry.get("format") + " " + entry.get("path") + " [" + entry.get("note")
            + "]: " + failure);
      }
    }
    assertTrue(failures.isEmpty(), "differences from " + REFERENCE + ":\n"
        + String.join("\n", failures));
  }

  /**
   * Arrays written here with every codec, dtype and layout read back equal by zarr, and so do
   * the attributes merged in two steps.
   */
  @Test
  void arraysWrittenByJavaReadEqualInPython() throws IOException {
    PythonReference.requireModules("zarr", "numcodecs", "numpy");
    JavaWrites writes = new JavaWrites(tmp, new Random(13));
    writes.writeAll();
    writes.saveManifest();
    String output = PythonReference.runChecked(script("python_reads.py"), tmp.toString());
    Map<String, Object> results = new ObjectMapper().readValue(
        output.strip().lines().reduce((a, b) -> b).orElse("{}"), MAP);
    assertEquals(writes.count(), results.size(), "zarr reported on every array");
    List<String> failures = new ArrayList<>();
    results.forEach((name, result) -> {
      if (!"ok".equals(result)) {
        failures.add(writes.describe(name) + ": " + result);
      }
    });
    assertTrue(failures.isEmpty(), REFERENCE + " reads differently:\n"
        + String.join("\n", failures));
  }

  private static final com.fasterxml.jackson.core.type.TypeReference<Map<String, Object>> MAP =
      new com.fasterxml.jackson.core.type.TypeReference<>() {};

  private String compare(Map<String, Object> entry) throws IOException {
    Container container = Container.open(tmp.resolve((String) entry.get("container")));
    Dataset dataset;
    try {
      dataset = container.openDataset((String) entry.get("path"));
    } catch (StoreException e) {
      return e.getMessage();
    }
    if (!dataset.dataType().n5Name().equals(entry.get("dtype"))) {
      return "data type " + dataset.dataType() + ", expected " + entry.get("dtype");
    }
    @SuppressWarnings("unchecked")
    List<Integer> zarrShape = (List<Integer>) entry.get("shape");
    long[] shape = new long[zarrShape.size()];
    for (int d = 0; d < shape.length; d++) {
      shape[d] = zarrShape.get(shape.length - 1 - d);
    }
    if (!Arrays.equals(shape, dataset.shape())) {
      return "shape " + Arrays.toString(dataset.shape()) + ", expected " + Arrays.toString(shape);
    }
    Object attributes = container.readAttributes((String) entry.get("path"));
    if (!attributes.equals(entry.get("attrs"))) {
      return "attributes " + attributes + ", expected " + entry.get("attrs");
    }
    byte[] actual;
    try {
      ArrayImg<?, ?> all = dataset.read(new FinalInterval(shape));
      actual = ElementArrays.toBytes(DatasetRoundTripTest.storage(all), ByteOrder.LITTLE_ENDIAN);
    } catch (StoreException e) {
      return e.getMessage();
    }
    byte[] expected = Files.readAllBytes(tmp.resolve("expected").resolve(entry.get("name")
        + ".bin"));
    int mismatch = Arrays.mismatch(expected, actual);
    return mismatch < 0 ? null : "values differ first at byte " + mismatch + " of "
        + expected.length;
  }

  static List<Map<String, Object>> manifest(Path file) throws IOException {
    ObjectMapper mapper = new ObjectMapper();
    return Arrays.asList(mapper.readValue(file.toFile(), Map[].class)).stream()
        .map(ZarrInteropTest::cast).toList();
  }

  @SuppressWarnings("unchecked")
  private static Map<String, Object> cast(Map<?, ?> map) {
    return (Map<String, Object>) map;
  }

  static String script(String name) throws IOException {
    try (InputStream in = ZarrInteropTest.class.getResourceAsStream(name)) {
      return new String(in.readAllBytes(), StandardCharsets.UTF_8);
    }
  }
}
