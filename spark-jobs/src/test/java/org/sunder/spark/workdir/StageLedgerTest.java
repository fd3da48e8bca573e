package org.sunder.spark.workdir;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.BitSet;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.spark.workdir.Stage;

class StageLedgerTest {
  @Test
  void recordsAreListedAndReadBack(@TempDir Path dir) throws Exception {
    WorkDir work = new WorkDir(dir);
    StageLedger ledger = work.ledger(Stage.SEAMS);
    assertTrue(ledger.finished().isEmpty());
    ledger.record(3, new byte[] {1, 2});
    ledger.record(11, new byte[0]);
    Files.writeString(ledger.dir().resolve(".7.done.2x8kq0wz1m.tmp"), "half written");
    BitSet expected = new BitSet();
    expected.set(3);
    expected.set(11);
    assertEquals(expected, ledger.finished());
    assertArrayEquals(new byte[] {1, 2}, ledger.read(3));
    assertTrue(ledger.isFinished(11));
    assertFalse(ledger.isFinished(7));
  }

  @Test
  void clearFromDropsLaterStagesOnly(@TempDir Path dir) {
    WorkDir work = new WorkDir(dir);
    for (Stage stage : Stage.values()) {
      work.ledger(stage).record(0, new byte[] {(byte) stage.ordinal()});
    }
    work.clearFrom(Stage.SOLVE);
    assertTrue(work.ledger(Stage.PARTITION).isFinished(0));
    assertTrue(work.ledger(Stage.SEAMS).isFinished(0));
    assertFalse(work.ledger(Stage.SOLVE).isFinished(0));
    assertFalse(work.ledger(Stage.EVALUATE).isFinished(0));
  }
}
