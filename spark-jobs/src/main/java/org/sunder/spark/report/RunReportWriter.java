package org.sunder.spark.report;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import java.awt.image.BufferedImage;
import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.ByteBuffer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.time.Instant;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import org.apache.spark.api.java.JavaSparkContext;
import org.sunder.blockwise.files.AtomicWrites;
import org.sunder.blockwise.grid.Block;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.grid.Face;
import org.sunder.spark.config.AxisOrder;
import org.sunder.spark.evaluate.SeamAuditJob;
import org.sunder.spark.kryo.PayloadCodec;
import org.sunder.spark.run.RunSettings;
import org.sunder.spark.stage.DecisionsFile;
import org.sunder.spark.stage.Pipeline;
import org.sunder.spark.stage.PyramidStep;
import org.sunder.spark.stage.RunReport;
import org.sunder.spark.workdir.Manifest;
import org.sunder.spark.workdir.Stage;
import org.sunder.spark.workdir.SunderVersion;
import org.sunder.spark.workdir.WorkDir;
import org.sunder.stitching.scores.EvaluationScores;
import org.sunder.stitching.scores.Overlap;
import org.sunder.stitching.scores.SeamAuditResult;
import org.sunder.stitching.setup.EvaluationTarget;
import org.sunder.stitching.solve.GlobalSolve;
import org.sunder.stitching.solve.SolveDecision;
import org.sunder.stitching.solve.SolveReport;
import org.sunder.stitching.task.BlockSummary;
import org.sunder.stitching.task.LabelPyramid;

/**
 * Writes a run's report, {@code report.html} in its work dir: one self-contained page with the
 * run's settings, per stage the tasks, wall time, core-seconds and Mvoxels/s per core (from the
 * task timings in the work dir), the segment count and size histogram, slice pictures through
 * the volume, the seam audit, with ground truth the scores and pictures of the worst splits and
 * merges, and the solve's least certain decisions. Each part appears once the stages it needs
 * have finished. Voxel-scale work (bounding boxes, seam audit) runs on Spark; the driver reads
 * only the pictured planes (at most {@value #WINDOW} voxels on a side each).
 */
public final class RunReportWriter {
  /** Largest side, in voxels, of a pictured plane (a centred window of larger volumes). */
  static final int WINDOW = 384;
  /** Slice positions per axis, as fractions of the volume's extent. */
  static final double[] SLICE_AT = {0.25, 0.5, 0.75};
  /** Worst splits and worst merges pictured, each. */
  static final int WORST = 4;

  private static final ObjectMapper JSON = new ObjectMapper()
      .enable(SerializationFeature.INDENT_OUTPUT);
  private static final PayloadCodec CODEC = new PayloadCodec();

  private final JavaSparkContext sc;
  private final RunSettings s;
  private final WorkDir work;
  private final BlockGrid grid;
  private final AxisOrder axes;

  private RunReportWriter(JavaSparkContext sc, RunSettings settings, WorkDir work) {
    this.sc = sc;
    this.s = settings;
    this.work = work;
    this.grid = settings.grid();
    this.axes = new AxisOrder(settings.axes());
  }

  /**
   * Writes the report of the run in {@code work} and returns its path.
   *
   * @param seams the seam audit if the caller has it, else {@code null} (then audited here
   *     when the segmentation is complete)
   * @param scores the scores if the caller has them, else {@code null} (then taken from the
   *     evaluate records when complete)
   */
  public static Path write(JavaSparkContext sc, RunSettings settings, WorkDir work,
      SeamAuditResult seams, EvaluationScores scores) {
    Plane.requireThreeDimensions(settings.volumeShape());
    RunReportWriter writer = new RunReportWriter(sc, settings, work);
    ReportPage page = writer.page(seams, scores);
    Path file = work.reportFile();
    AtomicWrites.write(file, ByteBuffer.wrap(page.html().getBytes(StandardCharsets.UTF_8)));
    return file;
  }

  /**
   * {@link #write} at the end of a run: prints where the report is, or, when it cannot be
   * written, one line saying why and how to write it later; the run's result stands either way.
   */
  public static void writeAfterRun(JavaSparkContext sc, RunReport run, PrintStream out) {
    RunSettings settings = run.settings();
    try {
      out.println("report: " + write(sc, settings, new WorkDir(settings.workDirPath()),
          run.seams(), run.scores()));
    } catch (RuntimeException e) {
      out.println("report: not written (" + e.getMessage() + "); write it later with '"
          + org.sunder.spark.Launcher.command() + " report CONFIG'");
    }
  }

  private boolean complete(Stage stage, int tasks) {
    return work.ledger(stage).finished().cardinality() >= tasks;
  }

  private ReportPage page(SeamAuditResult seams, EvaluationScores scores) {
    ReportPage page = new ReportPage("Sunder run report");
    page.paragraph("Segmentation " + s.outputContainer() + " : " + s.outputDataset()
        + "; written " + Instant.now().toString().substring(0, 19).replace('T', ' ')
        + " UTC by sunder " + SunderVersion.get() + ".");
    page.caution("Automated segmentations contain errors. Proofread a segmentation before it"
        + " supports a scientific conclusion; the least certain decisions below are where to"
        + " start.");
    settings(page);
    stages(page);
    boolean solved = complete(Stage.PARTITION, grid.blockCount()) && complete(Stage.SOLVE, 1);
    if (solved) {
      segments(page);
    }
    boolean relabelled = complete(Stage.RELABEL, grid.blockCount());
    if (relabelled) {
      slices(page);
      seamAudit(page, seams != null ? seams : SeamAuditJob.audit(sc, auditTarget(), s.blockShape()));
    } else {
      page.heading("Segmentation").paragraph("The relabel stage has not finished; pictures and"
          + " the seam audit follow once it has (run the same command again to resume).");
    }
    if (s.evaluates() && relabelled && complete(Stage.EVALUATE, grid.blockCount())) {
      scores(page, scores != null ? scores
          : Pipeline.scores(work, grid.blockCount(), s.ignoreBackground()));
    }
    if (solved && relabelled) {
      decisions(page);
    }
    page.caution("Automated segmentations contain errors and need proofreading before use.");
    return page;
  }

  private void settings(ReportPage page) {
    page.heading("Settings");
    List<List<String>> rows = new ArrayList<>();
    rows.add(List.of("input", s.inputContainer() + " : " + s.affinities()));
    rows.add(List.of("output", s.outputContainer() + " : " + s.outputDataset()));
    rows.add(List.of("volume (" + axes + ")", Arrays.toString(axes.toFile(s.volumeShape()))
        + " = " + s.voxelCount() + " voxels"));
    rows.add(List.of("chunks (" + axes + ")", Arrays.toString(axes.toFile(s.chunkShape()))));
    rows.add(List.of("blocks (" + axes + ")", Arrays.toString(axes.toFile(s.blockShape()))
        + ", halo " + Arrays.toString(axes.toFile(s.halo())) + "; " + grid.blockCount()
        + " blocks, " + grid.faceCount() + " faces"));
    rows.add(List.of("ground truth", s.evaluates() ? s.truthContainer() + " : " + s.groundTruth()
        : "none"));
    rows.add(List.of("work dir", s.workDir()));
    page.table(List.of("setting", "value"), rows, 2);
    Manifest manifest = work.manifest().orElse(null);
    if (manifest != null) {
      try {
        page.paragraph("Run " + manifest.runId() + "; the resolved configuration:");
        page.preformatted(JSON.writeValueAsString(manifest.config()));
      } catch (java.io.IOException e) {
        page.paragraph("The configuration could not be shown: " + e.getMessage());
      }
    }
  }

  private long coreVoxels(int block) {
    Block b = grid.block(block);
    long n = 1;
    for (int d = 0; d < 3; d++) {
      n *= b.coreMax()[d] - b.coreMin()[d] + 1;
    }
    return n;
  }

  private void stages(ReportPage page) {
    page.heading("Stages");
    List<List<String>> rows = new ArrayList<>();
    for (Stage stage : Stage.values()) {
      if (stage == Stage.EVALUATE && !s.evaluates()) {
        continue;
      }
      StageFigures f = switch (stage) {
        case SEAMS -> StageFigures.of(work.ledger(stage), grid.faceCount(),
            face -> 2 * grid.face(face).area());
        case SOLVE -> StageFigures.of(work.ledger(stage), 1, task -> s.voxelCount());
        case PYRAMID -> pyramidFigures();
        default -> StageFigures.of(work.ledger(stage), grid.blockCount(), this::coreVoxels);
      };
      int done = work.ledger(stage).finished().cardinality();
      rows.add(List.of(stage.cliName(), done + " of " + f.tasks(), String.valueOf(f.timed()),
          fixed(f.wallSeconds(), 2), fixed(f.coreSeconds(), 2),
          Double.isNaN(f.megavoxelsPerCoreSecond()) ? "–" : fixed(f.megavoxelsPerCoreSecond(), 3)));
    }
    page.table(List.of("stage", "tasks finished", "timed", "wall time (s)", "core-seconds",
        "Mvoxels/s per core"), rows);
    page.paragraph("From the task timings in the work dir: wall time runs from the first timed"
        + " task's start to the last one's end (across reruns it includes the pause between"
        + " them); core-seconds add up the tasks' durations. Voxels per task: a block's core;"
        + " for seams the two voxel layers of a face; for the solve the whole volume; for the"
        + " pyramid the voxels a chunk of a level reads from the level before.");
  }

  /** The pyramid's figures: a task reads the level before its own, about 2^n voxels per voxel written. */
  private StageFigures pyramidFigures() {
    LabelPyramid pyramid = PyramidStep.plan(s);
    int[] offsets = PyramidStep.taskOffsets(pyramid);
    int tasks = offsets[pyramid.levelCount()];
    return StageFigures.of(work.ledger(Stage.PYRAMID), tasks, task -> {
      int level = 1;
      while (task >= offsets[level + 1]) {
        level++;
      }
      long[] chunk = pyramid.chunkPosition(level, task - offsets[level]);
      long voxels = 1;
      for (int d = 0; d < chunk.length; d++) {
        long min = chunk[d] * pyramid.chunkShape()[d];
        long max = Math.min(pyramid.shapes()[level][d], min + pyramid.chunkShape()[d]);
        voxels *= (max - min) * pyramid.factors()[level][d];
      }
      return voxels;
    });
  }

  private void segments(ReportPage page) {
    SolveReport solve = CODEC.decode(work.ledger(Stage.SOLVE).read(0), SolveReport.class,
        "solve record");
    long[] sizes = SegmentSizes.of(work, grid.blockCount(), s.setup().idLayout(),
        solve.finalIdCount());
    long[] nonEmpty = Arrays.stream(sizes, 1, sizes.length).filter(v -> v > 0).sorted().toArray();
    page.heading("Segments");
    if (nonEmpty.length == 0) {
      page.paragraph("The segmentation has no segments (every voxel is background).");
      return;
    }
    page.paragraph(String.format(Locale.ROOT, "%d segments; sizes from %d to %d voxels,"
        + " median %d. The solve (%s) joined %d provisional segments into %d final ids.",
        nonEmpty.length, nonEmpty[0], nonEmpty[nonEmpty.length - 1],
        nonEmpty[nonEmpty.length / 2], solve.method(), solve.segmentCount(),
        solve.finalIdCount()));
    page.figure(Charts.sizeHistogram(SegmentSizes.log2Histogram(sizes), 640, 400),
        "Segment size histogram, log–log: segments per size bin (each bin spans a factor 2).");
  }

  private char letter(int memoryAxis) {
    return axes.letters().charAt(axes.filePosition(memoryAxis));
  }

  private void slices(ReportPage page) {
    page.heading("Slices through the volume");
    page.paragraph("Grey: the affinities' boundary map (dark where the network predicts a"
        + " boundary). Colours: the segmentation, one colour per segment. Yellow lines: block"
        + " faces. Volumes wider than " + WINDOW + " voxels are shown in a centred window;"
        + " pictures keep the voxels' physical proportions (from the input's voxelSize).");
    long[] shape = s.volumeShape();
    long[] centre = {shape[0] / 2, shape[1] / 2, shape[2] / 2};
    double[] voxelSize = PyramidStep.voxelSize(s);
    for (int f = 0; f < 3; f++) {
      int axis = memoryAxisAtFilePosition(f);  // file order: the configuration's first axis first
      for (double at : SLICE_AT) {
        long position = Math.min(shape[axis] - 1, Math.round(at * shape[axis]));
        Plane plane = Plane.centred(shape, axis, position, centre, WINDOW);
        float[] boundary = plane.boundary(s.setup());
        long[] labels = plane.labels(s.outputContainer(), s.outputDataset());
        int scale = SlicePicture.scaleFor(Math.max(plane.width(), plane.height()), 300);
        BufferedImage image = SlicePicture.render(plane, boundary, labels, null, 0,
            s.blockShape(), scale, rowScale(voxelSize, plane, scale));
        page.figure(image, letter(axis) + " = " + position + " of " + shape[axis] + "; "
            + span(plane, plane.rowAxis()) + " down, " + span(plane, plane.columnAxis())
            + " across");
      }
      page.breakLine();
    }
  }

  /**
   * Pixels per row that keep the picture's proportions physical: the column scale times the
   * ratio of the two axes' voxel sizes, rounded, between 1 and 4 times the column scale.
   */
  static int rowScale(double[] voxelSize, Plane plane, int scale) {
    double ratio = voxelSize[plane.rowAxis()] / voxelSize[plane.columnAxis()];
    return (int) Math.max(1, Math.min(4L * scale, Math.round(scale * ratio)));
  }

  private int memoryAxisAtFilePosition(int filePosition) {
    for (int d = 0; d < 3; d++) {
      if (axes.filePosition(d) == filePosition) {
        return d;
      }
    }
    throw new IllegalStateException("axis order " + axes + " has no position " + filePosition);
  }

  private String span(Plane plane, int axis) {
    return letter(axis) + " " + plane.min()[axis] + "–" + plane.max()[axis];
  }

  private EvaluationTarget auditTarget() {
    return new EvaluationTarget(s.outputContainer(), s.outputDataset(),
        s.evaluates() ? s.truthContainer() : null, s.groundTruth(), null, null,
        s.ignoreBackground());
  }

  private void seamAudit(ReportPage page, SeamAuditResult audit) {
    page.heading("Seam audit");
    page.preformatted(captured(out -> audit.print(
        Arrays.toString(axes.toFile(s.blockShape())) + " (" + axes + ")", out)));
  }

  private void scores(ReportPage page, EvaluationScores scores) {
    page.heading("Scores against the ground truth");
    page.preformatted(captured(out -> scores.print(s.ignoreBackground(), out)));
    worst(page, "Worst splits", scores.worstSplits(), true);
    worst(page, "Worst merges", scores.worstMerges(), false);
  }

  /**
   * A table and pictures of the worst splits (ground-truth objects in several segments) or
   * merges (segments over several objects): each picture cuts the object's bounding box at its
   * centre along the slowest axis and colours, inside the object, the labels of the other side
   * (the segments of a split object, the objects of a merged segment).
   */
  private void worst(ReportPage page, String title, List<Overlap> list, boolean splits) {
    page.heading(title);
    if (list.isEmpty()) {
      page.paragraph(splits ? "No ground-truth object is split." : "No segment merges objects.");
      return;
    }
    List<Overlap> top = list.subList(0, Math.min(WORST, list.size()));
    long[] labels = top.stream().mapToLong(Overlap::label).toArray();
    String container = splits ? s.truthContainer() : s.outputContainer();
    String dataset = splits ? s.groundTruth() : s.outputDataset();
    long[][] boxes = ObjectBoxes.of(sc, container, dataset, grid, labels);
    List<List<String>> rows = new ArrayList<>();
    for (int i = 0; i < top.size(); i++) {
      Overlap o = top.get(i);
      rows.add(List.of((splits ? "object " : "segment ") + Long.toUnsignedString(o.label()),
          String.valueOf(o.voxels()), String.valueOf(o.overlapCount()),
          String.valueOf(o.misassignedVoxels()), box(boxes[i])));
    }
    page.table(List.of(splits ? "ground-truth object" : "segment", "voxels",
        splits ? "segments" : "objects", "voxels outside its largest overlap",
        "bounding box (" + axes + ", inclusive)"), rows);
    for (int i = 0; i < top.size(); i++) {
      if (boxes[i] == null) {
        continue;
      }
      page.figure(objectPicture(boxes[i], labels[i], splits), (splits ? "object " : "segment ")
          + Long.toUnsignedString(labels[i]) + ": " + (splits ? "its segments" : "the objects"
          + " it covers") + " in colour, " + letter(2) + " = " + (boxes[i][2] + boxes[i][5]) / 2);
    }
    page.breakLine();
  }

  private BufferedImage objectPicture(long[] box, long label, boolean split) {
    int axis = 2;
    long[] shape = s.volumeShape();
    long[] min = new long[3];
    long[] max = new long[3];
    for (int d = 0; d < 3; d++) {
      if (d == axis) {
        min[d] = max[d] = (box[d] + box[3 + d]) / 2;
      } else {
        long margin = 8;
        min[d] = Math.max(0, box[d] - margin);
        max[d] = Math.min(shape[d] - 1, box[3 + d] + margin);
        if (max[d] - min[d] + 1 > WINDOW) {
          long c = (box[d] + box[3 + d]) / 2;
          min[d] = Math.max(0, c - WINDOW / 2);
          max[d] = Math.min(shape[d] - 1, min[d] + WINDOW - 1);
        }
      }
    }
    Plane plane = new Plane(axis, min, max);
    float[] boundary = plane.boundary(s.setup());
    long[] segmentation = plane.labels(s.outputContainer(), s.outputDataset());
    long[] truth = plane.labels(s.truthContainer(), s.groundTruth());
    int scale = SlicePicture.scaleFor(Math.max(plane.width(), plane.height()), 240);
    return split
        ? SlicePicture.render(plane, boundary, segmentation, truth, label, s.blockShape(), scale)
        : SlicePicture.render(plane, boundary, truth, segmentation, label, s.blockShape(), scale);
  }

  /** A memory-order box {@code {min..., max...}} as the configuration writes it. */
  private String box(long[] box) {
    if (box == null) {
      return "–";
    }
    long[] min = axes.toFile(Arrays.copyOfRange(box, 0, 3));
    long[] max = axes.toFile(Arrays.copyOfRange(box, 3, 6));
    return Arrays.toString(min) + " – " + Arrays.toString(max);
  }

  private void decisions(ReportPage page) {
    page.heading("Least certain decisions of the solve");
    List<SolveDecision> decisions = DecisionsFile.read(work.ledger(Stage.SOLVE));
    if (decisions.isEmpty()) {
      page.paragraph("The solve made no decision across block faces (or this run's solve"
          + " predates this record).");
      return;
    }
    page.paragraph("Pairs of pieces from neighbouring blocks that the solve joined (same final"
        + " id) or kept apart, with the least support first: margin is the mean edge weight for"
        + " a join and its negation for a cut, so a small or negative margin is a likely merge"
        + " (join) or split (cut) error. Position: the middle of the voxel pairs across the face"
        + " that carry the two final ids, in " + axes + " order.");
    List<List<String>> rows = new ArrayList<>();
    int rank = 1;
    for (SolveDecision d : decisions) {
      long[] at = DecisionPositions.of(grid.face(d.face()), d, s.outputContainer(),
          s.outputDataset());
      rows.add(List.of(String.valueOf(rank++), d.joined() ? "join" : "cut",
          fixed(d.margin(), 3), String.valueOf(d.voxelEdges()),
          d.joined() ? String.valueOf(d.finalA()) : d.finalA() + " | " + d.finalB(),
          Arrays.toString(axes.toFile(at)), faceText(grid.face(d.face()))));
    }
    page.table(List.of("rank", "decision", "margin", "voxel edges", "final ids",
        "position (" + axes + ")", "face"), rows);
  }

  private String faceText(Face face) {
    return face.index() + " (" + letter(face.axis()) + " = " + face.position() + ")";
  }

  private static String fixed(double value, int digits) {
    return String.format(Locale.ROOT, "%." + digits + "f", value);
  }

  private static String captured(java.util.function.Consumer<PrintStream> print) {
    ByteArrayOutputStream bytes = new ByteArrayOutputStream();
    try (PrintStream out = new PrintStream(bytes, true, StandardCharsets.UTF_8)) {
      print.accept(out);
    }
    return bytes.toString(StandardCharsets.UTF_8);
  }
}
