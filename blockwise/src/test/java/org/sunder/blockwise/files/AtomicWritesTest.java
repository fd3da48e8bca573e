package org.sunder.blockwise.files;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Random;
import java.util.stream.Collectors;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.StoreException;

/** The one atomic write: whole content or nothing, no temporaries left, typed failures. */
class AtomicWritesTest {

  @Test
  void writesPartsInOrderAndReplacesOldContent(@TempDir Path dir) throws IOException {
    Random random = new Random(13);
    Path target = dir.resolve("a/b/chunk");
    for (int round = 0; round < 20; round++) {
      byte[] head = new byte[random.nextInt(300)];
      byte[] tail = new byte[random.nextInt(5000)];
      random.nextBytes(head);
      random.nextBytes(tail);
      AtomicWrites.write(target, ByteBuffer.wrap(head), ByteBuffer.wrap(tail));
      byte[] expected = new byte[head.length + tail.length];
      System.arraycopy(head, 0, expected, 0, head.length);
      System.arraycopy(tail, 0, expected, head.length, tail.length);
      assertArrayEquals(expected, Files.readAllBytes(target), "round " + round);
      assertArrayEquals(expected, AtomicWrites.readIfExists(target), "round " + round);
    }
    assertEquals(List.of("chunk"), names(target.getParent()));
  }

  @Test
  void readIfExistsGivesNullForAMissingFile(@TempDir Path dir) {
    assertNull(AtomicWrites.readIfExists(dir.resolve("absent")));
  }

  @Test
  void aFailedWriteIsTypedNamesTheTargetAndLeavesNothing(@TempDir Path dir) throws IOException {
    Path target = dir.resolve("taken");
    Files.createDirectories(target.resolve("child"));
    StoreException e = assertThrows(StoreException.class,
        () -> AtomicWrites.write(target, ByteBuffer.wrap(new byte[] {1, 2, 3})));
    assertEquals(ErrorKind.STORAGE, e.kind());
    assertTrue(e.getMessage().contains(target.toString()), e.getMessage());
    assertEquals(List.of("taken"), names(dir));
  }

  @Test
  void temporaryNamesAreRecognisedAndTargetsAreNot() {
    assertTrue(AtomicWrites.isTemporary(".0.0.0.2x8kq0wz1m.tmp"));
    assertTrue(AtomicWrites.isTemporary(".7.done.a.tmp"));
    assertFalse(AtomicWrites.isTemporary("0.0.0"));
    assertFalse(AtomicWrites.isTemporary(".zarray"));
    assertFalse(AtomicWrites.isTemporary("7.done"));
    assertFalse(AtomicWrites.isTemporary(".7.done.UPPER.tmp"));
  }

  private static List<String> names(Path dir) throws IOException {
    try (Stream<Path> files = Files.list(dir)) {
      return files.map(p -> p.getFileName().toString()).sorted().collect(Collectors.toList());
    }
  }
}
