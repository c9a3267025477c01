package org.rungs.validation.recovery;

import java.util.List;

/**
 * What one replication gave.
 *
 * @param replication 0-based index
 * @param estimates   one per quantity present in both the truth and the fit, in the truth's order
 * @param unmatched   names of true values the fit has no draws of (e.g. the reported means)
 */
public record ReplicationEstimates(int replication, List<QuantityEstimate> estimates, List<String> unmatched) {

    public ReplicationEstimates {
        estimates = List.copyOf(estimates);
        unmatched = List.copyOf(unmatched);
    }

    /** Whether the fit failed the convergence rule of MODEL.md section 7 for any compared quantity. */
    public boolean nonConverged() {
        return estimates.stream().anyMatch(QuantityEstimate::flagged);
    }
}
