package org.rungs.validation.calibration;

import java.util.List;

/**
 * The ranks of one finished replication.
 *
 * @param replication 0-based index
 * @param ranks       one per calibrated quantity, in a fixed order
 */
public record ReplicationResult(int replication, List<ParameterRank> ranks) {

    public ReplicationResult {
        ranks = List.copyOf(ranks);
    }

    /** Whether any quantity failed the convergence rule of MODEL.md section 7. */
    public boolean nonConverged() {
        return ranks.stream().anyMatch(ParameterRank::flagged);
    }

    /** Whether the smallest bulk ESS is below the L draws kept: the thinned draws are then autocorrelated. */
    public boolean thinnedTooLittle() {
        return ranks.stream().anyMatch(r -> r.essBulk() < r.draws());
    }
}
