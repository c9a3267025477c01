package org.rungs.validation.calibration;

/**
 * One parameter's result in one replication.
 *
 * @param parameter the engine's name, or {@code intended_mean.<label>} for a derived quantity
 * @param truth     the value drawn from the prior (or computed from it)
 * @param rank      draws below the truth among {@code draws}, 0..draws
 * @param draws     L, the thinned draws
 * @param rhat      rank-normalised split R-hat of the fit
 * @param essBulk   bulk effective sample size of the fit
 * @param essTail   tail effective sample size of the fit
 * @param flagged   whether the convergence rule of MODEL.md section 7 flags the parameter
 */
public record ParameterRank(String parameter, double truth, int rank, int draws, double rhat, double essBulk,
        double essTail, boolean flagged) {
}
