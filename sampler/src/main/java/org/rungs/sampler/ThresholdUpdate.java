package org.rungs.sampler;

import org.apache.commons.rng.UniformRandomProvider;
import org.rungs.models.ResponseLikelihood;
import org.rungs.models.RoundingChannel;
import org.rungs.priors.Priors;
import org.rungs.priors.StandardNormal;

/**
 * Metropolis updates of the thresholds with the latent levels integrated out (Cowles 1996,
 * section 3), and with the coarse class and intended answer summed out when the class is on
 * (MODEL.md 4c), one threshold at a time, so that the acceptance rate does not fall as the sample
 * grows and each step reads only the respondents of the two categories the threshold separates.
 *
 * <p>The steps and their proposals are those of {@link ThresholdMoves}.
 *
 * <p>Under number attraction (MODEL.md 4b) the full-scale probability pi[g,r] exp(a[g,r]) / N_i
 * has a normaliser N_i that depends on every threshold, so a step reads every respondent of the
 * block: the normal cdf at the moved threshold is cached per respondent ({@link ChainState#cdf}),
 * so a step costs one normal-function call per respondent; one pass is made per sweep.
 */
final class ThresholdUpdate extends ThresholdMoves {
    /**
     * Passes over the thresholds per sweep: neighbouring cut-points are correlated, so one pass of
     * single-threshold steps leaves them the slowest-mixing parameters; a second pass costs less
     * than a second sweep (demo: bulk ESS of the group thresholds roughly doubled).
     */
    private static final int PASSES = 2;
    /**
     * For each threshold k, the reported categories whose likelihood depends on it: k-1 and k,
     * and the coarse points whose coarse-class probability has k as an outer boundary.
     */
    private final int[][] visited;
    /** Per respondent: x_i' beta, fixed while the thresholds move (the level moves with alpha). */
    private final double[] covariatePart;
    /** Under attraction, per (group, category) cell: the smallest and largest of its covariate parts. */
    private final double[] covariateLow;
    private final double[] covariateHigh;
    /** Per respondent: the smaller normal tail at the lower and at the upper bound of its category. */
    final double[] lowerTail;
    final double[] upperTail;
    /**
     * Per respondent: the tail at the moved bound under the pending proposal, kept if it is
     * accepted; for a coarse-point reporter, P(r | full) and P(r | coarse) as proposed.
     */
    private final double[] proposedTail;
    private final double[] proposedCoarse;
    /**
     * Per respondent reporting a coarse point (coarse class on): q, P(r | full) and
     * P(r | coarse) at the current state, so a step recomputes only the part it changes.
     */
    private final double[] mixtureQ;
    final double[] mixtureFull;
    final double[] mixtureCoarse;
    /** Under attraction: exp(a[g,k]) - 1 by group and position, and the cdf and N_i under the pending proposal. */
    private final double[] excess;
    private final double[] proposedCdf;
    private final double[] proposedNormaliser;
    /**
     * Under attraction, the running products of the likelihoods after and before a step (their
     * ratio is the likelihood ratio; kept apart, a respondent costs no division) and the logs
     * taken of their ratio so far.
     */
    private double after;
    private double before;
    private double change;
    /** The log-ratio beyond what {@link #mixtureRatio} returned, since the caller last took it. */
    private double beyondProduct;
    /** Whether only the two end thresholds are stepped (see {@link #ends}). */
    private final boolean endsOnly;
    /** Categories whose respondents the stepped thresholds read, so the caches hold them. */
    private final boolean[] read;
    /**
     * The per-respondent caches hold the respondents of the categories read (all of them under
     * attraction, whose steps read every respondent), in sorted order: respondent i of the
     * (group, category) run c sits at slot i - gap[c].
     */
    private final int[] gap;

    private ThresholdUpdate(ChainState state, int[] start, Priors priors, UniformRandomProvider rng, boolean endsOnly) {
        super(state, start, priors, rng);
        this.endsOnly = endsOnly;
        boolean attraction = state.attractionOn();
        this.excess = new double[attraction ? state.groups * state.categories : 0];
        this.proposedCdf = new double[attraction ? state.size : 0];
        this.proposedNormaliser = new double[attraction ? state.size : 0];
        this.covariateLow = new double[attraction ? state.groups * state.categories : 0];
        this.covariateHigh = new double[attraction ? state.groups * state.categories : 0];
        this.visited = new int[cuts + 1][];
        for (int k = 1; k <= cuts; k++) {
            int kk = k;
            visited[k] = java.util.stream.IntStream.range(0, state.categories)
                    .filter(j -> j == kk - 1 || j == kk || (state.channel != null && state.channel.dependsOn(j, kk)))
                    .toArray();
        }
        this.read = new boolean[state.categories];
        for (int k = 1; k <= cuts; k++) {
            if (moves(k)) {
                for (int j : visited[k]) {
                    read[j] = true;
                }
            }
        }
        for (int j = 0; j < state.categories; j++) {
            // under attraction a step reads every respondent: the coarse-point ones by their mixture
            read[j] |= attraction && state.channel != null && state.channel.isPoint(j);
        }
        int m = state.categories;
        this.gap = new int[state.groups * m];
        int slots = 0;
        for (int c = 0; c < gap.length; c++) {
            gap[c] = start[c] - slots;
            if (read[c % m] || attraction) {
                slots += start[c + 1] - start[c];
            }
        }
        this.covariatePart = new double[slots];
        this.lowerTail = new double[slots];
        this.upperTail = new double[slots];
        this.proposedTail = new double[slots];
        int mixtureSize = state.channel == null ? 0 : slots;
        this.proposedCoarse = new double[mixtureSize];
        this.mixtureQ = new double[mixtureSize];
        this.mixtureFull = new double[mixtureSize];
        this.mixtureCoarse = new double[mixtureSize];
    }

    /** Steps every threshold. */
    static ThresholdUpdate of(ChainState state, int[] start, Priors priors, UniformRandomProvider rng) {
        return new ThresholdUpdate(state, start, priors, rng, false);
    }

    /**
     * Steps only the two end thresholds, for the coarse class or attraction: the rescaling steps
     * given the latent levels ({@link ThresholdRescaleUpdate}) move the others, but the end
     * categories hold the coarse points' competitors (a 0 or a 10 said by a full-scale or by a
     * coarse responder), and with the classes fixed their thresholds follow the classes only
     * slowly. Without attraction a step reads only the respondents of the categories beside the
     * threshold; under attraction every respondent of the block (N_i depends on every threshold).
     */
    static ThresholdUpdate ends(ChainState state, int[] start, Priors priors, UniformRandomProvider rng) {
        return new ThresholdUpdate(state, start, priors, rng, true);
    }

    @Override
    boolean moves(int k) {
        return !endsOnly || k == 1 || k == cuts;
    }

    @Override
    public void update(boolean adapt) {
        refresh();
        passes(state.attractionOn() ? 1 : PASSES, adapt);
    }

    /**
     * Recomputes the per-respondent caches for the current coefficients and thresholds: each
     * bound's distance to the level changes only at the moved threshold, so a step then costs
     * one normal-function call per respondent it touches.
     */
    void refresh() {
        ChainState s = state;
        boolean kept = s.attractionOn() && fillCdfs();
        double lastLinear = Double.NaN;
        double lastQ = 0;
        RegressionBlock level = s.level;
        double[] t = s.thresholds;
        int m = s.categories;
        for (int g = 0; g < s.groups; g++) {
            for (int j = 0; j < m; j++) {
                if (!read[j] && !s.attractionOn()) {
                    continue;
                }
                boolean point = s.channel != null && s.channel.isPoint(j);
                boolean tails = j >= 1 && moves(j) || j + 1 <= cuts && moves(j + 1);
                int at = g * stride + j;
                int off = gap[g * m + j];
                double lowest = Double.POSITIVE_INFINITY;
                double highest = Double.NEGATIVE_INFINITY;
                for (int i = start[g * m + j], end = start[g * m + j + 1]; i < end; i++) {
                    int slot = i - off;
                    double part = level.linear(i, g) - level.intercept[g];
                    covariatePart[slot] = part;
                    lowest = Math.min(lowest, part);
                    highest = Math.max(highest, part);
                    double eta = level.intercept[g] + part;
                    if (!point) {
                        // under attraction every category's covariate parts are read, its tails only
                        // beside a stepped threshold
                        if (tails) {
                            lowerTail[slot] = tail(t[at] - eta);
                            upperTail[slot] = tail(t[at + 1] - eta);
                        }
                    } else {
                        double linear = s.style.linear(i, g);
                        if (linear != lastLinear) {
                            // respondents of a group who share their style covariates (all, without any) share q
                            lastQ = StandardNormal.cdf(linear);
                            lastLinear = linear;
                        }
                        mixtureQ[slot] = lastQ;
                        if (s.attractionOn()) {
                            mixtureFromCdfs(slot, i, g * stride, j, eta);
                        } else {
                            refreshMixture(slot, g * stride, j, eta);
                        }
                    }
                }
                if (s.attractionOn()) {
                    covariateLow[g * m + j] = lowest;
                    covariateHigh[g * m + j] = highest;
                }
            }
        }
        if (s.attractionOn()) {
            refreshAttraction(kept);
        }
    }

    /**
     * Fills {@link ChainState#cdf}, unless the joint step left it current, and N_i with it
     * ({@link ChainState#cdfCurrent}); returns whether the joint step had.
     */
    private boolean fillCdfs() {
        ChainState s = state;
        int m = s.categories;
        if (s.cdfCurrent) {
            s.cdfCurrent = false;
            return true;
        }
        for (int g = 0; g < s.groups; g++) {
            int row = g * stride;
            for (int i = s.start[g * m], to = s.start[(g + 1) * m]; i < to; i++) {
                double eta = s.level.linear(i, g);
                for (int k = 1; k < m; k++) {
                    s.cdf[k * s.size + i] = StandardNormal.cdf(s.thresholds[row + k] - eta);
                }
            }
        }
        return false;
    }

    /**
     * The odds of the attraction, and {@link ChainState#normaliser} from the cdfs unless the joint
     * step's pass left it with them ({@code kept}).
     */
    private void refreshAttraction(boolean kept) {
        ChainState s = state;
        int m = s.categories;
        for (int at = 0; at < excess.length; at++) {
            excess[at] = Math.expm1(s.attraction[at]);
        }
        for (int g = 0; g < s.groups && !kept; g++) {
            s.refreshNormalisers(g, s.start[g * m], s.start[(g + 1) * m]);
        }
    }

    /**
     * Under attraction, {@link #refreshMixture} from respondent i's cached cdfs: the two
     * probabilities as their differences above {@link ChainState#EXACT_ENOUGH} (good to 1e-10
     * relative), computed from the tails below it.
     */
    private void mixtureFromCdfs(int slot, int i, int row, int j, double eta) {
        ChainState s = state;
        int n = s.size;
        double full = s.cdf[(j + 1) * n + i] - s.cdf[j * n + i];
        mixtureFull[slot] = full > ChainState.EXACT_ENOUGH ? full : ResponseLikelihood.full(s.thresholds, row, j, eta, -1, 0);
        double coarse = ChainState.coarseFromCdfs(s.channel, s.cdf, n, i, j, -2, 0, 0);
        mixtureCoarse[slot] = coarse > ChainState.EXACT_ENOUGH ? coarse
                : ResponseLikelihood.coarse(s.channel, s.thresholds, row, j, eta, -1, 0);
    }

    private void refreshMixture(int i, int row, int j, double eta) {
        mixtureFull[i] = ResponseLikelihood.full(state.thresholds, row, j, eta, -1, 0);
        mixtureCoarse[i] = ResponseLikelihood.coarse(state.channel, state.thresholds, row, j, eta, -1, 0);
    }

    /** The smaller tail at x: Phi(x) for x <= 0, 1 - Phi(x) above, each without cancellation. */
    static double tail(double x) {
        return x <= 0 ? StandardNormal.cdf(x) : StandardNormal.upperTail(x);
    }

    /** Phi(upper) - Phi(lower) from the bounds and their smaller tails, without cancellation. */
    static double interval(double lower, double lowerTail, double upper, double upperTail) {
        if (lower > 0) {
            return lowerTail - upperTail;
        }
        if (upper <= 0) {
            return upperTail - lowerTail;
        }
        return 1 - lowerTail - upperTail;
    }

    /**
     * Change of the log-likelihood when threshold k of block b moves by delta relative to the
     * levels: respondents of category k-1 see their upper bound move, those of category k their
     * lower bound; every other bound keeps its distance to the level.
     */
    @Override
    double logLikelihoodChange(int b, int k, double delta) {
        ChainState s = state;
        if (s.attractionOn()) {
            return attractedLikelihoodChange(b, k, delta);
        }
        int m = s.categories;
        double[] thresholds = s.thresholds;
        RoundingChannel channel = s.channel;
        double change = 0;
        for (int g = firstGroup(b); g <= lastGroup(b); g++) {
            int row = g * stride;
            double lower = thresholds[row + k - 1];
            double cut = thresholds[row + k];
            double upper = thresholds[row + k + 1];
            for (int j : visited[k]) {
                // slots, not respondents: the non-attracted path reads only the caches
                int from = start[g * m + j] - gap[g * m + j];
                int to = start[g * m + j + 1] - gap[g * m + j];
                if (channel != null && channel.isPoint(j)) {
                    double product = 1;
                    for (int i = from; i < to; i++) {
                        product *= mixtureRatio(i, row, j, s.level.intercept[g] + covariatePart[i], k, delta, 1, 1);
                        if (product < RunningProducts.LOW || product > RunningProducts.HIGH) {
                            change += Math.log(product);
                            product = 1;
                        }
                    }
                    change += Math.log(product) + beyondProduct;
                    beyondProduct = 0;
                } else if (j == k - 1) {
                    change += runChange(from, to, s.level.intercept[g], lower, cut, true, delta);
                } else {
                    change += runChange(from, to, s.level.intercept[g], cut, upper, false, delta);
                }
            }
        }
        return change;
    }

    /**
     * The log-likelihood change of a run of full-scale respondents of one category whose upper
     * bound ({@code upperMoves}) or lower bound moves by delta, from the cached tails; the tail at
     * the moved bound is kept in {@link #proposedTail} in case the step is accepted.
     */
    private double runChange(int from, int to, double alpha, double lowerBound, double upperBound,
                             boolean upperMoves, double delta) {
        double change = 0;
        double product = 1;
        for (int i = from; i < to; i++) {
            product *= ownFactor(i, alpha + covariatePart[i], lowerBound, upperBound, upperMoves, delta);
            if (product < RunningProducts.LOW || product > RunningProducts.HIGH) {
                change += Math.log(product);
                product = 1;
            }
        }
        return change + Math.log(product);
    }

    /**
     * The likelihood ratio after/before of full-scale respondent i of a category with bounds
     * (lowerBound, upperBound) whose upper ({@code upperMoves}) or lower bound moves by delta, from
     * the cached tails; keeps the tail at the moved bound in {@link #proposedTail}.
     */
    private double ownFactor(int i, double eta, double lowerBound, double upperBound, boolean upperMoves, double delta) {
        double low = lowerBound - eta;
        double high = upperBound - eta;
        double newLow = upperMoves ? low : low + delta;
        double newHigh = upperMoves ? high + delta : high;
        double moved = tail(upperMoves ? newHigh : newLow);
        proposedTail[i] = moved;
        double before = interval(low, lowerTail[i], high, upperTail[i]);
        double after = upperMoves ? interval(low, lowerTail[i], newHigh, moved) : interval(newLow, moved, high, upperTail[i]);
        return accumulate(1, before, after, low, high, newLow, newHigh);
    }

    /**
     * Under attraction: the log-likelihood change of every respondent of block b when threshold k
     * moves by delta relative to the levels, through its own category (as without attraction)
     * and through N_i; keeps the moved cdf and N_i for {@link #keepProposedCaches}. Cell by
     * (group, category) cell, so that what the category decides is decided once per cell.
     */
    private double attractedLikelihoodChange(int b, int k, double delta) {
        ChainState s = state;
        int m = s.categories;
        double[] t = s.thresholds;
        RoundingChannel channel = s.channel;
        after = 1;
        before = 1;
        change = 0;
        for (int g = firstGroup(b); g <= lastGroup(b); g++) {
            int row = g * stride;
            double alpha = s.level.intercept[g];
            double lower = t[row + k - 1];
            double cut = t[row + k];
            double upper = t[row + k + 1];
            double shift = excess[g * m + k - 1] - excess[g * m + k];
            for (int r = 0; r < m; r++) {
                int cell = g * m + r;
                int from = s.start[cell];
                int to = s.start[cell + 1];
                if (from == to) {
                    continue;
                }
                // every x = cut + delta - eta of the cell lies between those at the cell's extreme
                // covariate parts (rounding is monotone): inside the table, the cdf is read from it
                double nearest = cut + delta - (alpha + covariateHigh[cell]);
                double farthest = cut + delta - (alpha + covariateLow[cell]);
                movedCdfs(from, to, alpha, cut, delta,
                        nearest > -StandardNormal.TABLE_END && farthest < StandardNormal.TABLE_END);
                if (channel != null && channel.isPoint(r)) {
                    pointCellChange(from, to, row, r, k, delta, alpha, shift, excess[cell] + 1);
                } else if (r == k - 1 || r == k) {
                    neighbourCellChange(from, to, r == k - 1, alpha, r == k - 1 ? lower : cut,
                            r == k - 1 ? cut : upper, delta, k, shift);
                } else {
                    otherCellChange(from, to, k, shift);
                }
            }
        }
        change += beyondProduct;
        beyondProduct = 0;
        return change + Math.log(after / before);
    }

    /** Multiplies a respondent's likelihood ratio into {@link #after}, taking the log when a product leaves the bounds. */
    private void multiply(double ratio) {
        after *= ratio;
        if (RunningProducts.outside(after, before)) {
            change += Math.log(after / before);
            after = 1;
            before = 1;
        }
    }

    /**
     * The log-likelihood change of a cell whose category neither borders threshold k nor is a
     * coarse point: only N_i moves; the moved cdfs are in {@link #proposedCdf} ({@link #movedCdfs}).
     */
    private void otherCellChange(int from, int to, int k, double shift) {
        ChainState s = state;
        double[] cdf = s.cdf;
        double[] normaliser = s.normaliser;
        int column = k * s.size;
        // the running products in registers: through the fields each step waits on a store
        double likelihoodAfter = after;
        double likelihoodBefore = before;
        double change = this.change;
        for (int i = from; i < to; i++) {
            double movedCdf = proposedCdf[i];
            double normaliserBefore = normaliser[i];
            double normaliserAfter = normaliserBefore + (movedCdf - cdf[column + i]) * shift;
            proposedNormaliser[i] = normaliserAfter;
            // the likelihood is proportional to 1 / N_i
            likelihoodAfter *= normaliserBefore;
            likelihoodBefore *= normaliserAfter;
            if (RunningProducts.outside(likelihoodAfter, likelihoodBefore)) {
                change += Math.log(likelihoodAfter / likelihoodBefore);
                likelihoodAfter = 1;
                likelihoodBefore = 1;
            }
        }
        after = likelihoodAfter;
        before = likelihoodBefore;
        this.change = change;
    }

    /** As {@link #otherCellChange}, for a cell of category k-1 ({@code upperMoves}) or k: its own interval moves too. */
    private void neighbourCellChange(int from, int to, boolean upperMoves, double alpha, double lowerBound,
                                     double upperBound, double delta, int k, double shift) {
        ChainState s = state;
        int column = k * s.size;
        for (int i = from; i < to; i++) {
            double eta = alpha + covariatePart[i];
            double normaliserBefore = s.normaliser[i];
            double normaliserAfter = normaliserBefore + (proposedCdf[i] - s.cdf[column + i]) * shift;
            proposedNormaliser[i] = normaliserAfter;
            before *= normaliserAfter;
            multiply(normaliserBefore * ownFactor(i, eta, lowerBound, upperBound, upperMoves, delta));
        }
    }

    /**
     * As {@link #otherCellChange}, for the cell of coarse point r (odds exp(a[g,r])), whose
     * class is summed out ({@link #mixtureRatio}); where neither P(r | full) nor P(r | coarse)
     * depends on threshold k, the ratio from the cached ones, each side times its N_i so that it
     * enters the two products without a division.
     */
    private void pointCellChange(int from, int to, int row, int r, int k, double delta, double alpha,
                                 double shift, double odds) {
        ChainState s = state;
        int column = k * s.size;
        boolean moves = r == k - 1 || r == k || s.channel.dependsOn(r, k);
        for (int i = from; i < to; i++) {
            double eta = alpha + covariatePart[i];
            double normaliserBefore = s.normaliser[i];
            double normaliserAfter = normaliserBefore + (proposedCdf[i] - s.cdf[column + i]) * shift;
            proposedNormaliser[i] = normaliserAfter;
            if (!moves) {
                // (1 - q) w P(r | full) + q P(r | coarse) with w = exp(a) / N_i, times N_i: full A, coarse B
                double full = (1 - mixtureQ[i]) * odds * mixtureFull[i];
                double coarse = mixtureQ[i] * mixtureCoarse[i];
                double timesBefore = full + coarse * normaliserBefore;
                double timesAfter = full + coarse * normaliserAfter;
                if (timesAfter > 1e-280 * normaliserAfter && timesBefore > 1e-280 * normaliserBefore) {
                    before *= timesBefore * normaliserAfter;
                    multiply(timesAfter * normaliserBefore);
                    continue;
                }
            }
            multiply(mixtureRatio(i, row, r, eta, k, delta, odds / normaliserBefore, odds / normaliserAfter));
        }
    }

    /**
     * Phi(cut + delta - eta_i) for the cell's respondents into {@link #proposedCdf}; with
     * {@code inTable} (every |x| below {@link StandardNormal#TABLE_END}) from the table alone, bit
     * for bit {@link StandardNormal#cdf}, in a loop without calls (DEVELOPERS.md, "Benchmark":
     * with a call in a loop, even on a branch never taken, C2 schedules it worse, and which way it
     * compiles changes from one process to the next).
     */
    private void movedCdfs(int from, int to, double alpha, double cut, double delta, boolean inTable) {
        if (inTable) {
            for (int i = from; i < to; i++) {
                double x = cut + delta - (alpha + covariatePart[i]);
                double tail = StandardNormal.smallerTailInTable(x);
                proposedCdf[i] = x > 0 ? 1 - tail : tail;
            }
        } else {
            for (int i = from; i < to; i++) {
                proposedCdf[i] = StandardNormal.cdf(cut + delta - (alpha + covariatePart[i]));
            }
        }
    }

    /** After an accepted move under attraction: the cdf at threshold k and N_i as proposed. */
    private void keepProposedCaches(int b, int k) {
        ChainState s = state;
        int m = s.categories;
        int from = s.start[firstGroup(b) * m];
        int to = s.start[(lastGroup(b) + 1) * m];
        System.arraycopy(proposedCdf, from, s.cdf, k * s.size + from, to - from);
        System.arraycopy(proposedNormaliser, from, s.normaliser, from, to - from);
    }

    /**
     * Multiplies the running product of likelihood ratios by after/before; where either
     * probability underflows, by the ratio computed in log space instead. The caller takes the
     * log of the product whenever it leaves the bounds of {@link RunningProducts}, so one log
     * serves many respondents without overflow.
     */
    private static double accumulate(double product, double before, double after,
                                     double low, double high, double newLow, double newHigh) {
        if (before > 1e-280 && after > 1e-280) {
            return product * (after / before);
        }
        return product * Math.exp(Math.max(-700, Math.min(700,
                StandardNormal.logIntervalProbability(newLow, newHigh) - StandardNormal.logIntervalProbability(low, high))));
    }

    @Override
    void accepted(int b, int k, double delta) {
        moveTails(b, k);
        if (state.attractionOn()) {
            keepProposedCaches(b, k);
        }
    }

    /**
     * After an accepted move of threshold k: the tails at k of the two runs beside it, and the
     * full-scale and coarse probabilities of the coarse-point runs it touches, as computed for the
     * proposal.
     */
    private void moveTails(int b, int k) {
        ChainState s = state;
        int m = s.categories;
        for (int g = firstGroup(b); g <= lastGroup(b); g++) {
            boolean belowIsPoint = s.channel != null && s.channel.isPoint(k - 1);
            boolean aboveIsPoint = s.channel != null && s.channel.isPoint(k);
            // a coarse-point reporter's tails are not read: its steps take the mixture path
            int below = g * m + k - 1;
            int above = g * m + k;
            if (!belowIsPoint) {
                System.arraycopy(proposedTail, start[below] - gap[below], upperTail, start[below] - gap[below], start[below + 1] - start[below]);
            }
            if (!aboveIsPoint) {
                System.arraycopy(proposedTail, start[above] - gap[above], lowerTail, start[above] - gap[above], start[above + 1] - start[above]);
            }
            if (s.channel != null) {
                for (int j : visited[k]) {
                    if (s.channel.isPoint(j)) {
                        int from = start[g * m + j] - gap[g * m + j];
                        int to = start[g * m + j + 1] - gap[g * m + j];
                        System.arraycopy(proposedTail, from, mixtureFull, from, to - from);
                        System.arraycopy(proposedCoarse, from, mixtureCoarse, from, to - from);
                    }
                }
            }
        }
    }

    /**
     * The ratio after/before of (1 - q) w P(r = j | full) + q P(r = j | coarse) (MODEL.md 4c, the
     * class summed out) when boundary k moves by delta, for a respondent reporting coarse point j;
     * w is 1 without attraction and exp(a[g,j]) / N_i with it (MODEL.md 4b), before and after.
     * Where either underflows, from the logs, with the part of the log beyond +-300 (which the
     * running product could not hold) added to {@link #beyondProduct}; the caller multiplies the
     * ratio into its running product and adds that field to its log.
     */
    private double mixtureRatio(int i, int row, int j, double eta, int k, double delta,
                                double weightBefore, double weightAfter) {
        RoundingChannel channel = state.channel;
        double[] t = state.thresholds;
        double q = mixtureQ[i];
        double fullBefore = mixtureFull[i];
        double coarseBefore = mixtureCoarse[i];
        double fullAfter = j == k - 1 || j == k ? ResponseLikelihood.full(t, row, j, eta, k, delta) : fullBefore;
        double coarseAfter = channel.dependsOn(j, k) ? ResponseLikelihood.coarse(channel, t, row, j, eta, k, delta) : coarseBefore;
        proposedTail[i] = fullAfter;
        proposedCoarse[i] = coarseAfter;
        double before = (1 - q) * weightBefore * fullBefore + q * coarseBefore;
        double after = (1 - q) * weightAfter * fullAfter + q * coarseAfter;
        if (after > 1e-280 && before > 1e-280) {
            return after / before;
        }
        double logBefore = ResponseLikelihood.logSum(Math.log1p(-q) + Math.log(weightBefore) + ResponseLikelihood.logFull(t, row, j, eta),
                Math.log(q) + ResponseLikelihood.logCoarse(channel, t, row, j, eta, -1, 0));
        double logAfter = ResponseLikelihood.logSum(Math.log1p(-q) + Math.log(weightAfter) + logFullMoved(t, row, j, eta, k, delta),
                Math.log(q) + ResponseLikelihood.logCoarse(channel, t, row, j, eta, k, delta));
        double log = logAfter - logBefore;
        double bounded = Math.max(-300, Math.min(300, log));
        beyondProduct += log - bounded;
        return Math.exp(bounded);
    }

    private static double logFullMoved(double[] t, int row, int j, double eta, int k, double delta) {
        double lower = t[row + j] + (j == k ? delta : 0);
        double upper = t[row + j + 1] + (j + 1 == k ? delta : 0);
        return StandardNormal.logIntervalProbability(lower - eta, upper - eta);
    }
}
