package org.sunder.stitching.bench;

import static org.sunder.stitching.bench.BlockwiseRuns.AFFINITIES;
import static org.sunder.stitching.bench.BlockwiseRuns.writeAffinities;

import java.io.IOException;
import java.lang.management.ManagementFactory;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.function.LongUnaryOperator;
import java.util.stream.Stream;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.partition.config.FragmentsMulticutMethod;
import org.sunder.blockwise.partition.PartitionFixtures;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.blockwise.partition.multicut.Multicut;
import org.sunder.blockwise.synth.SyntheticVolume;
import org.sunder.blockwise.synth.TissuePreset;
import org.sunder.stitching.setup.StitchingSetup;
import org.sunder.stitching.solve.FinalIdMap;
import org.sunder.stitching.solve.GlobalSolve;
import org.sunder.stitching.solve.ReducedGraph;
import org.sunder.stitching.solve.SuperBlockSolve;
import org.sunder.stitching.task.BlockSummary;
import org.sunder.stitching.task.PartitionTask;
import org.sunder.stitching.task.SeamEdges;
import org.sunder.stitching.task.SeamTask;

/**
 * The multicut by domain decomposition against the single-level multicut, on realistic tissue
 * ({@link TissuePreset}): the blockwise stages of the default method (without its size filter;
 * {@code -DsizeFilter=true} keeps it, so the whole default runs, the filter as its own pass of
 * levels; {@code -DkernighanLin=true} refines the multicut by Kernighan–Lin) once, then the
 * solve whole and under falling driver bounds,
 * and for the first bound that gives each number of levels of super-blocks: the variation of
 * information (bits, voxels weighted, background excluded) between the two segmentations, the
 * ratio of the multicut objectives on the reduced graph (the levels' over the single-level
 * one's; both negative, so below 1 is worse), the edges the driver solved, and the solve's wall
 * and this process's CPU time (the in-process runner solves the parts one after another).
 * {@code -Dnumbering=true} also prints how much the reduced graph's greedy additive contraction
 * depends on the node numbering that breaks its ties (see {@link #numberingVoi}). Not a
 * test. Arguments (optional): {@code x y z} shape (default 256 256 96), blocks {@code x y z}
 * (default 32 32 8), presets (comma-separated, default all), seed (default 1).
 */
public final class MulticutLevelsBenchmark {
  private static final int[] CHUNK = {32, 32, 8};

  private MulticutLevelsBenchmark() {}

  public static void main(String[] args) throws IOException {
    long[] shape = args.length >= 3 ? new long[] {Long.parseLong(args[0]),
        Long.parseLong(args[1]), Long.parseLong(args[2])} : TissuePreset.STANDARD_SHAPE.clone();
    int[] block = args.length >= 6 ? new int[] {Integer.parseInt(args[3]),
        Integer.parseInt(args[4]), Integer.parseInt(args[5])} : CHUNK.clone();
    List<TissuePreset> presets = new ArrayList<>();
    for (TissuePreset p : TissuePreset.values()) {
      if (args.length < 7 || Arrays.asList(args[6].split(",")).contains(p.presetName())) {
        presets.add(p);
      }
    }
    long seed = args.length >= 8 ? Long.parseLong(args[7]) : 1;
    Offsets offsets = TissuePreset.offsets();
    int[] halo = BlockwiseRuns.halo(offsets.vectors(), 1);
    for (TissuePreset preset : presets) {
      SyntheticVolume volume = preset.volume(seed, shape);
      float[] affinities = preset.affinities(volume, seed);
      double[] voxelSize = volume.spec().voxelSize();
      PartitionConfig fitted = new FragmentsMulticutMethod().fittedTo(voxelSize,
          Boolean.getBoolean("sizeFilter") ? PartitionConfig.defaultMinSegmentSize(voxelSize)
              : 0);
      PartitionConfig config = new PartitionConfig(fitted.method(), fitted.linkage(),
          fitted.constraints(), fitted.threshold(), fitted.weights(), fitted.subsampling(),
          fitted.fragments(), fitted.minSegmentSize(), null, Boolean.getBoolean("kernighanLin"));
      Path root = Files.createTempDirectory("sunder-multicut-levels");
      try {
        writeAffinities(root, shape, CHUNK, offsets.count(), affinities);
        BlockGrid grid = BlockGrid.of(shape, CHUNK, block, halo);
        StitchingSetup setup = StitchingSetup.of(root, AFFINITIES, "", root, "labels", grid,
            offsets, config);
        setup.validateInputs();
        setup.createLabels();
        List<BlockSummary> summaries = new ArrayList<>();
        long pairs = 0;
        for (int b = 0; b < grid.blockCount(); b++) {
          summaries.add(PartitionTask.run(setup, b));
          pairs += summaries.get(b).innerEdges().size();
        }
        List<SeamEdges> seams = new ArrayList<>();
        for (int f = 0; f < grid.faceCount(); f++) {
          seams.add(SeamTask.run(setup, f));
          pairs += seams.get(f).edges().size();
        }
        long allPairs = pairs;
        Timed single = timed(() -> GlobalSolve.run(setup, summaries, seams));
        ReducedGraph graph = ReducedGraph.assemble(setup.idLayout(), summaries, seams);
        double objective = objective(graph, single.result().finalIds());
        System.out.printf(Locale.ROOT, "%s seed %d, %s voxels, grid %s blocks of %s: %d"
            + " reduced-graph pairs, single-level solve %.2f s wall, %.2f s CPU, %d segments,"
            + " objective %.1f%n", preset.presetName(), seed, Arrays.toString(shape),
            Arrays.toString(grid.gridShape()), Arrays.toString(block), graph.edges().size(),
            single.wall(), single.cpu(), single.result().finalIds().finalIdCount(), objective);
        if (Boolean.getBoolean("numbering")) {
          System.out.printf(Locale.ROOT, "  the reduced graph's greedy additive contraction with"
              + " its nodes renumbered at random (3 numberings): VOI %s bits against the given"
              + " numbering%n", numberingVoi(summaries, setup, graph));
        }
        int seen = 0;
        for (long bound = pairs / 2; bound >= 64; bound /= 2) {
          long b = bound;
          Timed levels;
          try {
            levels = timed(() -> SuperBlockSolve.run(setup, allPairs, b, summaries::get,
                seams::get, root.resolve("levels-" + b)));
          } catch (SunderException tooLow) {
            System.out.printf(Locale.ROOT, "  bound %d: %s%n", bound, tooLow.getMessage());
            continue;
          }
          String method = levels.result().report().method();
          // the multicut's levels come first; with the size filter its pass's levels follow
          int count = Integer.parseInt(method.replaceFirst("^.*?\\((\\d+) levels.*", "$1"));
          String filterLevels = method.contains(", then")
              ? ", size filter " + method.replaceFirst(".*\\((\\d+) levels\\)$", "$1")
                  + " levels" : "";
          if (count <= seen) {
            continue;
          }
          seen = count;
          FinalIdMap ids = levels.result().finalIds();
          System.out.printf(Locale.ROOT, "  bound %d: %d levels of super-blocks%s, VOI %.4f"
              + " bits against the single level, objective ratio %.4f, %d segments, solve %.2f s"
              + " wall, %.2f s CPU%n", bound, count, filterLevels,
              voi(summaries, setup, single.result().finalIds()::apply, ids::apply),
              objective(graph, ids) / objective, ids.finalIdCount(), levels.wall(),
              levels.cpu());
        }
      } finally {
        try (Stream<Path> walk = Files.walk(root)) {
          walk.sorted(java.util.Comparator.reverseOrder()).forEach(p -> p.toFile().delete());
        }
      }
    }
  }

  private record Timed(GlobalSolve.Result result, double wall, double cpu) {}

  private static Timed timed(java.util.function.Supplier<GlobalSolve.Result> solve) {
    com.sun.management.OperatingSystemMXBean os = (com.sun.management.OperatingSystemMXBean)
        ManagementFactory.getOperatingSystemMXBean();
    long cpu = os.getProcessCpuTime();
    long start = System.nanoTime();
    GlobalSolve.Result r = solve.get();
    return new Timed(r, (System.nanoTime() - start) / 1e9, (os.getProcessCpuTime() - cpu) / 1e9);
  }

  /** The multicut objective (summed weights of cut pairs) of final ids on a reduced graph. */
  private static double objective(ReducedGraph graph, FinalIdMap ids) {
    EdgeStatistics edges = graph.edges();
    double sum = 0;
    for (int e = 0; e < edges.size(); e++) {
      long a = ids.apply(graph.nodeIds()[(int) edges.u(e)]);
      long b = ids.apply(graph.nodeIds()[(int) edges.v(e)]);
      sum += a != b ? edges.sum(e) : 0;
    }
    return sum;
  }

  /**
   * Variation of information, bits, between two labellings of the provisional segment ids over
   * every segment of every block weighted by its voxels: the voxel-level VOI of the two
   * segmentations (background, in no segment, excluded).
   */
  private static double voi(List<BlockSummary> summaries, StitchingSetup setup,
      LongUnaryOperator a, LongUnaryOperator b) {
    Map<Long, Double> ofA = new HashMap<>();
    Map<Long, Double> ofB = new HashMap<>();
    Map<String, Double> pairs = new HashMap<>();
    double total = 0;
    for (BlockSummary s : summaries) {
      for (int k = 0; k < s.segmentSizes().length; k++) {
        double size = s.segmentSizes()[k];
        if (size == 0) {
          continue;
        }
        long id = setup.idLayout().provisional(s.block(), k + 1);
        long x = a.applyAsLong(id);
        long y = b.applyAsLong(id);
        ofA.merge(x, size, Double::sum);
        ofB.merge(y, size, Double::sum);
        pairs.merge(x + ":" + y, size, Double::sum);
        total += size;
      }
    }
    double hJoint = entropy(pairs.values(), total);
    return 2 * hJoint - entropy(ofA.values(), total) - entropy(ofB.values(), total);
  }

  /**
   * How much the greedy additive contraction of the reduced graph (sum costs, nothing joined
   * first) depends on its node numbering, which breaks its ties: VOI, bits, between the
   * partition under the given numbering and under random ones, over every segment weighted by
   * its voxels (segments in no reduced-graph node count as their own).
   */
  private static String numberingVoi(List<BlockSummary> summaries, StitchingSetup setup,
      ReducedGraph graph) {
    int n = graph.nodeIds().length;
    EdgeStatistics edges = graph.edges();
    int[] u = new int[edges.size()];
    int[] v = new int[edges.size()];
    double[] w = new double[edges.size()];
    for (int e = 0; e < edges.size(); e++) {
      u[e] = (int) edges.u(e);
      v[e] = (int) edges.v(e);
      w[e] = edges.sum(e);
    }
    int[] given = Multicut.greedyAdditive(n, u, v, w).labels();
    Map<Long, Integer> nodeOf = new HashMap<>();
    for (int i = 0; i < n; i++) {
      nodeOf.put(graph.nodeIds()[i], i);
    }
    java.util.Random random = new java.util.Random(7);
    List<String> out = new ArrayList<>();
    for (int trial = 0; trial < 3; trial++) {
      int[] perm = PartitionFixtures.permutation(random, n);
      int[] pu = new int[u.length];
      int[] pv = new int[v.length];
      for (int e = 0; e < u.length; e++) {
        pu[e] = perm[u[e]];
        pv[e] = perm[v[e]];
      }
      int[] permuted = Multicut.greedyAdditive(n, pu, pv, w).labels();
      LongUnaryOperator givenLabel = id -> {
        Integer node = nodeOf.get(id);
        return node == null ? -1 - id : given[node];
      };
      LongUnaryOperator permutedLabel = id -> {
        Integer node = nodeOf.get(id);
        return node == null ? -1 - id : permuted[perm[node]];
      };
      out.add(String.format(Locale.ROOT, "%.4f",
          voi(summaries, setup, givenLabel, permutedLabel)));
    }
    return String.join(" / ", out);
  }

  private static double entropy(java.util.Collection<Double> counts, double total) {
    double h = 0;
    for (double c : counts) {
      double p = c / total;
      h -= p * Math.log(p) / Math.log(2);
    }
    return h;
  }
}
