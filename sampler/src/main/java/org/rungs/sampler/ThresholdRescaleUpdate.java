package org.rungs.sampler;

import java.io.DataInput;
import java.io.DataOutput;
import java.io.IOException;
import org.apache.commons.rng.UniformRandomProvider;
import org.rungs.priors.HalfNormal;
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
 *
 * <p>In by-group mode a last step moves the spread tau_d of the group deviations non-centred:
 * tau_d and every deviation d[g,k] = c[g,k] - c[k] are multiplied by one factor, the latent
 * values following their categories as above. With d = tau_d u the prior of u does not depend on
 * tau_d, so the ratio is that of the latent values, the prior of tau_d and the Jacobian of the
 * step on log tau_d. A draw of tau_d given the deviations (centred, {@link ThresholdSpreadUpdate})
 * stalls when few groups or sparse categories leave the deviations free to shrink with tau_d
 * (Papaspiliopoulos, Roberts & Skold 2007, Statistical Science 22, 59-73); this step does not.
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
    /** The spread step: prior of tau_d, proposed thresholds, each cell's map, its scale and counter. */
    private final HalfNormal spreadPrior;
    private final double[] proposedRows;
    private final double[] cellShift;
    private final double[] cellScale;
    private double spreadLogScale = Math.log(0.1);
    private int spreadSteps;

    private ThresholdRescaleUpdate(ChainState state, int[] start, Priors priors, UniformRandomProvider rng) {
        super(state, start, priors, rng);
        this.spreadPrior = priors.thresholdSd();
        this.proposedRows = new double[state.groups * stride];
        this.cellShift = new double[state.groups * state.categories];
        this.cellScale = new double[state.groups * state.categories];
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
        if (state.byGroup) {
            spreadStep(adapt);
        }
        cells.finish(state.level, m);
    }

    /** The non-centred step of tau_d described in the class comment. */
    private void spreadStep(boolean adapt) {
        ChainState s = state;
        double step = Math.exp(spreadLogScale) * normal.sample();
        double factor = Math.exp(step);
        double change = spreadChange(factor);
        boolean accept = false;
        if (!Double.isNaN(change)) {
            double sd = s.thresholdSd;
            double logRatio = change + spreadPrior.logDensity(sd * factor) - spreadPrior.logDensity(sd) + step;
            accept = Math.log(rng.nextDouble()) < logRatio;
        }
        if (accept) {
            System.arraycopy(proposedRows, 0, s.thresholds, 0, s.thresholds.length);
            s.thresholdSd *= factor;
            for (int c = 0; c < cellShift.length; c++) {
                cells.transform(c, cellShift[c], cellScale[c]);
            }
        }
        if (adapt) {
            spreadLogScale += Math.pow(++spreadSteps, -0.6) * ((accept ? 1 : 0) - 0.44);
        }
    }

    /**
     * The change of the log density of every latent value, with the Jacobians, when every
     * deviation c[g,k] - c[k] is multiplied by factor; NaN when a group's thresholds would no
     * longer increase. Keeps the proposed thresholds and each cell's map.
     */
    double spreadChange(double factor) {
        ChainState s = state;
        double[] t = s.thresholds;
        for (int g = 0; g < s.groups; g++) {
            int row = g * stride;
            proposedRows[row] = t[row];
            proposedRows[row + m] = t[row + m];
            for (int k = 1; k <= cuts; k++) {
                proposedRows[row + k] = s.common[k] + factor * (t[row + k] - s.common[k]);
                if (!(proposedRows[row + k] > proposedRows[row + k - 1])) {
                    return Double.NaN;
                }
            }
        }
        double change = 0;
        for (int g = 0; g < s.groups; g++) {
            change += rowChange(g);
        }
        return change;
    }

    /**
     * The change of the log density of group g's latent values, with the Jacobian, when its
     * thresholds become those in {@link #proposedRows} and its level stays; keeps each cell's map.
     */
    private double rowChange(int g) {
        double[] t = state.thresholds;
        int row = g * stride;
        double alpha = state.level.intercept[g];
        double change = 0;
        for (int j = 0; j < m; j++) {
            int c = g * m + j;
            double lower = t[row + j];
            double upper = t[row + j + 1];
            double scale = 1;
            double shift;
            if (j == 0) {
                shift = proposedRows[row + 1] - upper;
            } else if (j == m - 1) {
                shift = proposedRows[row + j] - lower;
            } else {
                scale = (proposedRows[row + j + 1] - proposedRows[row + j]) / (upper - lower);
                shift = proposedRows[row + j] - scale * lower;
            }
            cellShift[c] = shift;
            cellScale[c] = scale;
            change += -0.5 * cells.squaresChange(c, alpha, alpha, shift, scale) + cells.n(c) * Math.log(scale);
        }
        return change;
    }

    @Override
    public void save(DataOutput out) throws IOException {
        super.save(out);
        Checkpointed.writeDouble(out, spreadLogScale);
        out.writeInt(spreadSteps);
    }

    @Override
    public void restore(DataInput in) throws IOException {
        super.restore(in);
        spreadLogScale = Checkpointed.readDouble(in);
        spreadSteps = in.readInt();
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
