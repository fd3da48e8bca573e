package org.sunder.blockwise.store.bench;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;
import java.util.Random;
import java.util.stream.Stream;
import net.imglib2.FinalInterval;
import net.imglib2.img.array.ArrayImg;
import net.imglib2.img.array.ArrayImgs;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.DataType;
import org.sunder.blockwise.store.Dataset;
import org.sunder.blockwise.store.DatasetSpec;
import org.sunder.blockwise.store.StorageFormat;
import org.sunder.blockwise.store.codec.CodecSpec;

/**
 * Write and read throughput of whole volumes through {@link Dataset} per codec, single-threaded,
 * on a 256x256x256 uint8 volume and a 3x128x256x256 float32 one (zyx + channel; memory order
 * [256, 256, 128, 3]) of smooth value noise, in a Zarr container. The baseline is reading the
 * same uncompressed bytes, one plain file per chunk, timed alternately with each codec in the
 * same run (best of {@value #REPEATS}). Files are hot in the page cache, so this measures codec
 * and copy cost, not the disk. MB = 10^6 bytes of voxel data.
 *
 * <p>Usage: {@code StorageBenchmark [work-dir]} (default: a temporary directory, deleted after).
 */
public final class StorageBenchmark {
  private static final int REPEATS = 4;

  private StorageBenchmark() {}

  public static void main(String[] args) throws IOException {
    Path work = args.length > 0 ? Path.of(args[0]) : Files.createTempDirectory("sunder-bench");
    try {
      List<CodecSpec> codecs = List.of(CodecSpec.raw(), CodecSpec.gzip(1), CodecSpec.zstd(3),
          CodecSpec.lz4(), CodecSpec.blosc("lz4", 5, CodecSpec.BYTE_SHUFFLE));
      Random random = new Random(13);
      long[] labelsShape = {256, 256, 256};
      byte[] bytes = valueNoiseBytes(labelsShape, random);
      run(work.resolve("uint8"), "uint8 256x256x256, chunks 64^3",
          ArrayImgs.unsignedBytes(bytes, labelsShape), DataType.UINT8, new int[] {64, 64, 64},
          codecs);
      long[] affinityShape = {256, 256, 128, 3};
      float[] floats = valueNoiseFloats(affinityShape, random);
      run(work.resolve("float32"), "float32 3x128x256x256, chunks 3x64x64x64",
          ArrayImgs.floats(floats, affinityShape), DataType.FLOAT32, new int[] {64, 64, 64, 3},
          codecs);
    } finally {
      if (args.length == 0) {
        deleteTree(work);
      }
    }
  }

  private static void run(Path dir, String title, ArrayImg<?, ?> volume, DataType type,
      int[] chunks, List<CodecSpec> codecs) throws IOException {
    long[] shape = volume.dimensionsAsLongArray();
    double megabytes = volume.size() * type.bytes() / 1e6;
    PlainFiles plain = PlainFiles.write(dir.resolve("plain"), volume.size() * type.bytes(),
        chunkBytes(type, chunks));
    System.out.printf(Locale.ROOT, "%n%s (%.1f MB)%n", title, megabytes);
    System.out.printf(Locale.ROOT, "%-32s %10s %10s %10s %11s %11s%n", "codec", "write MB/s",
        "read MB/s", "stored %", "plain MB/s", "read/plain");
    for (CodecSpec codec : codecs) {
      Container container = Container.create(dir.resolve(codec.name()), StorageFormat.ZARR);
      double write = Double.MAX_VALUE;
      double read = Double.MAX_VALUE;
      double baseline = Double.MAX_VALUE;
      for (int r = 0; r < REPEATS; r++) {
        baseline = Math.min(baseline, plain.readSeconds());
        Dataset dataset = container.createDataset("v" + r,
            DatasetSpec.of(shape, chunks, type).withCodec(codec));
        long t0 = System.nanoTime();
        dataset.write(volume, new long[shape.length]);
        long t1 = System.nanoTime();
        ArrayImg<?, ?> back = dataset.read(new FinalInterval(shape));
        long t2 = System.nanoTime();
        if (back.size() != volume.size()) {
          throw new IllegalStateException("read back " + back.size() + " voxels");
        }
        write = Math.min(write, (t1 - t0) / 1e9);
        read = Math.min(read, (t2 - t1) / 1e9);
      }
      double stored = directoryBytes(dir.resolve(codec.name()).resolve("v0"));
      System.out.printf(Locale.ROOT, "%-32s %10.0f %10.0f %10.1f %11.0f %11.2f%n", codec,
          megabytes / write, megabytes / read, 100 * stored / (megabytes * 1e6),
          megabytes / baseline, baseline / read);
    }
  }

  private static long chunkBytes(DataType type, int[] chunks) {
    long bytes = type.bytes();
    for (int c : chunks) {
      bytes *= c;
    }
    return bytes;
  }

  /** The uncompressed bytes of a volume as one plain file per chunk: the baseline. */
  private record PlainFiles(Path dir, int files) {
    static PlainFiles write(Path dir, long totalBytes, long chunkBytes) throws IOException {
      Files.createDirectories(dir);
      int files = (int) ((totalBytes + chunkBytes - 1) / chunkBytes);
      byte[] content = new byte[(int) chunkBytes];
      new Random(7).nextBytes(content);
      for (int f = 0; f < files; f++) {
        Files.write(dir.resolve("c" + f), content);
      }
      return new PlainFiles(dir, files);
    }

    /** Seconds to read every file once. */
    double readSeconds() throws IOException {
      long t0 = System.nanoTime();
      for (int f = 0; f < files; f++) {
        Files.readAllBytes(dir.resolve("c" + f));
      }
      return (System.nanoTime() - t0) / 1e9;
    }
  }

  /** Trilinear value noise on a grid of spacing 16, quantized to 0..250. */
  private static byte[] valueNoiseBytes(long[] shape, Random random) {
    float[] noise = valueNoise(shape, random, 16);
    byte[] out = new byte[noise.length];
    for (int i = 0; i < out.length; i++) {
      out[i] = (byte) Math.min(255, Math.max(0, (int) (noise[i] * 250)));
    }
    return out;
  }

  /** Value noise in [0, 1], one field per channel (last dimension), like smooth affinities. */
  private static float[] valueNoiseFloats(long[] shape, Random random) {
    return valueNoise(shape, random, 12);
  }

  /** Value noise over the first three dimensions; further dimensions get independent fields. */
  private static float[] valueNoise(long[] shape, Random random, int spacing) {
    int nx = (int) shape[0];
    int ny = (int) shape[1];
    int nz = (int) shape[2];
    int channels = shape.length > 3 ? (int) shape[3] : 1;
    int gx = nx / spacing + 2;
    int gy = ny / spacing + 2;
    int gz = nz / spacing + 2;
    float[] out = new float[nx * ny * nz * channels];
    for (int c = 0; c < channels; c++) {
      float[] grid = new float[gx * gy * gz];
      for (int i = 0; i < grid.length; i++) {
        grid[i] = random.nextFloat();
      }
      int base = c * nx * ny * nz;
      for (int z = 0; z < nz; z++) {
        int iz = z / spacing;
        float fz = (z % spacing) / (float) spacing;
        for (int y = 0; y < ny; y++) {
          int iy = y / spacing;
          float fy = (y % spacing) / (float) spacing;
          for (int x = 0; x < nx; x++) {
            int ix = x / spacing;
            float fx = (x % spacing) / (float) spacing;
            out[base + x + nx * (y + ny * z)] = trilinear(grid, gx, gy, ix, iy, iz, fx, fy, fz);
          }
        }
      }
    }
    return out;
  }

  private static float trilinear(float[] g, int gx, int gy, int ix, int iy, int iz, float fx,
      float fy, float fz) {
    int i000 = ix + gx * (iy + gy * iz);
    int dy = gx;
    int dz = gx * gy;
    float c00 = g[i000] * (1 - fx) + g[i000 + 1] * fx;
    float c10 = g[i000 + dy] * (1 - fx) + g[i000 + dy + 1] * fx;
    float c01 = g[i000 + dz] * (1 - fx) + g[i000 + dz + 1] * fx;
    float c11 = g[i000 + dy + dz] * (1 - fx) + g[i000 + dy + dz + 1] * fx;
    float c0 = c00 * (1 - fy) + c10 * fy;
    float c1 = c01 * (1 - fy) + c11 * fy;
    return c0 * (1 - fz) + c1 * fz;
  }

  private static double directoryBytes(Path dir) throws IOException {
    try (Stream<Path> files = Files.walk(dir)) {
      return files.filter(Files::isRegularFile).mapToLong(p -> p.toFile().length()).sum();
    }
  }

  private static void deleteTree(Path root) throws IOException {
    try (Stream<Path> files = Files.walk(root)) {
      for (Path p : files.sorted(Comparator.reverseOrder()).toList()) {
        Files.delete(p);
      }
    }
  }
}
