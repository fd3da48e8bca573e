package org.sunder.blockwise.store.codec;

import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import org.tukaani.xz.LZMA2Options;
import org.tukaani.xz.UnsupportedOptionsException;
import org.tukaani.xz.XZ;
import org.tukaani.xz.XZInputStream;
import org.tukaani.xz.XZOutputStream;

/**
 * The .xz container with LZMA2 (XZ for Java), the format of N5's {@code xz} and of numcodecs'
 * {@code lzma} with its default {@code format=1} (FORMAT_XZ); written with a CRC64 check.
 */
final class XzCodec extends StreamCodec {
  private final int preset;

  XzCodec(int preset) {
    this.preset = preset;
  }

  @Override
  OutputStream compressing(OutputStream sink) throws IOException {
    try {
      return new XZOutputStream(sink, new LZMA2Options(preset), XZ.CHECK_CRC64);
    } catch (UnsupportedOptionsException e) {
      throw new IOException("xz preset " + preset + " is not supported", e);
    }
  }

  @Override
  InputStream decompressing(InputStream source) throws IOException {
    return new XZInputStream(source);
  }

  @Override
  String name() {
    return "xz";
  }
}
