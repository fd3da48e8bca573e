package org.sunder.blockwise.synth;

/** What a synthetic object was drawn as. */
public enum ObjectKind {
  /** A thin, long, tortuous, branching tube of varying radius. */
  FIBRE,
  /** A compact ellipsoid. */
  CELL,
  /** A large sphere that fibres wrap around. */
  BODY
}
