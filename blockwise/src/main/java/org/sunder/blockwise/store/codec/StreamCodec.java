package org.sunder.blockwise.store.codec;

import java.io.ByteArrayInputStream;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import java.io.UncheckedIOException;

/**
 * A codec built on a compressing stream pair (gzip, bzip2, xz, lz4 block stream). Decoding
 * reads exactly the expected size and checks that the stream ends there.
 */
abstract class StreamCodec implements Codec {

  /** Wraps {@code sink} in the compressing stream for {@code length} bytes of input. */
  abstract OutputStream compressing(OutputStream sink, int length) throws IOException;

  /** Wraps {@code source} in the decompressing stream. */
  abstract InputStream decompressing(InputStream source) throws IOException;

  /** The codec's name for messages. */
  abstract String name();

  @Override
  public byte[] encode(byte[] data) {
    ByteArrayOutputStream sink = new ByteArrayOutputStream(data.length / 2 + 64);
    try (OutputStream out = compressing(sink, data.length)) {
      out.write(data);
    } catch (IOException e) {
      throw new UncheckedIOException("in-memory " + name() + " compression failed", e);
    }
    return sink.toByteArray();
  }

  @Override
  public byte[] decode(byte[] source, int offset, int length, int decodedSize)
      throws IOException {
    try (InputStream in = decompressing(new ByteArrayInputStream(source, offset, length))) {
      byte[] out = in.readNBytes(decodedSize);
      if (out.length != decodedSize) {
        throw new IOException(name() + " data ends after " + out.length
            + " decompressed bytes, expected " + decodedSize);
      }
      if (in.read() != -1) {
        throw new IOException(name() + " data decompresses to more than the expected "
            + decodedSize + " bytes");
      }
      return out;
    } catch (IOException e) {
      throw e;
    } catch (RuntimeException e) {
      throw new IOException(name() + " data is corrupt: " + e.getMessage(), e);
    }
  }
}
