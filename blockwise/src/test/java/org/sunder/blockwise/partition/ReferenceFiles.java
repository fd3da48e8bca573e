package org.sunder.blockwise.partition;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.file.Files;
import java.nio.file.Path;

/** Raw little-endian array files for exchanging test data with Python reference scripts. */
public final class ReferenceFiles {
  private ReferenceFiles() {}

  public static Path write(Path dir, String name, double[] values) {
    ByteBuffer buffer = ByteBuffer.allocate(values.length * 8).order(ByteOrder.LITTLE_ENDIAN);
    buffer.asDoubleBuffer().put(values);
    return write(dir, name, buffer.array());
  }

  public static Path write(Path dir, String name, float[] values) {
    ByteBuffer buffer = ByteBuffer.allocate(values.length * 4).order(ByteOrder.LITTLE_ENDIAN);
    buffer.asFloatBuffer().put(values);
    return write(dir, name, buffer.array());
  }

  public static Path write(Path dir, String name, int[] values) {
    ByteBuffer buffer = ByteBuffer.allocate(values.length * 4).order(ByteOrder.LITTLE_ENDIAN);
    buffer.asIntBuffer().put(values);
    return write(dir, name, buffer.array());
  }

  public static Path write(Path dir, String name, byte[] bytes) {
    try {
      return Files.write(dir.resolve(name), bytes);
    } catch (IOException e) {
      throw new UncheckedIOException(e);
    }
  }

  public static double[] readDoubles(Path file) {
    ByteBuffer buffer = ByteBuffer.wrap(readAll(file)).order(ByteOrder.LITTLE_ENDIAN);
    double[] values = new double[buffer.remaining() / 8];
    buffer.asDoubleBuffer().get(values);
    return values;
  }

  public static float[] readFloats(Path file) {
    ByteBuffer buffer = ByteBuffer.wrap(readAll(file)).order(ByteOrder.LITTLE_ENDIAN);
    float[] values = new float[buffer.remaining() / 4];
    buffer.asFloatBuffer().get(values);
    return values;
  }

  public static int[] readInts(Path file) {
    ByteBuffer buffer = ByteBuffer.wrap(readAll(file)).order(ByteOrder.LITTLE_ENDIAN);
    int[] values = new int[buffer.remaining() / 4];
    buffer.asIntBuffer().get(values);
    return values;
  }

  private static byte[] readAll(Path file) {
    try {
      return Files.readAllBytes(file);
    } catch (IOException e) {
      throw new UncheckedIOException(e);
    }
  }
}
