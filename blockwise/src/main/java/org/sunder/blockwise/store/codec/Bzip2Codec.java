package org.sunder.blockwise.store.codec;

import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import org.apache.commons.compress.compressors.bzip2.BZip2CompressorInputStream;
import org.apache.commons.compress.compressors.bzip2.BZip2CompressorOutputStream;

/** bzip2 through Apache Commons Compress; reads concatenated streams. */
final class Bzip2Codec extends StreamCodec {
  private final int blockSize;

  Bzip2Codec(int blockSize) {
    this.blockSize = blockSize;
  }

  @Override
  OutputStream compressing(OutputStream sink) throws IOException {
    return new BZip2CompressorOutputStream(sink, blockSize);
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
