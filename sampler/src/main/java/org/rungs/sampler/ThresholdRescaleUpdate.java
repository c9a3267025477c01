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
 *
 * <p>Under number attraction in by-group mode, steps that trade attraction for category width on
 * the same augmented state ({@link #ridgeStep}, {@link #tradeStep}): a group's share of a number
 * can come from its attraction or from the width its thresholds give the number, and the
 * attraction update holds the thresholds while it moves the attractions. Each step's ratio is
 * a function of the cell sums and of each cell's count of answers and rejected draws
 * ({@link LatentCells#answered}, {@link LatentCells#rejected}), so it costs O(groups x categories).
 * A proposal whose attractions would span more than the bound of the {@link BoundedRedrawSteps}
 * it runs in is refused: the steps then leave the posterior restricted to the bounded region
 * invariant, as that class's argument needs.
 */
final class ThresholdRescaleUpdate extends ThresholdMoves {
    /** Passes per sweep: each step costs O(1), so several passes cost nothing next to the latent draws. */
    private static final int PASSES = 4;
    /**
     * Passes of the attraction steps per sweep, each a ridge step of every a[g,k] and a trade step.
     * Attraction demo, seed 2, keeping every fourth iteration: attraction_sd bulk ESS 305 without
     * them, 334 with one pass, 515 with four, 382 with sixteen (single runs; their noise is about
     * as large as the differences).
     */
    static final int ATTRACTION_PASSES = 4;
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
    /**
     * Under number attraction in by-group mode: the largest range of a group's attractions at which
     * the redraw scheme runs ({@link BoundedRedrawSteps}), the prior of tau_a, the proposed
     * attractions, and the scales of the ridge steps (per position) and of the trade step.
     */
    private final boolean attractionSteps;
    private final double maxRange;
    private final HalfNormal attractionSdPrior;
    private final double[] proposedAttraction;
    private final double[] ridgeLogScale;
    private double tradeLogScale = Math.log(0.1);
    private int attractionSweeps;

    private ThresholdRescaleUpdate(ChainState state, int[] start, Priors priors, UniformRandomProvider rng, double maxRange) {
        super(state, start, priors, rng);
        this.spreadPrior = priors.thresholdSd();
        this.attractionSteps = state.byGroup && state.groups > 1 && state.attractionOn();
        this.maxRange = maxRange;
        this.attractionSdPrior = priors.attractionSd();
        this.proposedAttraction = new double[attractionSteps ? state.attraction.length : 0];
        this.ridgeLogScale = new double[state.categories];
        java.util.Arrays.fill(ridgeLogScale, Math.log(0.1));
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
        return of(state, start, priors, rng, BoundedRedrawSteps.MAX_RANGE);
    }

    /** maxRange: that of the {@link BoundedRedrawSteps} the update runs in, under attraction. */
    static ThresholdRescaleUpdate of(ChainState state, int[] start, Priors priors, UniformRandomProvider rng, double maxRange) {
        return new ThresholdRescaleUpdate(state, start, priors, rng, maxRange);
    }

    @Override
    public void update(boolean adapt) {
        cells.prepare(state.level.coefficient);
        passes(PASSES, adapt);
        if (state.byGroup) {
            spreadStep(adapt);
        }
        if (attractionSteps) {
            for (int pass = 0; pass < ATTRACTION_PASSES; pass++) {
                for (int g = 0; g < state.groups; g++) {
                    for (int k : state.attracted) {
                        if (k > 0 && k < m - 1) {
                            ridgeStep(g, k, adapt);
                        }
                    }
                }
                tradeStep(adapt);
            }
            if (adapt) {
                attractionSweeps++;
            }
        }
        cells.finish(state.level, m);
    }

    /**
     * Number attraction against the width of its category, within one group: a[g,k] gains e while
     * category k's two thresholds move about its midpoint to width w exp(-e), the values of the
     * category and its two neighbours mapped onto their new intervals, so that the answers' share
     * of the category stays nearly fixed. On the augmented state of the redraw scheme the ratio
     * holds the values' normal densities with the Jacobians, the acceptance factors exp(a - A) of
     * the answers and 1 - exp(a - A) of the rejected draws by cell, the priors of t[g,k] and
     * d[g,.], and the Jacobian exp(-e) of the width (Green 1995, section 3.3). The midpoint and
     * so the mean threshold stay.
     */
    private void ridgeStep(int g, int k, boolean adapt) {
        double change = ridgeChange(g, k, Math.exp(ridgeLogScale[k]) * normal.sample());
        boolean accept = !Double.isNaN(change) && Math.log(rng.nextDouble()) < change;
        if (accept) {
            keepGroup(g);
        }
        if (adapt) {
            ridgeLogScale[k] += Math.pow(attractionSweeps + 1.0, -0.6) * ((accept ? 1 : 0) - 0.44) / (state.groups * ATTRACTION_PASSES);
        }
    }

    /** The log ratio of the ridge step of a[g,k] by e (NaN outside the support); keeps the proposal. */
    double ridgeChange(int g, int k, double e) {
        ChainState s = state;
        int row = g * stride;
        System.arraycopy(s.thresholds, row, proposedRows, row, stride);
        System.arraycopy(s.attraction, g * m, proposedAttraction, g * m, m);
        moveWidth(row, k, e);
        proposedAttraction[g * m + k] += e;
        double before = s.attraction[g * m + k] - s.attractionMean[k];
        double after = before + e;
        double sd = s.attractionSd;
        return attractedChange(g) - 0.5 * (after - before) * (after + before) / (sd * sd) - e;
    }

    /**
     * tau_a non-centred against the thresholds: tau_a and every deviation t[g,k] = a[g,k] - abar[k]
     * are multiplied by one factor f, and each a[g,k]'s change is matched by the width of its
     * category as in {@link #ridgeStep}, number by number in ascending or, with probability one
     * half, descending order (the reverse move takes the other order and 1/f). The centred and
     * non-centred moves of tau_a in {@link AttractionUpdate} hold the thresholds, so a spread of
     * the groups' shares of a number that the threshold deviations could explain as well keeps
     * tau_a where it is; this step moves both. The prior of the standardised deviations does
     * not change; the ratio holds the prior of tau_a with the Jacobian f on log tau_a, the
     * widths' Jacobians, and the augmented density and d-prior terms of the ridge step.
     */
    private void tradeStep(boolean adapt) {
        double step = Math.exp(tradeLogScale) * normal.sample();
        double factor = Math.exp(step);
        double change = tradeChange(factor, rng.nextBoolean());
        boolean accept = !Double.isNaN(change) && Math.log(rng.nextDouble()) < change;
        if (accept) {
            keepTrade(factor);
        }
        if (adapt) {
            tradeLogScale += Math.pow(attractionSweeps + 1.0, -0.6) * ((accept ? 1 : 0) - 0.44) / ATTRACTION_PASSES;
        }
    }

    /** The log ratio of the trade step by factor, in ascending or descending order (NaN outside the support); keeps the proposal. */
    double tradeChange(double factor, boolean ascending) {
        ChainState s = state;
        int[] attracted = s.attracted;
        double sd = s.attractionSd;
        double change = attractionSdPrior.logDensity(sd * factor) - attractionSdPrior.logDensity(sd) + Math.log(factor);
        for (int g = 0; g < s.groups && !Double.isNaN(change); g++) {
            int row = g * stride;
            System.arraycopy(s.thresholds, row, proposedRows, row, stride);
            System.arraycopy(s.attraction, g * m, proposedAttraction, g * m, m);
            for (int j = 0; j < attracted.length; j++) {
                int k = attracted[ascending ? j : attracted.length - 1 - j];
                double delta = (factor - 1) * (s.attraction[g * m + k] - s.attractionMean[k]);
                proposedAttraction[g * m + k] += delta;
                if (k > 0 && k < m - 1) {
                    moveWidth(row, k, delta);
                    change -= delta;
                }
            }
            change += attractedChange(g);
        }
        return change;
    }

    /** Keeps the trade step by factor that {@link #tradeChange} proposed. */
    void keepTrade(double factor) {
        state.attractionSd *= factor;
        for (int g = 0; g < state.groups; g++) {
            keepGroup(g);
        }
    }

    /** Category k of the proposed row at {@code row} to width w exp(-e) about its midpoint. */
    private void moveWidth(int row, int k, double e) {
        double h = 0.5 * (proposedRows[row + k + 1] - proposedRows[row + k]) * -Math.expm1(-e);
        proposedRows[row + k] += h;
        proposedRows[row + k + 1] -= h;
    }

    /**
     * For group g's proposed thresholds and attractions: the change of the log density of its
     * latent values with their Jacobians ({@link #rowChange}), of the acceptance factors of its
     * answers and rejected draws, and of the prior of its deviations d[g,.]; NaN when the proposed
     * thresholds do not increase or the attractions span more than maxRange.
     */
    private double attractedChange(int g) {
        ChainState s = state;
        int row = g * stride;
        double[] t = s.thresholds;
        double low = 0;
        double top = 0;
        for (int k = 0; k < m; k++) {
            low = Math.min(low, proposedAttraction[g * m + k]);
            top = Math.max(top, proposedAttraction[g * m + k]);
        }
        if (!(top - low <= maxRange)) {
            return Double.NaN;
        }
        double squares = 0;
        for (int k = 1; k <= cuts; k++) {
            if (!(proposedRows[row + k] > proposedRows[row + k - 1])) {
                return Double.NaN;
            }
            double before = t[row + k] - s.common[k];
            double after = proposedRows[row + k] - s.common[k];
            squares += (after - before) * (after + before);
        }
        double sd = s.thresholdSd;
        double change = -0.5 * squares / (sd * sd) + rowChange(g);
        double topBefore = s.attractionTop(g);
        for (int k = 0; k < m; k++) {
            int c = g * m + k;
            double before = s.attraction[c] - topBefore;
            double after = proposedAttraction[c] - top;
            change += cells.answered(c) * (after - before);
            double rejected = cells.rejected(c);
            if (rejected > 0) {
                change += rejected * (Math.log(-Math.expm1(after)) - Math.log(-Math.expm1(before)));
            }
        }
        return change;
    }

    /** Keeps group g's proposed thresholds and attractions, and maps its cells as {@link #rowChange} found. */
    void keepGroup(int g) {
        ChainState s = state;
        System.arraycopy(proposedRows, g * stride, s.thresholds, g * stride, stride);
        System.arraycopy(proposedAttraction, g * m, s.attraction, g * m, m);
        for (int c = g * m; c < (g + 1) * m; c++) {
            cells.transform(c, cellShift[c], cellScale[c]);
        }
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
        Checkpointed.writeDoubles(out, ridgeLogScale);
        Checkpointed.writeDouble(out, tradeLogScale);
        out.writeInt(attractionSweeps);
    }

    @Override
    public void restore(DataInput in) throws IOException {
        super.restore(in);
        spreadLogScale = Checkpointed.readDouble(in);
        spreadSteps = in.readInt();
        Checkpointed.readDoubles(in, ridgeLogScale);
        tradeLogScale = Checkpointed.readDouble(in);
        attractionSweeps = in.readInt();
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
