package org.sunder.stitching.task;

import org.sunder.blockwise.metrics.SeamTally;
import org.sunder.stitching.scores.SeamAuditResult;

/**
 * The seam audit task's result: the {@link SeamTally} of one or more faces. Tallies merge in
 * any order; the merge of all faces gives the audit. Two counts per plane and one entry per
 * (plane, object) met.
 *
 * @param counts the tally (merged into in place)
 */
public record SeamAuditTally(SeamTally counts) {
  /** Adds {@code other}'s counts to this tally's and returns this tally. */
  public SeamAuditTally merge(SeamAuditTally other) {
    counts.merge(other.counts);
    return this;
  }

  /** The audit of the faces counted. */
  public SeamAuditResult audit() {
    return new SeamAuditResult(counts.audit());
  }
}
