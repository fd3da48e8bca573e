package org.sunder.spark.workdir;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.ObjectMapper;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.spark.workdir.Stage;

class ResumePlannerTest {
  private static final ObjectMapper JSON = new ObjectMapper();

  private static Manifest manifest(String input, String method, int bound, String truth)
      throws Exception {
    String config = "{\"input\":{\"container\":\"" + input + "\"},\"partition\":{\"method\":\""
        + method + "\"},\"solve\":{\"maxDriverEdges\":" + bound + "},\"evaluate\":{\"groundTruth\":\""
        + truth + "\"}}";
    var tree = JSON.readTree(config);
    return new Manifest(Manifest.TOOL, "1", "run", "h" + config.hashCode(), Map.of(
        "input", "" + tree.get("input").hashCode(),
        "partition", "" + tree.get("partition").hashCode(),
        "solve", "" + tree.get("solve").hashCode(),
        "evaluate", "" + tree.get("evaluate").hashCode()), tree, "fp", "input 10x20x30");
  }

  @Test
  void sameSettingsResumeEverything() throws Exception {
    ResumeDecision decision = ResumePlanner.decide(manifest("a", "mws", 5, "gt"),
        manifest("a", "mws", 5, "gt"), true, "/w");
    assertNull(decision.redoFrom());
    assertTrue(decision.notes().isEmpty());
  }

  @Test
  void laterStageChangesAreRedone() throws Exception {
    ResumeDecision solve = ResumePlanner.decide(manifest("a", "mws", 5, "gt"),
        manifest("a", "mws", 6, "gt"), false, "/w");
    assertEquals(Stage.SOLVE, solve.redoFrom());
    assertTrue(solve.notes().get(0).contains("solve.maxDriverEdges: 5 -> 6"), solve.notes().toString());
    ResumeDecision evaluate = ResumePlanner.decide(manifest("a", "mws", 5, "gt"),
        manifest("a", "mws", 5, "truth"), true, "/w");
    assertEquals(Stage.EVALUATE, evaluate.redoFrom());
  }

  @Test
  void earlyChangesAreRefusedNamingTheKey() throws Exception {
    SunderException e = assertThrows(SunderException.class, () -> ResumePlanner.decide(
        manifest("a", "mws", 5, "gt"), manifest("a", "mean", 5, "gt"), false, "/w"));
    assertEquals(ErrorKind.CONFLICT, e.kind());
    assertTrue(e.getMessage().contains("partition.method: \"mws\" -> \"mean\""), e.getMessage());
    assertTrue(e.getMessage().contains("--fresh"), e.getMessage());
  }

  @Test
  void solveChangeAfterRelabelIsRefused() throws Exception {
    SunderException e = assertThrows(SunderException.class, () -> ResumePlanner.decide(
        manifest("a", "mws", 5, "gt"), manifest("a", "mws", 6, "gt"), true, "/w"));
    assertTrue(e.getMessage().contains("relabel has already replaced"), e.getMessage());
  }

  @Test
  void changedInputDataIsRefused() throws Exception {
    Manifest before = manifest("a", "mws", 5, "gt");
    Manifest after = new Manifest(before.tool(), before.version(), before.runId(),
        before.configHash(), before.sectionHashes(), before.config(), "other", "input 10x20x31");
    SunderException e = assertThrows(SunderException.class,
        () -> ResumePlanner.decide(before, after, false, "/w"));
    assertTrue(e.getMessage().contains("input data changed: was input 10x20x30, now input 10x20x31"),
        e.getMessage());
  }
}
