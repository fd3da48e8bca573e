package org.sunder.blockwise.partition.config;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.ByteArrayInputStream;
import java.io.ByteArrayOutputStream;
import java.io.ObjectInputStream;
import java.io.ObjectOutputStream;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Random;
import java.util.Set;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.partition.PartitionFixtures;
import org.sunder.blockwise.partition.Partitioner;
import org.sunder.blockwise.partition.ReducedGraphSolver;
import org.sunder.blockwise.partition.SegmentGraph;
import org.sunder.blockwise.partition.Segmentation;

/**
 * Every {@link PartitionMethod}, found through the sealed type's permitted subclasses (so a new
 * method is covered without editing this test): it is listed by {@link PartitionMethod#all()},
 * its configuration round-trips through JSON and Java serialisation, and it yields a working
 * block partitioner and reduced-graph solver.
 */
class PartitionMethodTest {
  private static final ObjectMapper JSON = new ObjectMapper();

  private static List<PartitionMethod> permitted() throws ReflectiveOperationException {
    List<PartitionMethod> methods = new ArrayList<>();
    for (Class<?> type : PartitionMethod.class.getPermittedSubclasses()) {
      assertTrue(type.isRecord() && type.getRecordComponents().length == 0,
          type + " is a record without components");
      methods.add((PartitionMethod) type.getDeclaredConstructor().newInstance());
    }
    return methods;
  }

  @Test
  void everyPermittedMethodIsListedOnceUnderItsOwnName() throws Exception {
    List<PartitionMethod> methods = permitted();
    assertEquals(methods, PartitionMethod.all());
    Set<String> names = new HashSet<>();
    for (PartitionMethod m : methods) {
      assertTrue(names.add(m.jsonName()), "unique name " + m.jsonName());
      assertEquals(m, PartitionMethod.fromName(m.jsonName()));
    }
    SunderException unknown = assertThrows(SunderException.class,
        () -> PartitionConfig.fromJson("{\"method\": \"no-such-method\"}"));
    for (String name : names) {
      assertTrue(unknown.getMessage().contains(name), unknown.getMessage());
    }
    assertTrue(methods.contains(PartitionMethod.robustDefault()));
  }

  @Test
  void everyMethodRoundTripsThroughJsonAndJavaSerialisation() throws Exception {
    for (PartitionMethod m : permitted()) {
      for (PartitionConfig config : new PartitionConfig[] {m.fittedTo(null, null),
          m.fittedTo(new double[] {4, 4, 40}, 20)}) {
        JsonNode tree = JSON.valueToTree(config);
        assertEquals(m.jsonName(), tree.get("method").asText());
        assertEquals(m.usesFragments(), tree.has("fragments"), m.jsonName());
        PartitionConfig read = PartitionConfig.fromJson(tree.toString());
        assertEquals(config, read, m.jsonName());
        assertEquals(tree, JSON.valueToTree(read), m.jsonName());
        assertEquals(config, javaRoundTrip(config), m.jsonName());
        assertEquals(m.usesFragments(), config.method().usesFragments());
      }
      assertEquals(m.fittedTo(null, null),
          PartitionConfig.fromJson("{\"method\": \"" + m.jsonName() + "\"}"),
          "a bare method name takes every default");
    }
  }

  @Test
  void everyMethodPartitionsABlockAndSolvesAReducedGraph() throws Exception {
    Random random = new Random(13);
    AffinityBlock block = PartitionFixtures.randomBlock(random, new int[] {12, 8, 4}, true);
    for (PartitionMethod m : permitted()) {
      for (PartitionConfig config : new PartitionConfig[] {m.fittedTo(null, null),
          m.fittedTo(null, 4)}) {
        config.validate(block.offsets());
        Partitioner partitioner = config.create();
        Segmentation s = partitioner.partition(block);
        assertTrue(PartitionFixtures.isValid(s, block.maskOrNull()), config.toString());
        assertTrue(s.segmentCount() > 1, config.toString());
        assertEquals(s, config.create().partition(block), "deterministic: " + config);
      }
      ReducedGraphSolver solver = m.fittedTo(null, null).createSolver();
      assertTrue(!solver.name().isEmpty(), m.jsonName());
      int[] clusters = solver.clusters(twoPairsAndALoneNode());
      assertEquals(5, clusters.length, m.jsonName());
      assertEquals(clusters[0], clusters[1], m.jsonName() + ": attractive pair joined");
      assertNotEquals(clusters[2], clusters[3], m.jsonName() + ": repulsive pair apart");
      assertNotEquals(clusters[1], clusters[2], m.jsonName());
      assertNotEquals(clusters[4], clusters[0], m.jsonName() + ": the lone node stays alone");
      assertNotEquals(clusters[4], clusters[2], m.jsonName());
      assertNotEquals(clusters[4], clusters[3], m.jsonName());
    }
  }

  /**
   * Nodes 0 and 1 joined by three voxel edges of weight +2, nodes 2 and 3 kept apart by three
   * of weight -2, 1 and 2 by one of weight -1; node 4 has no edge.
   */
  private static SegmentGraph twoPairsAndALoneNode() {
    EdgeStatistics edges = EdgeStatistics.ofEdges(new long[] {0, 0, 0, 2, 2, 2, 1},
        new long[] {1, 1, 1, 3, 3, 3, 2}, new double[] {2, 2, 2, -2, -2, -2, -1});
    return new SegmentGraph() {
      @Override
      public long[] nodeIds() {
        return new long[] {10, 11, 12, 13, 14};
      }

      @Override
      public EdgeStatistics edges() {
        return edges;
      }

      @Override
      public int[] separatedU() {
        return new int[0];
      }

      @Override
      public int[] separatedV() {
        return new int[0];
      }
    };
  }

  private static Object javaRoundTrip(Object value) throws Exception {
    ByteArrayOutputStream bytes = new ByteArrayOutputStream();
    try (ObjectOutputStream out = new ObjectOutputStream(bytes)) {
      out.writeObject(value);
    }
    try (ObjectInputStream in = new ObjectInputStream(
        new ByteArrayInputStream(bytes.toByteArray()))) {
      return in.readObject();
    }
  }
}
