package org.sunder.blockwise.store;

import java.io.Serializable;

/**
 * The value missing chunks read as, and the padding of Zarr border chunks.
 *
 * <p>An integer fill value is kept as its 64 bits ({@code uint64} 2^64-1 is {@code -1L}); a
 * floating-point one as a {@code double} (NaN and infinities allowed). {@link #undefined()} is
 * Zarr's {@code null}: it reads as zero. N5 has no fill value; it is always zero.
 *
 * @param kind whether the value is undefined, an integer or a floating-point number
 * @param integer the integer value (its bits for {@code uint64}); used when kind is INTEGER
 * @param real the floating-point value; used when kind is REAL
 */
public record FillValue(Kind kind, long integer, double real) implements Serializable {

  /** What a fill value holds. */
  public enum Kind { UNDEFINED, INTEGER, REAL }

  private static final FillValue ZERO = new FillValue(Kind.INTEGER, 0L, 0.0);
  private static final FillValue UNDEFINED = new FillValue(Kind.UNDEFINED, 0L, 0.0);

  /** Zero, the default. */
  public static FillValue zero() {
    return ZERO;
  }

  /** Zarr's {@code null}: no value given; reads as zero. */
  public static FillValue undefined() {
    return UNDEFINED;
  }

  /** An integer fill value (for unsigned 64-bit types, the bits of the value). */
  public static FillValue ofInteger(long value) {
    return new FillValue(Kind.INTEGER, value, value);
  }

  /** A floating-point fill value; NaN and infinities allowed. */
  public static FillValue ofReal(double value) {
    return new FillValue(Kind.REAL, (long) value, value);
  }

  /** This value as the 64 bits of an integer element (undefined reads as 0). */
  public long asLong() {
    return kind == Kind.REAL ? (long) real : integer;
  }

  /** This value as a floating-point element (undefined reads as 0). */
  public double asDouble() {
    return switch (kind) {
      case REAL -> real;
      case INTEGER -> (double) integer;
      case UNDEFINED -> 0.0;
    };
  }

  /** Whether this value is zero in every type, so fresh arrays need no filling. */
  public boolean isZero() {
    return kind == Kind.UNDEFINED
        || (kind == Kind.INTEGER && integer == 0)
        || (kind == Kind.REAL && Double.doubleToRawLongBits(real) == 0L);
  }
}
