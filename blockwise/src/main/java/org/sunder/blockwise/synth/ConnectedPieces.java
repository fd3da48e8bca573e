package org.sunder.blockwise.synth;

import java.util.Arrays;

/**
 * Makes every label one 6-connected object: splits each label into its connected pieces, lets
 * pieces smaller than a minimum join the neighbouring piece they share most faces with (ties:
 * the earlier piece), or become background when they touch none and background is allowed, and
 * numbers the final objects 1.. in order of their first voxel. {@code O(n)} besides the small
 * pieces' neighbour counts.
 */
final class ConnectedPieces {
  private final int nx;
  private final int ny;
  private final int nz;
  private final int[] piece;
  private int[] pieceSize;
  private int[] pieceSeed;
  private int[] pieceObject;
  private int pieces;
  private int[] queue;

  /** The final labels (0 = background) and the original object of each final label. */
  record Result(long[] labels, int[] objectOfLabel) {}

  private ConnectedPieces(int nx, int ny, int nz) {
    this.nx = nx;
    this.ny = ny;
    this.nz = nz;
    this.piece = new int[nx * ny * nz];
    this.queue = new int[64];
  }

  static Result of(int[] objectLabel, int nx, int ny, int nz, int minVoxels,
      boolean backgroundAllowed) {
    ConnectedPieces c = new ConnectedPieces(nx, ny, nz);
    c.findPieces(objectLabel);
    c.absorbSmall(minVoxels, backgroundAllowed);
    return c.numbered();
  }

  private void findPieces(int[] objectLabel) {
    pieceSize = new int[16];
    pieceSeed = new int[16];
    pieceObject = new int[16];
    for (int i = 0; i < piece.length; i++) {
      if (objectLabel[i] != 0 && piece[i] == 0) {
        int id = ++pieces;
        ensure(id);
        pieceSeed[id] = i;
        pieceObject[id] = objectLabel[i];
        pieceSize[id] = flood(i, objectLabel, id);
      }
    }
  }

  /** Marks the 6-connected voxels of {@code start}'s object; returns how many. */
  private int flood(int start, int[] objectLabel, int id) {
    int object = objectLabel[start];
    int head = 0;
    int tail = 0;
    piece[start] = id;
    queue = push(queue, tail++, start);
    int[] around = new int[6];
    while (head < tail) {
      int i = queue[head++];
      neighbours(i, around);
      for (int k = 0; k < 6; k++) {
        int j = around[k];
        if (j >= 0 && piece[j] == 0 && objectLabel[j] == object) {
          piece[j] = id;
          queue = push(queue, tail++, j);
        }
      }
    }
    return tail;
  }

  private void absorbSmall(int minVoxels, boolean backgroundAllowed) {
    for (int id = 1; id <= pieces; id++) {
      if (pieceSize[id] == 0 || pieceSize[id] >= minVoxels) {
        continue;
      }
      int count = collect(id);
      int target = mostTouching(count, id);
      if (target == 0 && !backgroundAllowed) {
        restore(count, id);
        continue;
      }
      for (int q = 0; q < count; q++) {
        piece[queue[q]] = target;
      }
      if (target != 0) {
        pieceSize[target] += pieceSize[id];
      }
      pieceSize[id] = 0;
    }
  }

  /** Puts the voxels of piece {@code id} in the queue, marked with {@code -id}. */
  private int collect(int id) {
    int start = pieceSeed[id];
    int head = 0;
    int tail = 0;
    piece[start] = -id;
    queue = push(queue, tail++, start);
    while (head < tail) {
      int i = queue[head++];
      for (int k = 0; k < 6; k++) {
        int j = neighbour(i, k);
        if (j >= 0 && piece[j] == id) {
          piece[j] = -id;
          queue = push(queue, tail++, j);
        }
      }
    }
    return tail;
  }

  private int mostTouching(int count, int id) {
    int[] ids = new int[8];
    int[] faces = new int[8];
    int distinct = 0;
    for (int q = 0; q < count; q++) {
      for (int k = 0; k < 6; k++) {
        int j = neighbour(queue[q], k);
        int other = j < 0 ? 0 : piece[j];
        if (other <= 0) {
          continue;
        }
        int at = 0;
        while (at < distinct && ids[at] != other) {
          at++;
        }
        if (at == distinct) {
          if (distinct == ids.length) {
            ids = Arrays.copyOf(ids, distinct * 2);
            faces = Arrays.copyOf(faces, distinct * 2);
          }
          ids[distinct++] = other;
        }
        faces[at]++;
      }
    }
    int best = 0;
    int bestFaces = 0;
    for (int a = 0; a < distinct; a++) {
      if (faces[a] > bestFaces || (faces[a] == bestFaces && ids[a] < best)) {
        best = ids[a];
        bestFaces = faces[a];
      }
    }
    return best;
  }

  private void restore(int count, int id) {
    for (int q = 0; q < count; q++) {
      piece[queue[q]] = id;
    }
  }

  private Result numbered() {
    int[] finalOf = new int[pieces + 1];
    int[] objectOf = new int[pieces + 1];
    long[] labels = new long[piece.length];
    int next = 0;
    for (int i = 0; i < piece.length; i++) {
      int p = piece[i];
      if (p == 0) {
        continue;
      }
      if (finalOf[p] == 0) {
        finalOf[p] = ++next;
        objectOf[next] = pieceObject[p];
      }
      labels[i] = finalOf[p];
    }
    return new Result(labels, Arrays.copyOf(objectOf, next + 1));
  }

  private int neighbour(int i, int k) {
    int x = i % nx;
    int y = (i / nx) % ny;
    int z = i / (nx * ny);
    switch (k) {
      case 0: return x > 0 ? i - 1 : -1;
      case 1: return x < nx - 1 ? i + 1 : -1;
      case 2: return y > 0 ? i - nx : -1;
      case 3: return y < ny - 1 ? i + nx : -1;
      case 4: return z > 0 ? i - nx * ny : -1;
      default: return z < nz - 1 ? i + nx * ny : -1;
    }
  }

  /** The six face neighbours of voxel i, -1 where the volume ends. */
  private void neighbours(int i, int[] out) {
    int plane = nx * ny;
    int z = i / plane;
    int rest = i - z * plane;
    int y = rest / nx;
    int x = rest - y * nx;
    out[0] = x > 0 ? i - 1 : -1;
    out[1] = x < nx - 1 ? i + 1 : -1;
    out[2] = y > 0 ? i - nx : -1;
    out[3] = y < ny - 1 ? i + nx : -1;
    out[4] = z > 0 ? i - plane : -1;
    out[5] = z < nz - 1 ? i + plane : -1;
  }

  private void ensure(int id) {
    if (id >= pieceSize.length) {
      int n = pieceSize.length * 2;
      pieceSize = Arrays.copyOf(pieceSize, n);
      pieceSeed = Arrays.copyOf(pieceSeed, n);
      pieceObject = Arrays.copyOf(pieceObject, n);
    }
  }

  private static int[] push(int[] q, int at, int value) {
    int[] out = at < q.length ? q : Arrays.copyOf(q, q.length * 2);
    out[at] = value;
    return out;
  }
}
