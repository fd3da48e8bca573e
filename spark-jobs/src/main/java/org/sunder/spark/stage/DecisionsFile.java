package org.sunder.spark.stage;

import com.fasterxml.jackson.core.type.TypeReference;
import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.files.AtomicWrites;
import org.sunder.spark.workdir.StageLedger;
import org.sunder.stitching.solve.SolveDecision;

/**
 * The solve's least certain decisions ({@link org.sunder.stitching.solve.SolveDecisions}), kept as
 * {@value #NAME} beside the solve stage's record in the work dir, so the run report can list
 * them without redoing the solve. Cleared with the solve's records.
 */
public final class DecisionsFile {
  /** The file name in the solve stage's folder. */
  public static final String NAME = "least-certain.json";
  /** Joins and cuts kept, each. */
  public static final int PER_KIND = 12;
  /** Fewest voxel edges for a pair to count as a contact. */
  public static final long MIN_VOXEL_EDGES = 4;

  private static final ObjectMapper JSON = new ObjectMapper()
      .enable(SerializationFeature.INDENT_OUTPUT)
      .disable(DeserializationFeature.FAIL_ON_UNKNOWN_PROPERTIES);

  private DecisionsFile() {}

  public static void write(StageLedger solveLedger, List<SolveDecision> decisions) {
    try {
      AtomicWrites.write(solveLedger.dir().resolve(NAME), ByteBuffer.wrap(JSON.writeValueAsBytes(decisions)));
    } catch (IOException e) {
      throw new SunderException(ErrorKind.INTERNAL, "cannot encode the solve's decisions: " + e, e);
    }
  }

  /** The recorded decisions; empty when the solve recorded none (a run before this file). */
  public static List<SolveDecision> read(StageLedger solveLedger) {
    Path file = solveLedger.dir().resolve(NAME);
    if (!Files.isRegularFile(file)) {
      return List.of();
    }
    try {
      return JSON.readValue(file.toFile(), new TypeReference<List<SolveDecision>>() {});
    } catch (IOException e) {
      throw new SunderException(ErrorKind.CONFLICT, "cannot read " + file + ": " + e, e);
    }
  }
}
