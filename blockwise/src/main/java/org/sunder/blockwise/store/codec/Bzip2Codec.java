package org.sunder.blockwise.store.codec;

import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import org.apache.commons.compress.compressors.bzip2.BZip2CompressorInputStream;
import org.apache.commons.compress.compressors.bzip2.BZip2CompressorOutputStream;

/**
 * bzip2 through Apache Commons Compress; reads concatenated streams. A chunk smaller than the
 * configured block size is written with the smallest block size that holds it (the same
 * output a larger block would give, but far less memory to encode and decode).
 */
public final class Bzip2Codec extends StreamCodec {
  private final int blockSize;

  public Bzip2Codec(int blockSize) {
    this.blockSize = blockSize;
  }

  @Override
  OutputStream compressing(OutputStream sink, int length) throws IOException {
    int needed = (int) Math.max(1, Math.min(blockSize, (length + 99_999L) / 100_000));
    return new BZip2CompressorOutputStream(sink, needed);
  }

  @Override
  InputStream decompressing(InputStream source) throws IOException {
    return new BZip2CompressorInputStream(source, true);
  }

  @Override
  String name() {
    return "bzip2";
  }
}
