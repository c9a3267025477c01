package org.rungs.sampler;

import org.apache.commons.rng.UniformRandomProvider;
import org.rungs.priors.Priors;

/**
 * Metropolis steps of the thresholds given the latent levels, each moving the latent values with
 * the threshold: when threshold k of a group moves, the values of the two categories it separates
 * are mapped linearly onto their new intervals (z -> A + s z; a shift for an end category, whose
 * other bound is infinite) and every other value of the group moves with the level. The map is a
 * bijection between the old and the new augmented states, so the step is a Metropolis-Hastings
 * move on (thresholds, levels, latent values) whose ratio carries the Jacobian s^n of each
 * rescaled category (J. S. Liu and C. Sabatti (2000), Generalised Gibbs sampler and multigrid
 * Monte Carlo for Bayesian computation, Biometrika 87, 353-369, section 3; the move of one
 * threshold with its latent values as in their ordinal example). Every answer stays in its
 * category, so nothing but the normal density of the latent values changes, and that change
 * is a function of a few sums per (group, category) cell ({@link LatentCells}): a step costs
 * O(1) whatever the number of respondents, where a step with the latent values held fixed
 * would be confined between the nearest latent values and slow down as the sample grows
 * (Cowles 1996, section 2).
 *
 * <p>The same holds with the coarse class (a coarse responder's value stays in its intended
 * category, whose rounding weight is unchanged) and under number attraction (accepted and rejected
 * draws keep their categories and so their acceptance factors). Proposals, ridge, end-gap
 * steps and adaptation are those of {@link ThresholdMoves}. It runs after the latent levels and
 * before the conjugate level update, which reads the transformed sums.
 */
final class ThresholdRescaleUpdate extends ThresholdMoves {
    /** Passes per sweep: each step costs O(1), so several passes cost nothing next to the latent draws. */
    private static final int PASSES = 4;
    private final LatentCells cells;
    private final int m;
    /** Per group, the maps of the pending proposal for category k-1 (low) and k (high). */
    private final double[] lowShift;
    private final double[] lowScale;
    private final double[] highShift;
    private final double[] highScale;

    private ThresholdRescaleUpdate(ChainState state, int[] start, Priors priors, UniformRandomProvider rng) {
        super(state, start, priors, rng);
        this.cells = state.cells;
        this.m = state.categories;
        this.lowShift = new double[state.groups];
        this.lowScale = new double[state.groups];
        this.highShift = new double[state.groups];
        this.highScale = new double[state.groups];
    }

    static ThresholdRescaleUpdate of(ChainState state, int[] start, Priors priors, UniformRandomProvider rng) {
        return new ThresholdRescaleUpdate(state, start, priors, rng);
    }

    @Override
    public void update(boolean adapt) {
        cells.prepare(state.level.coefficient);
        passes(PASSES, adapt);
        cells.finish(state.level, m);
    }

    /**
     * The change of the log density of the latent values of block b, with the Jacobian, when
     * threshold k moves by delta relative to the level and the values move as in the class comment.
     */
    @Override
    double logLikelihoodChange(int b, int k, double delta) {
        ChainState s = state;
        double[] t = s.thresholds;
        double share = delta / cuts;
        double change = 0;
        for (int g = firstGroup(b); g <= lastGroup(b); g++) {
            int row = g * stride;
            double below = t[row + k - 1];
            double cut = t[row + k];
            double above = t[row + k + 1];
            double moved = cut + delta - share;
            if (k == 1) {
                lowScale[g] = 1;
                lowShift[g] = moved - cut;
            } else {
                lowScale[g] = (cut + delta - below) / (cut - below);
                lowShift[g] = below - share - lowScale[g] * below;
            }
            if (k == cuts) {
                highScale[g] = 1;
                highShift[g] = moved - cut;
            } else {
                highScale[g] = (above - cut - delta) / (above - cut);
                highShift[g] = moved - highScale[g] * cut;
            }
            double alpha = s.level.intercept[g];
            int low = g * m + k - 1;
            double squares = cells.squaresChange(low, alpha, alpha - share, lowShift[g], lowScale[g])
                    + cells.squaresChange(low + 1, alpha, alpha - share, highShift[g], highScale[g]);
            change += -0.5 * squares + cells.n(low) * Math.log(lowScale[g]) + cells.n(low + 1) * Math.log(highScale[g]);
        }
        return change;
    }

    /** Maps the sums of every cell of the block's groups as the accepted step moved the values. */
    @Override
    void accepted(int b, int k, double delta) {
        double share = delta / cuts;
        for (int g = firstGroup(b); g <= lastGroup(b); g++) {
            for (int j = 0; j < m; j++) {
                int c = g * m + j;
                if (j == k - 1) {
                    cells.transform(c, lowShift[g], lowScale[g]);
                } else if (j == k) {
                    cells.transform(c, highShift[g], highScale[g]);
                } else {
                    cells.transform(c, -share, 1);
                }
            }
        }
    }
}
