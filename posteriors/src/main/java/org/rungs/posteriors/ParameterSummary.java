package org.rungs.posteriors;

import java.util.ArrayList;
import java.util.List;
import java.util.Objects;

/**
 * Posterior summary and convergence diagnostics of one scalar parameter over {@code chains}
 * chains. {@code flagged} follows MODEL.md section 7 when built by {@link #of}: R-hat above
 * {@value #RHAT_LIMIT}, or bulk or tail ESS below {@value #MIN_ESS_PER_CHAIN} per chain. Undefined
 * (NaN) diagnostics of a constant parameter do not flag it; non-finite draws always do.
 * {@code rhatChance} is the chance that chains drawing from the posterior itself give an R-hat
 * at least {@code rhat} ({@link Convergence#rhatChance}; NaN where undefined); it flags nothing,
 * and {@link ConvergenceVerdict} reads it.
 */
public record ParameterSummary(String name, double mean, double sd, double q05, double q50, double q95,
        double rhat, double essBulk, double essTail, double mcseMean, double rhatChance, boolean flagged,
        int chains) {
    public static final double RHAT_LIMIT = 1.01;
    public static final double MIN_ESS_PER_CHAIN = 100;

    public ParameterSummary {
        Objects.requireNonNull(name, "name");
        if (chains < 1) {
            throw new IllegalArgumentException("a summary covers at least one chain, got " + chains);
        }
    }

    /** A summary whose {@code flagged} is set by the rule above. */
    public static ParameterSummary of(String name, double mean, double sd, double q05, double q50, double q95,
            double rhat, double essBulk, double essTail, double mcseMean, double rhatChance, int chains) {
        ParameterSummary unflagged = new ParameterSummary(name, mean, sd, q05, q50, q95, rhat, essBulk, essTail,
                mcseMean, rhatChance, false, chains);
        return unflagged.flagReasons().isEmpty() ? unflagged
                : new ParameterSummary(name, mean, sd, q05, q50, q95, rhat, essBulk, essTail, mcseMean, rhatChance,
                        true, chains);
    }

    /**
     * Why the rule flags this parameter: "non-finite draws", "rhat>1.01", "low ess_bulk",
     * "low ess_tail", or "too few draws" (bulk ESS undefined although the draws vary, which
     * happens for chains shorter than 6 iterations); empty when none applies.
     */
    public List<String> flagReasons() {
        List<String> reasons = new ArrayList<>(2);
        double minEss = MIN_ESS_PER_CHAIN * chains;
        // any infinite or NaN draw makes the mean non-finite
        if (!Double.isFinite(mean)) {
            reasons.add("non-finite draws");
        }
        if (rhat > RHAT_LIMIT) {
            reasons.add("rhat>1.01");
        }
        if (essBulk < minEss) {
            reasons.add("low ess_bulk");
        }
        if (essTail < minEss) {
            reasons.add("low ess_tail");
        }
        if (Double.isFinite(mean) && Double.isNaN(essBulk) && sd > 0) {
            reasons.add("too few draws");
        }
        return reasons;
    }

    /** "ok", or the reasons joined by ';' ("flagged" when the record was built flagged without one). */
    public String flag() {
        if (!flagged) {
            return "ok";
        }
        List<String> reasons = flagReasons();
        return reasons.isEmpty() ? "flagged" : String.join(";", reasons);
    }
}
