package org.sunder.blockwise.store;

import java.nio.ByteOrder;

/** Byte order of multi-byte elements in stored chunks. N5 is always {@link #BIG}. */
public enum Endianness {
  LITTLE(ByteOrder.LITTLE_ENDIAN, '<'),
  BIG(ByteOrder.BIG_ENDIAN, '>');

  private final ByteOrder order;
  private final char numpyCode;

  Endianness(ByteOrder order, char numpyCode) {
    this.order = order;
    this.numpyCode = numpyCode;
  }

  /** The matching {@link ByteOrder}. */
  public ByteOrder byteOrder() {
    return order;
  }

  /** NumPy's byte-order character in a dtype string: {@code '<'} or {@code '>'}. */
  public char numpyCode() {
    return numpyCode;
  }
}
