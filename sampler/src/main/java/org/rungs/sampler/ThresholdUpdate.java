package org.rungs.sampler;

import java.io.DataInput;
import java.io.DataOutput;
import java.io.IOException;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.rungs.models.ResponseLikelihood;
import org.rungs.models.RoundingChannel;
import org.rungs.priors.Normal;
import org.rungs.priors.Priors;
import org.rungs.priors.StandardNormal;

/**
 * Metropolis updates of the thresholds with the latent levels integrated out (Cowles 1996,
 * section 3), and with the coarse class and intended answer summed out when the class is on
 * (MODEL.md 4c), one threshold at a time, so that the acceptance rate does not fall as the sample
 * grows and each step reads only the respondents of the two categories the threshold separates.
 *
 * <p>The step moves the cut-point gamma[k] = c[k] - level of one block (a group's thresholds in
 * by-group mode; the common thresholds in shared mode) by delta: c[k] gains delta, then every
 * threshold of the block and its level lose delta/(M-1), which keeps the thresholds summing to
 * zero (MODEL.md 3) and leaves every other c[j] - level unchanged. The level is alpha[g] in
 * by-group mode; in shared mode mu_alpha and every alpha[g] move together. The map from
 * (gamma) to (level, thresholds) is linear, so the random-walk proposal stays symmetric and
 * needs no Jacobian. Moving the level with the threshold follows the ridge along which the
 * data pin c[g,k] - alpha[g] far more tightly than either part.
 *
 * <p>In by-group mode a last block moves the common threshold c[k] and every group's c[g,k]
 * together (deviations d unchanged), with mu_alpha and every alpha[g]: without it, c and the
 * c[g] can only follow each other through the prior, which is slow where a category has few
 * answers and the prior holds c[g,k] close to c[k]. The two end thresholds are moved on the log
 * of their gap to the neighbour instead: an end category with few answers leaves that gap
 * uncertain over orders of magnitude, where an additive step crawls. Each step's scale adapts
 * during warm-up only (Roberts & Rosenthal 2009, section 3) towards acceptance 0.44.
 *
 * <p>Under number attraction (MODEL.md 4b) the full-scale probability pi[g,r] exp(a[g,r]) / N_i
 * has a normaliser N_i that depends on every threshold, so a step reads every respondent of the
 * block: the normal cdf at the moved threshold is cached per respondent ({@link ChainState#cdf}),
 * so a step costs one normal-function call per respondent; one pass is made per sweep.
 */
final class ThresholdUpdate implements Update, Checkpointed {
    private static final double TARGET_ACCEPTANCE = 0.44;
    /**
     * Passes over the thresholds per sweep: neighbouring cut-points are correlated, so one pass of
     * single-threshold steps leaves them the slowest-mixing parameters; a second pass costs less
     * than a second sweep (demo: bulk ESS of the group thresholds roughly doubled).
     */
    private static final int PASSES = 2;
    /** Bounds of the running product of likelihood ratios before its log is taken. */
    private static final double PRODUCT_LOW = 1e-150;
    private static final double PRODUCT_HIGH = 1e150;
    private final ChainState state;
    private final int[] start;
    private final UniformRandomProvider rng;
    private final ZigguratSampler.NormalizedGaussian normal;
    private final double commonPriorPrecision;
    private final Normal groupMeanPrior;
    private final int blocks;
    private final int stride;
    private final int cuts;
    private final double[] logScale;
    /**
     * For each threshold k, the reported categories whose likelihood depends on it: k-1 and k,
     * and the coarse points whose coarse-class probability has k as an outer boundary.
     */
    private final int[][] visited;
    /** Per respondent: x_i' beta, fixed while the thresholds move (the level moves with alpha). */
    private final double[] covariatePart;
    /** Per respondent: the smaller normal tail at the lower and at the upper bound of its category. */
    final double[] lowerTail;
    final double[] upperTail;
    /** Per respondent: the tail at the moved bound under the pending proposal, kept if it is accepted. */
    private final double[] proposedTail;
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
    private long accepted;
    private long tried;
    private int warmupStep;

    private ThresholdUpdate(ChainState state, int[] start, Priors priors, UniformRandomProvider rng) {
        this.state = state;
        this.start = start;
        this.rng = rng;
        this.normal = ZigguratSampler.NormalizedGaussian.of(rng);
        this.commonPriorPrecision = priors.threshold().precision();
        this.groupMeanPrior = priors.groupMean();
        this.blocks = state.byGroup ? state.groups + 1 : 1;
        this.stride = state.categories + 1;
        this.cuts = state.categories - 1;
        this.logScale = new double[blocks * cuts];
        this.covariatePart = new double[state.size];
        this.lowerTail = new double[state.size];
        this.upperTail = new double[state.size];
        this.proposedTail = new double[state.size];
        int mixtureSize = state.channel == null ? 0 : state.size;
        this.mixtureQ = new double[mixtureSize];
        this.mixtureFull = new double[mixtureSize];
        this.mixtureCoarse = new double[mixtureSize];
        boolean attraction = state.attractionOn();
        this.excess = new double[attraction ? state.groups * state.categories : 0];
        this.proposedCdf = new double[attraction ? state.size : 0];
        this.proposedNormaliser = new double[attraction ? state.size : 0];
        this.visited = new int[cuts + 1][];
        for (int k = 1; k <= cuts; k++) {
            int kk = k;
            visited[k] = java.util.stream.IntStream.range(0, state.categories)
                    .filter(j -> j == kk - 1 || j == kk || (state.channel != null && state.channel.dependsOn(j, kk)))
                    .toArray();
        }
        int m = state.categories;
        for (int b = 0; b < blocks; b++) {
            for (int k = 1; k <= cuts; k++) {
                long near = 0;
                for (int g = firstGroup(b); g <= lastGroup(b); g++) {
                    near += start[g * m + k + 1] - start[g * m + k - 1];
                }
                logScale[b * cuts + k - 1] = Math.log(2.0 / Math.sqrt(1.0 + near));
            }
        }
    }

    static ThresholdUpdate of(ChainState state, int[] start, Priors priors, UniformRandomProvider rng) {
        return new ThresholdUpdate(state, start, priors, rng);
    }

    /** The common block: the only block in shared mode, the last one in by-group mode. */
    private boolean isCommon(int block) {
        return block == blocks - 1;
    }

    private int firstGroup(int block) {
        return isCommon(block) ? 0 : block;
    }

    private int lastGroup(int block) {
        return isCommon(block) ? state.groups - 1 : block;
    }

    @Override
    public void update(boolean adapt) {
        refresh();
        int passes = state.attractionOn() ? 1 : PASSES;
        for (int pass = 0; pass < passes; pass++) {
            for (int b = 0; b < blocks; b++) {
                for (int k = 1; k <= cuts; k++) {
                    step(b, k, adapt);
                }
            }
        }
        if (adapt) {
            warmupStep++;
        }
    }

    /**
     * Recomputes the per-respondent caches for the current coefficients and thresholds: each
     * bound's distance to the level changes only at the moved threshold, so a step then costs
     * one normal-function call per respondent it touches.
     */
    void refresh() {
        ChainState s = state;
        RegressionBlock level = s.level;
        double[] t = s.thresholds;
        for (int i = 0; i < s.size; i++) {
            int g = s.group[i];
            double part = level.linear(i, g) - level.intercept[g];
            covariatePart[i] = part;
            double eta = level.intercept[g] + part;
            int at = g * stride + s.category[i];
            lowerTail[i] = tail(t[at] - eta);
            upperTail[i] = tail(t[at + 1] - eta);
            if (s.channel != null && s.channel.isPoint(s.category[i])) {
                mixtureQ[i] = StandardNormal.cdf(s.style.linear(i, g));
                refreshMixture(i, g * stride, s.category[i], eta);
            }
        }
        if (s.attractionOn()) {
            refreshAttraction();
        }
    }

    /** Fills {@link ChainState#cdf} and {@link ChainState#normaliser} and the odds of the attraction. */
    private void refreshAttraction() {
        ChainState s = state;
        int m = s.categories;
        for (int at = 0; at < excess.length; at++) {
            excess[at] = Math.expm1(s.attraction[at]);
        }
        for (int g = 0; g < s.groups; g++) {
            int row = g * stride;
            int from = s.start[g * m];
            int to = s.start[(g + 1) * m];
            for (int i = from; i < to; i++) {
                double eta = s.level.intercept[g] + covariatePart[i];
                int at = i * (m + 1);
                s.cdf[at] = 0;
                s.cdf[at + m] = 1;
                for (int k = 1; k < m; k++) {
                    s.cdf[at + k] = StandardNormal.cdf(s.thresholds[row + k] - eta);
                }
            }
            s.refreshNormalisers(g, from, to);
        }
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

    private void step(int b, int k, boolean adapt) {
        ChainState s = state;
        boolean common = isCommon(b);
        double[] rows = common ? s.common : s.thresholds;
        int base = common ? 0 : b * stride;
        int slot = b * cuts + k - 1;
        double step = Math.exp(logScale[slot]) * normal.sample();
        double delta = step;
        double jacobian = 0;
        if (cuts > 1 && (k == 1 || k == cuts)) {
            // an end threshold: a random walk on the log of its gap to the neighbour, which moves by
            // delta; exp(step) is the Jacobian (Green 1995, section 3.3)
            double gap = k == 1 ? rows[base + 2] - rows[base + 1] : rows[base + cuts] - rows[base + cuts - 1];
            delta = k == 1 ? -gap * Math.expm1(step) : gap * Math.expm1(step);
            jacobian = step;
        }
        boolean accept = false;
        if (staysOrdered(b, k, delta)) {
            double logRatio = logLikelihoodChange(b, k, delta) + logPriorChange(rows, base, k, delta, b) + jacobian;
            accept = Math.log(rng.nextDouble()) < logRatio;
        }
        if (accept) {
            double share = delta / cuts;
            move(rows, base, k, delta);
            if (common && s.byGroup) {
                for (int g = 0; g < s.groups; g++) {
                    move(s.thresholds, g * stride, k, delta);
                }
            } else if (common) {
                s.shareCommonThresholds();
            }
            shiftLevel(b, -share);
            moveTails(b, k);
            if (s.attractionOn()) {
                keepProposedCaches(b, k);
            }
        }
        if (adapt) {
            logScale[slot] += Math.pow(warmupStep + 1.0, -0.6) * ((accept ? 1 : 0) - TARGET_ACCEPTANCE);
        } else {
            tried++;
            if (accept) {
                accepted++;
            }
        }
    }

    /** c[k] += delta, then every threshold of the row loses delta/(M-1): the sum stays zero. */
    private void move(double[] rows, int base, int k, double delta) {
        double share = delta / cuts;
        for (int j = 1; j <= cuts; j++) {
            rows[base + j] -= share;
        }
        rows[base + k] += delta;
    }

    /** Whether every row the step moves keeps increasing thresholds (MODEL.md 3). */
    private boolean staysOrdered(int b, int k, double delta) {
        ChainState s = state;
        if (isCommon(b)) {
            if (!between(s.common, 0, k, delta)) {
                return false;
            }
            if (!s.byGroup) {
                return true;
            }
        }
        for (int g = firstGroup(b); g <= lastGroup(b); g++) {
            if (!between(s.thresholds, g * stride, k, delta)) {
                return false;
            }
        }
        return true;
    }

    private static boolean between(double[] rows, int base, int k, double delta) {
        double moved = rows[base + k] + delta;
        return moved > rows[base + k - 1] && moved < rows[base + k + 1];
    }

    /**
     * Change of the log-likelihood when threshold k of block b moves by delta relative to the
     * levels: respondents of category k-1 see their upper bound move, those of category k their
     * lower bound; every other bound keeps its distance to the level.
     */
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
                int from = start[g * m + j];
                int to = start[g * m + j + 1];
                if (channel != null && channel.isPoint(j)) {
                    for (int i = from; i < to; i++) {
                        change += mixtureLogRatio(i, row, j, s.level.intercept[g] + covariatePart[i], k, delta, 1, 1);
                    }
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
            if (product < PRODUCT_LOW || product > PRODUCT_HIGH) {
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
     * and through N_i; keeps the moved cdf and N_i for {@link #keepProposedCaches}.
     */
    private double attractedLikelihoodChange(int b, int k, double delta) {
        ChainState s = state;
        int m = s.categories;
        double[] t = s.thresholds;
        RoundingChannel channel = s.channel;
        double change = 0;
        double product = 1;
        for (int g = firstGroup(b); g <= lastGroup(b); g++) {
            int row = g * stride;
            double alpha = s.level.intercept[g];
            double lower = t[row + k - 1];
            double cut = t[row + k];
            double upper = t[row + k + 1];
            double shift = excess[g * m + k - 1] - excess[g * m + k];
            for (int i = s.start[g * m], end = s.start[(g + 1) * m]; i < end; i++) {
                double eta = alpha + covariatePart[i];
                double movedCdf = StandardNormal.cdf(cut + delta - eta);
                double before = s.normaliser[i];
                double after = before + (movedCdf - s.cdf[i * (m + 1) + k]) * shift;
                proposedCdf[i] = movedCdf;
                proposedNormaliser[i] = after;
                int r = s.category[i];
                if (channel != null && channel.isPoint(r)) {
                    double odds = excess[g * m + r] + 1;
                    change += mixtureLogRatio(i, row, r, eta, k, delta, odds / before, odds / after);
                    continue;
                }
                product *= before / after;
                if (r == k - 1) {
                    product *= ownFactor(i, eta, lower, cut, true, delta);
                } else if (r == k) {
                    product *= ownFactor(i, eta, cut, upper, false, delta);
                }
                if (product < PRODUCT_LOW || product > PRODUCT_HIGH) {
                    change += Math.log(product);
                    product = 1;
                }
            }
        }
        return change + Math.log(product);
    }

    /** After an accepted move under attraction: the cdf at threshold k and N_i as proposed. */
    private void keepProposedCaches(int b, int k) {
        ChainState s = state;
        int m = s.categories;
        for (int i = s.start[firstGroup(b) * m], end = s.start[(lastGroup(b) + 1) * m]; i < end; i++) {
            s.cdf[i * (m + 1) + k] = proposedCdf[i];
            s.normaliser[i] = proposedNormaliser[i];
        }
    }

    /**
     * Multiplies the running product of likelihood ratios by after/before; where either
     * probability underflows, by the ratio computed in log space instead. The caller takes the
     * log of the product whenever it leaves [PRODUCT_LOW, PRODUCT_HIGH], so one log serves many
     * respondents without overflow.
     */
    private static double accumulate(double product, double before, double after,
                                     double low, double high, double newLow, double newHigh) {
        if (before > 1e-280 && after > 1e-280) {
            return product * (after / before);
        }
        return product * Math.exp(Math.max(-700, Math.min(700,
                StandardNormal.logIntervalProbability(newLow, newHigh) - StandardNormal.logIntervalProbability(low, high))));
    }

    /**
     * After an accepted move of threshold k: the tails at k of the two runs beside it, as computed
     * for the proposal (recomputed for coarse-point runs, whose step took the mixture path).
     */
    private void moveTails(int b, int k) {
        ChainState s = state;
        int m = s.categories;
        double[] t = s.thresholds;
        for (int g = firstGroup(b); g <= lastGroup(b); g++) {
            double alpha = s.level.intercept[g];
            double cut = t[g * stride + k];
            boolean belowIsPoint = s.channel != null && s.channel.isPoint(k - 1);
            boolean aboveIsPoint = s.channel != null && s.channel.isPoint(k);
            for (int i = start[g * m + k - 1], end = start[g * m + k]; i < end; i++) {
                upperTail[i] = belowIsPoint ? tail(cut - alpha - covariatePart[i]) : proposedTail[i];
            }
            for (int i = start[g * m + k], end = start[g * m + k + 1]; i < end; i++) {
                lowerTail[i] = aboveIsPoint ? tail(cut - alpha - covariatePart[i]) : proposedTail[i];
            }
            if (s.channel != null) {
                for (int j : visited[k]) {
                    if (s.channel.isPoint(j)) {
                        for (int i = start[g * m + j], end = start[g * m + j + 1]; i < end; i++) {
                            refreshMixture(i, g * stride, j, alpha + covariatePart[i]);
                        }
                    }
                }
            }
        }
    }

    /**
     * The change of log((1 - q) w P(r = j | full) + q P(r = j | coarse)) (MODEL.md 4c, the class
     * summed out) when boundary k moves by delta, for a respondent reporting coarse point j; w is
     * 1 without attraction and exp(a[g,j]) / N_i with it (MODEL.md 4b), before and after.
     */
    private double mixtureLogRatio(int i, int row, int j, double eta, int k, double delta,
                                   double weightBefore, double weightAfter) {
        RoundingChannel channel = state.channel;
        double[] t = state.thresholds;
        double q = mixtureQ[i];
        double fullBefore = mixtureFull[i];
        double coarseBefore = mixtureCoarse[i];
        double fullAfter = j == k - 1 || j == k ? ResponseLikelihood.full(t, row, j, eta, k, delta) : fullBefore;
        double coarseAfter = channel.dependsOn(j, k) ? ResponseLikelihood.coarse(channel, t, row, j, eta, k, delta) : coarseBefore;
        double before = (1 - q) * weightBefore * fullBefore + q * coarseBefore;
        double after = (1 - q) * weightAfter * fullAfter + q * coarseAfter;
        if (after > 1e-280 && before > 1e-280) {
            return Math.log(after / before);
        }
        double logBefore = ResponseLikelihood.logSum(Math.log1p(-q) + Math.log(weightBefore) + ResponseLikelihood.logFull(t, row, j, eta),
                Math.log(q) + ResponseLikelihood.logCoarse(channel, t, row, j, eta, -1, 0));
        double logAfter = ResponseLikelihood.logSum(Math.log1p(-q) + Math.log(weightAfter) + logFullMoved(t, row, j, eta, k, delta),
                Math.log(q) + ResponseLikelihood.logCoarse(channel, t, row, j, eta, k, delta));
        return logAfter - logBefore;
    }

    private static double logFullMoved(double[] t, int row, int j, double eta, int k, double delta) {
        double lower = t[row + j] + (j == k ? delta : 0);
        double upper = t[row + j + 1] + (j + 1 == k ? delta : 0);
        return StandardNormal.logIntervalProbability(lower - eta, upper - eta);
    }

    /**
     * Log prior ratio of the moved thresholds and level (MODEL.md 3 and 5): a group block moves
     * d[g] and alpha[g]; the common block moves c and mu_alpha, leaving every d[g] and
     * alpha[g] - mu_alpha as they were.
     */
    private double logPriorChange(double[] rows, int base, int k, double delta, int b) {
        ChainState s = state;
        double share = delta / cuts;
        double before = 0;
        double after = 0;
        boolean common = isCommon(b);
        for (int j = 1; j <= cuts; j++) {
            double reference = common ? 0 : s.common[j];
            double d = rows[base + j] - reference;
            double e = d - share + (j == k ? delta : 0);
            before += d * d;
            after += e * e;
        }
        double precision = common ? commonPriorPrecision : 1.0 / (s.thresholdSd * s.thresholdSd);
        double thresholdPart = -0.5 * precision * (after - before);
        double level = common ? s.level.mean : s.level.intercept[b];
        double shifted = level - share;
        double levelPart;
        if (!common) {
            double from = (level - s.level.mean) / s.level.sd;
            double to = (shifted - s.level.mean) / s.level.sd;
            levelPart = 0.5 * (from * from - to * to);
        } else {
            levelPart = groupMeanPrior.logDensity(shifted) - groupMeanPrior.logDensity(level);
        }
        return thresholdPart + levelPart;
    }

    /** A group block moves alpha[g]; the common block mu_alpha and every alpha[g] (MODEL.md 2). */
    private void shiftLevel(int b, double amount) {
        ChainState s = state;
        if (!isCommon(b)) {
            s.level.intercept[b] += amount;
            return;
        }
        s.level.shiftIntercepts(amount);
    }

    /** Share of accepted proposals while sampling. */
    double acceptanceRate() {
        return tried == 0 ? Double.NaN : (double) accepted / tried;
    }

    /** The adapted scales and counters; the per-respondent caches are rebuilt by {@link #refresh}. */
    @Override
    public void save(DataOutput out) throws IOException {
        Checkpointed.writeDoubles(out, logScale);
        out.writeInt(warmupStep);
        out.writeLong(accepted);
        out.writeLong(tried);
    }

    @Override
    public void restore(DataInput in) throws IOException {
        Checkpointed.readDoubles(in, logScale);
        warmupStep = in.readInt();
        accepted = in.readLong();
        tried = in.readLong();
    }
}
