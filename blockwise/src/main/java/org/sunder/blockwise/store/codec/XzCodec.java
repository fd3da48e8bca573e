package org.sunder.blockwise.store.codec;

import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import org.tukaani.xz.BasicArrayCache;
import org.tukaani.xz.LZMA2Options;
import org.tukaani.xz.UnsupportedOptionsException;
import org.tukaani.xz.XZ;
import org.tukaani.xz.XZInputStream;
import org.tukaani.xz.XZOutputStream;

/**
 * The .xz container with LZMA2 (XZ for Java), the format of N5's {@code xz} and of numcodecs'
 * {@code lzma} with its default {@code format=1} (FORMAT_XZ); written with a CRC64 check. The
 * dictionary is capped at the chunk size (same output, less memory), and buffers are reused
 * through XZ for Java's {@link BasicArrayCache}.
 */
public final class XzCodec extends StreamCodec {

  private final int preset;

  public XzCodec(int preset) {
    this.preset = preset;
  }

  @Override
  OutputStream compressing(OutputStream sink, int length) throws IOException {
    try {
      LZMA2Options options = new LZMA2Options(preset);
      options.setDictSize(Math.max(LZMA2Options.DICT_SIZE_MIN,
          Math.min(options.getDictSize(), length)));
      return new XZOutputStream(sink, options, XZ.CHECK_CRC64, BasicArrayCache.getInstance());
    } catch (UnsupportedOptionsException e) {
      throw new IOException("xz preset " + preset + " is not supported", e);
    }
  }

  @Override
  InputStream decompressing(InputStream source) throws IOException {
    return new XZInputStream(source, -1, true, BasicArrayCache.getInstance());
  }

  @Override
  String name() {
    return "xz";
  }
}
