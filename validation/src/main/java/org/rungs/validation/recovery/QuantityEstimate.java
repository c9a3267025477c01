package org.rungs.validation.recovery;

/**
 * One quantity of one replication: its true value and the posterior summary the fit gave it.
 *
 * @param quantity the name shared by the simulator's truth and the fit's (or derived) draws
 * @param truth    the true value, on the engine's internal scale
 * @param mean     posterior mean
 * @param q05      5% posterior quantile (type 7 over the pooled chains)
 * @param q25      25% quantile
 * @param q75      75% quantile
 * @param q95      95% quantile
 * @param flagged  whether this quantity fails the convergence rule of MODEL.md section 7
 */
public record QuantityEstimate(String quantity, double truth, double mean, double q05, double q25, double q75,
        double q95, boolean flagged) {

    /** Whether the central 50% interval [q25, q75] holds the truth. */
    public boolean covered50() {
        return q25 <= truth && truth <= q75;
    }

    /** Whether the central 90% interval [q05, q95] holds the truth. */
    public boolean covered90() {
        return q05 <= truth && truth <= q95;
    }
}
