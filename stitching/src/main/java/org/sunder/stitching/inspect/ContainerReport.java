package org.sunder.stitching.inspect;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.PrintStream;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.grid.Shapes;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.Dataset;

/**
 * Describes what a container holds: every group and dataset, and for a dataset its shape and
 * chunk shape (slowest axis first, as in Zarr and Python, with the axis names), data type,
 * codec and attributes. Walks the hierarchy once; reads metadata only, never chunks.
 */
public final class ContainerReport {
  private static final ObjectMapper JSON = new ObjectMapper();

  private ContainerReport() {}

  /** Prints the description of {@code root} (or of one member {@code path}, if not null). */
  public static void print(Path root, String path, PrintStream out) {
    Container container;
    try {
      container = Container.open(root);
    } catch (SunderException e) {
      throw new SunderException(ErrorKind.INVALID_INPUT, root + " is not an N5 or Zarr container ("
          + e.getMessage() + ")", e);
    }
    out.println("container " + container.root() + "  format "
        + container.format().name().toLowerCase(Locale.ROOT));
    if (path == null || path.isEmpty()) {
      attributes(container, "", "  ", out);
      walk(container, "", "", out);
    } else if (container.datasetExists(path)) {
      dataset(container, path, "", out);
    } else if (container.groupExists(path)) {
      out.println(path + "/  group");
      attributes(container, path, "  ", out);
      walk(container, path, "  ", out);
    } else {
      throw new SunderException(ErrorKind.INVALID_INPUT, "no dataset or group '" + path + "' in "
          + root + "; it holds " + container.list(""));
    }
  }

  private static void walk(Container container, String group, String indent, PrintStream out) {
    List<String> children = container.list(group).stream().sorted().toList();
    for (String child : children) {
      String path = group.isEmpty() ? child : group + "/" + child;
      if (container.datasetExists(path)) {
        dataset(container, path, indent, out);
      } else if (container.groupExists(path)) {
        out.println(indent + path + "/  group");
        attributes(container, path, indent + "  ", out);
        walk(container, path, indent + "  ", out);
      }
    }
  }

  private static void dataset(Container container, String path, String indent, PrintStream out) {
    Dataset dataset = container.openDataset(path);
    long[] shape = dataset.shape();
    String axes = axisNames(shape.length);
    out.println(indent + path + "  dataset");
    out.println(indent + "  shape   " + Arrays.toString(Shapes.reversed(shape)) + "  (" + axes
        + ")");
    out.println(indent + "  chunks  " + Arrays.toString(Shapes.reversed(dataset.chunkShape())));
    out.println(indent + "  dtype   " + dataset.dataType().name().toLowerCase(Locale.ROOT));
    out.println(indent + "  codec   " + dataset.spec().codec());
    attributes(container, path, indent + "  ", out);
  }

  private static void attributes(Container container, String path, String indent, PrintStream out) {
    Map<String, Object> attributes = container.readAttributes(path);
    if (attributes.isEmpty()) {
      return;
    }
    try {
      out.println(indent + "attributes " + JSON.writeValueAsString(attributes));
    } catch (JsonProcessingException e) {
      out.println(indent + "attributes " + attributes);
    }
  }

  /** {@code z, y, x} for 3 dimensions, {@code c, z, y, x} for 4; {@code d0..} beyond. */
  static String axisNames(int n) {
    String[] names = switch (n) {
      case 1 -> new String[] {"x"};
      case 2 -> new String[] {"y", "x"};
      case 3 -> new String[] {"z", "y", "x"};
      case 4 -> new String[] {"c", "z", "y", "x"};
      default -> null;
    };
    if (names == null) {
      StringBuilder b = new StringBuilder();
      for (int d = n - 1; d >= 0; d--) {
        b.append(b.length() == 0 ? "" : ", ").append("d").append(d);
      }
      return b.toString();
    }
    return String.join(", ", names);
  }
}
