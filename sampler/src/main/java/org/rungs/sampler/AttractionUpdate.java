package org.rungs.sampler;

import java.io.DataInput;
import java.io.DataOutput;
import java.io.IOException;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.rungs.models.ResponseLikelihood;
import org.rungs.models.RoundingChannel;
import org.rungs.priors.HalfNormal;
import org.rungs.priors.Normal;
import org.rungs.priors.Priors;
import org.rungs.priors.StandardNormal;

/**
 * The number attraction of MODEL.md 4b given the classes, with the latent levels and the
 * rejected draws integrated out: a full-scale respondent contributes
 * log pi[g,r](eta) + a[g,r] - log N_i, N_i = sum_k pi[g,k](eta_i) exp(a[g,k]), a coarse one
 * log P(r | coarse).
 *
 * <p>For each number j of A a joint move along the ridge that makes attraction hard to
 * tell from the width w of category j: abar[j] and every a[g,j] gain e while the common
 * category's two thresholds move about its midpoint to width w exp(-e), every group's pair by
 * the same amounts (deviations d unchanged); pi[j] exp(a[j]) stays nearly fixed. The Jacobian
 * exp(-e) enters the acceptance ratio (Green 1995, Reversible jump MCMC, Biometrika 82, section
 * 3.3); the moved thresholds keep their sum, so the levels stay. Then, group by group, a
 * random-walk Metropolis move of each a[g,j] alone. With several groups, the common terms abar[j] follow from
 * their conjugate normal full conditional given a[.,j] ~ Normal(abar[j], tau_a), tau_a by
 * slice sampling on its log (Neal 2003), and tau_a once more with the deviations scaled along
 * ({@link #spreadStep}), then a few block moves of tau_a with every a[g,j] redrawn from a
 * normal approximation of its full conditional ({@link #blockStep}). Each respondent's normal cdf at every threshold and
 * N_i come cached from the threshold update ({@link ChainState#cdf}), so the move of a[g,j]
 * alone costs one multiply-add and one ratio per respondent. The ridge moves and the block moves
 * use delayed acceptance (Christen & Fox 2005, Markov chain Monte Carlo
 * using an approximation, JCGS 14, section 2): a first stage on the likelihood read from a grid
 * of latent levels per group, and only for a proposal that passes it the exact ratio over the
 * respondents, divided by the first stage's. Scales adapt during warm-up only (Roberts &
 * Rosenthal 2009, section 3), on the acceptance of both stages together. All of these hold the
 * thresholds of the groups; {@link AttractionTradeUpdate}, next in the sweep, moves tau_a with them.
 */
final class AttractionUpdate implements Update, Checkpointed, SliceSampler.LogDensity {
    private static final double TARGET_ACCEPTANCE = 0.44;
    /**
     * Block moves of tau_a and the a[g,j] per sweep ({@link #blockStep}). On the attraction demo
     * (seeds 2 and 1) the bulk ESS of attraction_sd went from 24 and 50 without them to 91 and
     * 92 with one random-walk move, 125 and 153 with four, 202 and 146 with four of which every
     * second is an independence move; the demo took about a tenth longer.
     */
    static final int BLOCK_STEPS = 4;
    /**
     * Warm-up sweeps before log tau_a is recorded for the independence proposal, and how many
     * records it needs; the proposal's degrees of freedom and the widening of its scale.
     */
    private static final int SETTLING = 100;
    private static final int RECORDS = 50;
    private static final double FREEDOM = 5;
    private static final double WIDENING = 1.2;
    private final ChainState state;
    private final int blockSteps;
    /** Warm-up sweeps at the start during which the attractions are held at their initial values ({@link #held}). */
    private final int hold;
    private int warmupCalls;
    /** Whether the ridge moves take their first stage on the grid ({@link #ridgeChange}); false only in tests. */
    private final boolean ridgeFirstStage;
    private final UniformRandomProvider rng;
    private final ZigguratSampler.NormalizedGaussian normal;
    private final Normal meanPrior;
    private final HalfNormal sdPrior;
    private final SliceSampler slice;
    private final int[] attracted;
    /** eta_i per respondent, and per (group, category) cell its smallest and largest. */
    private final double[] eta;
    private final double[] etaLow;
    private final double[] etaHigh;
    /** exp(a[g,k]) - 1 by group and position. */
    private final double[] excess;
    /** Per respondent: the cdf at the two moved thresholds of a pending joint move. */
    private final double[] proposedLow;
    private final double[] proposedHigh;
    /** A group's thresholds as a joint move proposes them. */
    private final double[] scratch;
    /** Scratch of {@link #normaliserChange}: one group's exp(a) - 1 before and after, by position in A. */
    private final double[] weightBefore;
    private final double[] weightAfter;
    private final double[] logScale;
    private final double[] jointLogScale;
    private final double commonPriorPrecision;
    /** a[g,k] and exp(a[g,k]) - 1 under a proposed tau_a. */
    private final double[] proposed;
    private final double[] proposedExcess;
    private double spreadLogScale = Math.log(0.3);
    /** The block move of tau_a and every a[g,j] ({@link #blockStep}): proposal scale of log tau_a, and scratch. */
    private double blockLogScale = Math.log(0.5);
    /** log tau_a over warm-up after its first {@link #SETTLING} sweeps: count, sum, sum of squares. */
    private long spreadCount;
    private double spreadSum;
    private double spreadSquares;
    private final int[] fullAnswers;
    private final double[][] blockMode;
    private final double[][] blockFactor;
    private final double[] blockPoint;
    private final double[] blockExcess;
    private final double[] blockGradient;
    private final double[] blockCurvature;
    private final double[] blockShare;
    /** Per group, the likelihood's gradient (answers included) and curvature at abar: every fit's first Newton step. */
    private final double[] meanGradient;
    private final double[] meanCurvature;
    /**
     * The block moves' likelihood terms read per group from a grid of latent levels instead of per
     * respondent (see {@link #tabulate}): at most this many nodes per group, spaced as
     * {@link NormaliserGrid#SPACING} unless the group's range needs wider.
     */
    static final int BLOCK_NODES = 256;
    /** Per group: the first node's level, the spacing, the number of nodes. */
    private final double[] nodeLow;
    private final double[] nodeSpacing;
    private final int[] nodeCount;
    /** Per group and node: the full-scale respondents' Hermite weights (value, and spacing x slope). */
    private final double[] nodeWeight;
    private final double[] nodeSlopeWeight;
    /** Per group, node and attracted number k: pi_k at the node's level and its derivative there. */
    private final double[] nodeShare;
    private final double[] nodeShareSlope;
    private final double[] nodeCdf;
    private final double[] nodeDensity;
    private final double[] blockShareSlope;
    /**
     * The ridge moves' first stage ({@link #ridgeChange}): per group a grid of latent levels, at
     * most this many nodes, spaced at least as {@link NormaliserGrid#SPACING}; per group, class
     * (full-scale, coarse), answer and node the cubic Lagrange weights of the respondents; per
     * group, node and threshold the cdf at the node.
     */
    static final int RIDGE_NODES = 160;
    private final CubicSpread ridges;
    private final CubicSpread.Values etaValues;
    /** Per group and node: the full-scale respondents' weights summed over the answers. */
    private final double[] ridgeTotal;
    private final double[] ridgeCdf;
    private double sumOfSquares;
    private int warmupStep;

    private AttractionUpdate(ChainState state, Priors priors, UniformRandomProvider rng, int blockSteps, boolean ridgeFirstStage) {
        this(state, priors, rng, blockSteps, ridgeFirstStage, 0);
    }

    private AttractionUpdate(ChainState state, Priors priors, UniformRandomProvider rng, int blockSteps, boolean ridgeFirstStage,
                             int hold) {
        this.hold = hold;
        this.state = state;
        this.blockSteps = blockSteps;
        this.ridgeFirstStage = ridgeFirstStage;
        this.rng = rng;
        this.normal = ZigguratSampler.NormalizedGaussian.of(rng);
        this.meanPrior = priors.attractionMean();
        this.sdPrior = priors.attractionSd();
        this.slice = SliceSampler.of(rng, 1.0);
        this.attracted = state.attracted;
        int m = state.categories;
        this.eta = new double[state.size];
        this.etaLow = new double[state.groups * state.categories];
        this.etaHigh = new double[state.groups * state.categories];
        this.proposedLow = new double[state.size];
        this.proposedHigh = new double[state.size];
        this.excess = new double[state.groups * m];
        this.scratch = new double[m + 1];
        this.weightBefore = new double[attracted.length];
        this.weightAfter = new double[attracted.length];
        this.logScale = new double[state.groups * attracted.length];
        this.jointLogScale = new double[attracted.length];
        this.commonPriorPrecision = priors.threshold().precision();
        this.proposed = new double[state.groups * m];
        this.proposedExcess = new double[state.groups * m];
        int count = attracted.length;
        this.fullAnswers = new int[state.groups * count];
        this.blockMode = new double[][] {new double[state.groups * count], new double[state.groups * count]};
        this.blockFactor = new double[][] {new double[state.groups * count * count], new double[state.groups * count * count]};
        this.blockPoint = new double[count];
        this.blockExcess = new double[count];
        this.blockGradient = new double[count];
        this.blockCurvature = new double[count * count];
        this.blockShare = new double[count];
        this.meanGradient = new double[state.groups * count];
        this.meanCurvature = new double[state.groups * count * count];
        this.nodeLow = new double[state.groups];
        this.nodeSpacing = new double[state.groups];
        this.nodeCount = new int[state.groups];
        this.nodeWeight = new double[state.groups * BLOCK_NODES];
        this.nodeSlopeWeight = new double[state.groups * BLOCK_NODES];
        this.nodeShare = new double[state.groups * BLOCK_NODES * count];
        this.nodeShareSlope = new double[state.groups * BLOCK_NODES * count];
        this.nodeCdf = new double[m + 1];
        this.nodeDensity = new double[m + 1];
        this.blockShareSlope = new double[count];
        this.ridges = new CubicSpread(state.groups, m, RIDGE_NODES);
        this.etaValues = i -> eta[i];
        this.ridgeCdf = new double[state.groups * RIDGE_NODES * (m + 1)];
        this.ridgeTotal = new double[state.groups * RIDGE_NODES];
        for (int j = 0; j < attracted.length; j++) {
            jointLogScale[j] = Math.log(0.1);
            for (int g = 0; g < state.groups; g++) {
                long answers = state.start[g * m + attracted[j] + 1] - state.start[g * m + attracted[j]];
                logScale[g * attracted.length + j] = Math.log(2.0 / Math.sqrt(1.0 + answers));
            }
        }
    }

    static AttractionUpdate of(ChainState state, Priors priors, UniformRandomProvider rng) {
        return new AttractionUpdate(state, priors, rng, BLOCK_STEPS, true);
    }

    /**
     * As {@link #of(ChainState, Priors, UniformRandomProvider)}, holding the attractions at their
     * initial values for the first quarter of a warm-up of {@code warmup} sweeps. From the
     * initial levels and coefficients, at a million respondents, the attractions took up their
     * misfit in the first sweep (tau_a from 0.06 to 0.6, attractions from -3.6 to 2.5), which
     * stopped the latent steps ({@link BoundedRedrawSteps}) and so left the levels and coefficients
     * where they started until the joint step's build at half-way. Warm-up draws are discarded,
     * so the hold changes where sampling starts, not what it samples.
     */
    static AttractionUpdate held(ChainState state, Priors priors, UniformRandomProvider rng, int warmup) {
        return new AttractionUpdate(state, priors, rng, BLOCK_STEPS, true, warmup / 4);
    }

    /** With {@code blockSteps} block moves per sweep (0: none), for tests. */
    static AttractionUpdate of(ChainState state, Priors priors, UniformRandomProvider rng, int blockSteps) {
        return new AttractionUpdate(state, priors, rng, blockSteps, true);
    }

    /** For tests: without the ridge moves' first stage on the grid ({@link #ridgeChange}), plain Metropolis steps. */
    static AttractionUpdate withoutRidgeFirstStage(ChainState state, Priors priors, UniformRandomProvider rng) {
        return new AttractionUpdate(state, priors, rng, BLOCK_STEPS, false);
    }

    @Override
    public void update(boolean adapt) {
        if (adapt && warmupCalls++ < hold) {
            return;
        }
        ChainState s = state;
        cache();
        if (ridgeFirstStage) {
            tabulateRidges();
        }
        for (int j = 0; j < attracted.length; j++) {
            if (attracted[j] > 0 && attracted[j] < s.categories - 1) {
                jointStep(j, adapt);
            }
        }
        // group by group, so that a group's cdfs and N_i stay in the cache for all its numbers
        // (at a million respondents number by number read them from memory each time, about
        // 60 ns more per respondent per sweep)
        for (int g = 0; g < s.groups; g++) {
            for (int j = 0; j < attracted.length; j++) {
                step(g, j, adapt);
            }
        }
        if (s.groups > 1) {
            pool();
            spreadStep(adapt);
            if (blockSteps > 0) {
                blockStep(adapt);
            }
        }
        if (adapt) {
            warmupStep++;
        }
    }

    /** eta_i and exp(a) - 1; the cdfs and N_i are the threshold update's, still current. */
    private void cache() {
        ChainState s = state;
        for (int at = 0; at < excess.length; at++) {
            excess[at] = Math.expm1(s.attraction[at]);
        }
        int m = s.categories;
        for (int cell = 0; cell < etaLow.length; cell++) {
            double low = Double.POSITIVE_INFINITY;
            double high = Double.NEGATIVE_INFINITY;
            for (int i = s.start[cell]; i < s.start[cell + 1]; i++) {
                double x = s.eta(i);
                eta[i] = x;
                low = Math.min(low, x);
                high = Math.max(high, x);
            }
            etaLow[cell] = low;
            etaHigh[cell] = high;
        }
    }

    private boolean coarse(int i) {
        return state.coarse != null && state.coarse[i] == 1;
    }

    /** The joint move of abar[j], every a[g,j] and the width of category j (see the class comment). */
    private void jointStep(int j, boolean adapt) {
        ChainState s = state;
        int m = s.categories;
        int stride = m + 1;
        int k = attracted[j];
        double e = Math.exp(jointLogScale[j]) * normal.sample();
        double width = s.common[k + 1] - s.common[k];
        double h = 0.5 * width * -Math.expm1(-e);
        boolean accept = staysOrdered(s.common, 0, k, h);
        for (int g = 0; g < s.groups && accept; g++) {
            accept = staysOrdered(s.thresholds, g * stride, k, h);
        }
        if (accept) {
            double before = sq(s.common[k]) + sq(s.common[k + 1]);
            double after = sq(s.common[k] + h) + sq(s.common[k + 1] - h);
            double mean = s.attractionMean[k];
            double terms = -0.5 * commonPriorPrecision * (after - before)
                    + meanPrior.logDensity(mean + e) - meanPrior.logDensity(mean)
                    - e;
            double approximate = ridgeFirstStage ? ridgeChange(k, e, h) : Double.NaN;
            if (Double.isFinite(approximate)) {
                // delayed acceptance (Christen & Fox 2005, section 2), as in blockStep
                accept = Math.log(rng.nextDouble()) < terms + approximate
                        && Math.log(rng.nextDouble()) < jointLikelihoodChange(k, e, h) - approximate;
            } else {
                // the grid cannot say (a node's probability underflows): a plain Metropolis step;
                // whether this happens depends on the pair of states alone, either way round
                accept = Math.log(rng.nextDouble()) < terms + jointLikelihoodChange(k, e, h);
            }
        }
        if (accept) {
            s.common[k] += h;
            s.common[k + 1] -= h;
            s.attractionMean[k] += e;
            for (int g = 0; g < s.groups; g++) {
                int row = g * stride;
                s.thresholds[row + k] += h;
                s.thresholds[row + k + 1] -= h;
                double at = excess[g * m + k];
                s.attraction[g * m + k] += e;
                excess[g * m + k] = Math.expm1(s.attraction[g * m + k]);
                keepRidgeMove(g, k, at);
                if (ridgeFirstStage) {
                    ridgeCdfs(g, k, k + 1);
                }
            }
        }
        if (adapt) {
            jointLogScale[j] += Math.pow(warmupStep + 1.0, -0.6) * ((accept ? 1 : 0) - TARGET_ACCEPTANCE);
        }
    }

    /**
     * After an accepted ridge move of number k: group g's moved cdfs, as the exact stage computed
     * them for every respondent, and N_i moved by the same terms as there ({@link #normaliserChange}),
     * {@code at} being exp(a[g,k]) - 1 before the move: the three other columns and the other
     * attractions' terms do not change, so no pass over every attraction
     * ({@link ChainState#refreshNormalisers}, which the threshold refresh runs each sweep).
     */
    private void keepRidgeMove(int g, int k, double at) {
        ChainState s = state;
        int m = s.categories;
        int base = g * m;
        double[] cdf = s.cdf;
        double[] normaliser = s.normaliser;
        int low = k * s.size;
        int high = low + s.size;
        double below = excess[base + k - 1];
        double excessAfter = excess[base + k];
        double above = excess[base + k + 1];
        for (int i = s.start[base], to = s.start[base + m]; i < to; i++) {
            double lowBefore = cdf[low + i];
            double highBefore = cdf[high + i];
            double lowAfter = proposedLow[i];
            double highAfter = proposedHigh[i];
            normaliser[i] = normaliser[i]
                    + (lowAfter - lowBefore) * below
                    + (highAfter - lowAfter) * excessAfter - (highBefore - lowBefore) * at
                    + (highBefore - highAfter) * above;
            cdf[low + i] = lowAfter;
            cdf[high + i] = highAfter;
        }
    }

    /**
     * Spreads every respondent of each group over the nodes of the group's grid of latent levels
     * by its eta ({@link CubicSpread}); then the cdfs at the nodes.
     */
    private void tabulateRidges() {
        ChainState s = state;
        int m = s.categories;
        for (int g = 0; g < s.groups; g++) {
            ridges.spread(s, g, etaValues);
            if (ridges.count[g] == 0) {
                continue;
            }
            int full = ridges.first(g, 0, 0);
            for (int node = 0; node < ridges.count[g]; node++) {
                double total = 0;
                for (int r = 0; r < m; r++) {
                    total += ridges.weight[full + r * RIDGE_NODES + node];
                }
                ridgeTotal[g * RIDGE_NODES + node] = total;
            }
            ridgeCdfs(g, 1, m - 1);
        }
    }

    /** The cdfs at thresholds first..last at the nodes of group g's grid. */
    private void ridgeCdfs(int g, int first, int last) {
        ChainState s = state;
        int m = s.categories;
        int row = g * (m + 1);
        for (int node = 0; node < ridges.count[g]; node++) {
            double x = ridges.node(g, node);
            int at = (g * RIDGE_NODES + node) * (m + 1);
            ridgeCdf[at + m] = 1;
            for (int k = first; k <= last; k++) {
                ridgeCdf[at + k] = StandardNormal.cdf(s.thresholds[row + k] - x);
            }
        }
    }

    /**
     * {@link #jointLikelihoodChange} with each group's sum over respondents read from its grid
     * ({@link #tabulateRidges}): a fixed function of the two states, so a valid first stage. Not
     * finite where a node's probability underflows.
     */
    private double ridgeChange(int k, double e, double h) {
        ChainState s = state;
        int m = s.categories;
        int stride = m + 1;
        RoundingChannel channel = s.channel;
        double[] t = s.thresholds;
        double change = 0;
        for (int g = 0; g < s.groups; g++) {
            int row = g * stride;
            int base = g * m;
            System.arraycopy(t, row, scratch, 0, stride);
            scratch[k] += h;
            scratch[k + 1] -= h;
            double excessAfter = Math.expm1(s.attraction[base + k] + e);
            int full = ridges.first(g, 0, 0);
            int coarseClass = ridges.first(g, 1, 0);
            for (int node = 0; node < ridges.count[g]; node++) {
                double x = ridges.node(g, node);
                int at = (g * RIDGE_NODES + node) * stride;
                double weight = ridgeTotal[g * RIDGE_NODES + node];
                if (weight != 0) {
                    double n = ridgeNormaliser(at, base);
                    double below = ridgeCdf[at + k - 1];
                    double low = ridgeCdf[at + k];
                    double high = ridgeCdf[at + k + 1];
                    double above = ridgeCdf[at + k + 2];
                    double lowAfter = StandardNormal.cdf(scratch[k] - x);
                    double highAfter = StandardNormal.cdf(scratch[k + 1] - x);
                    double moved = n
                            + (lowAfter - low) * excess[base + k - 1]
                            + (highAfter - lowAfter) * excessAfter - (high - low) * excess[base + k]
                            + (high - highAfter) * excess[base + k + 1];
                    change += weight * Math.log(n / moved)
                            + ownChange(ridges.weight[full + (k - 1) * RIDGE_NODES + node], low - below, lowAfter - below)
                            + ownChange(ridges.weight[full + k * RIDGE_NODES + node], high - low, highAfter - lowAfter)
                            + ridges.weight[full + k * RIDGE_NODES + node] * e
                            + ownChange(ridges.weight[full + (k + 1) * RIDGE_NODES + node], above - high, above - highAfter);
                }
                for (int r = 0; channel != null && r < m; r++) {
                    double w = ridges.weight[coarseClass + r * RIDGE_NODES + node];
                    if (w != 0 && (channel.dependsOn(r, k) || channel.dependsOn(r, k + 1))) {
                        change += ownChange(w, ResponseLikelihood.coarse(channel, t, row, r, x, -1, 0),
                                ResponseLikelihood.coarse(channel, scratch, 0, r, x, -1, 0));
                    }
                }
            }
        }
        return change;
    }

    /** N = 1 + sum_k pi_k (exp(a[g,k]) - 1) at the node whose cdfs start at {@code at}, group g's attractions at {@code base}. */
    private double ridgeNormaliser(int at, int base) {
        double n = 1;
        for (int a : attracted) {
            n += (ridgeCdf[at + a + 1] - ridgeCdf[at + a]) * excess[base + a];
        }
        return n;
    }

    /** weight * log(after / before), 0 without weight. */
    private static double ownChange(double weight, double before, double after) {
        return weight == 0 ? 0 : weight * Math.log(after / before);
    }

    /** Whether thresholds k + h and k+1 - h of the row at {@code base} keep increasing order (MODEL.md 3). */
    private static boolean staysOrdered(double[] t, int base, int k, double h) {
        double lower = t[base + k] + h;
        double upper = t[base + k + 1] - h;
        return lower > t[base + k - 1] && lower < upper && upper < t[base + k + 2];
    }

    /** For tests: {@link #jointLikelihoodChange} on the current state, whose cdfs and N_i must be current. */
    double ridgeLikelihoodChange(int k, double e, double h) {
        cache();
        return jointLikelihoodChange(k, e, h);
    }

    /**
     * Log-likelihood change of every respondent when thresholds k and k+1 of every group move by
     * +h and -h and every a[g,k] gains e; (group, category) cell by cell, so that what the
     * category decides is decided once per cell. Leaves every respondent's moved cdfs in
     * {@link #proposedLow} and {@link #proposedHigh}.
     */
    private double jointLikelihoodChange(int k, double e, double h) {
        ChainState s = state;
        int m = s.categories;
        int stride = m + 1;
        double[] t = s.thresholds;
        RoundingChannel channel = s.channel;
        double change = 0;
        for (int g = 0; g < s.groups; g++) {
            System.arraycopy(t, g * stride, scratch, 0, stride);
            scratch[k] += h;
            scratch[k + 1] -= h;
            double excessAfter = Math.expm1(s.attraction[g * m + k] + e);
            for (int r = 0; r < m; r++) {
                int cell = g * m + r;
                int from = s.start[cell];
                int to = s.start[cell + 1];
                if (from == to) {
                    continue;
                }
                movedCdfs(from, to, scratch[k], scratch[k + 1], etaLow[cell], etaHigh[cell]);
                boolean own = r >= k - 1 && r <= k + 1;
                boolean coarseMoves = channel != null && (channel.dependsOn(r, k) || channel.dependsOn(r, k + 1));
                change += own || coarseMoves
                        ? bordering(from, to, g, r, k, e, excessAfter)
                        : normaliserChange(from, to, g * m, k, excessAfter);
            }
        }
        return change;
    }

    /**
     * Phi(lowAfter - eta_i) and Phi(highAfter - eta_i) for respondents from..to-1 into
     * {@link #proposedLow} and {@link #proposedHigh}; where every eta of the range (between
     * etaLow and etaHigh; rounding is monotone) keeps both inside the normal table, from the
     * table alone, bit for bit {@link StandardNormal#cdf}, in a loop without calls (DEVELOPERS.md,
     * "Benchmark").
     */
    private void movedCdfs(int from, int to, double lowAfter, double highAfter, double etaLow, double etaHigh) {
        double end = StandardNormal.TABLE_END;
        if (lowAfter - etaHigh > -end && highAfter - etaLow < end) {
            for (int i = from; i < to; i++) {
                double x = lowAfter - eta[i];
                double y = highAfter - eta[i];
                double tailX = StandardNormal.smallerTailInTable(x);
                double tailY = StandardNormal.smallerTailInTable(y);
                proposedLow[i] = x > 0 ? 1 - tailX : tailX;
                proposedHigh[i] = y > 0 ? 1 - tailY : tailY;
            }
        } else {
            for (int i = from; i < to; i++) {
                proposedLow[i] = StandardNormal.cdf(lowAfter - eta[i]);
                proposedHigh[i] = StandardNormal.cdf(highAfter - eta[i]);
            }
        }
    }

    /**
     * The change of a cell whose answer neither borders the moved thresholds nor, for a coarse
     * reporter, depends on them: only the full-scale respondents' N_i moves. The likelihoods after
     * and before in two running products, so that a respondent costs no division.
     */
    private double normaliserChange(int from, int to, int base, int k, double excessAfter) {
        ChainState s = state;
        int n = s.size;
        double[] cdf = s.cdf;
        double[] normaliser = s.normaliser;
        byte[] classes = s.coarse;
        int column = k * n;
        double below = excess[base + k - 1];
        double at = excess[base + k];
        double above = excess[base + k + 1];
        double change = 0;
        double after = 1;
        double before = 1;
        for (int i = from; i < to; i++) {
            if (classes != null && classes[i] == 1) {
                continue;
            }
            double low = cdf[column + i];
            double high = cdf[column + n + i];
            double lowAfter = proposedLow[i];
            double highAfter = proposedHigh[i];
            double current = normaliser[i];
            double moved = current
                    + (lowAfter - low) * below
                    + (highAfter - lowAfter) * excessAfter - (high - low) * at
                    + (high - highAfter) * above;
            // the likelihood is proportional to 1 / N_i
            after *= current;
            before *= moved;
            if (RunningProducts.outside(after, before)) {
                change += Math.log(after / before);
                after = 1;
                before = 1;
            }
        }
        return change + Math.log(after / before);
    }

    /** The change of a cell of answer r beside the moved thresholds, or a coarse point depending on them. */
    private double bordering(int from, int to, int g, int r, int k, double e, double excessAfter) {
        ChainState s = state;
        int m = s.categories;
        int row = g * (m + 1);
        int base = g * m;
        double[] t = s.thresholds;
        int n = s.size;
        double[] cdf = s.cdf;
        int column = k * n;
        RoundingChannel channel = s.channel;
        boolean coarseMoves = channel != null && (channel.dependsOn(r, k) || channel.dependsOn(r, k + 1));
        double change = 0;
        double product = 1;
        for (int i = from; i < to; i++) {
            double x = eta[i];
            int at = column + i;
            double lowAfter = proposedLow[i];
            double highAfter = proposedHigh[i];
            if (coarse(i)) {
                if (coarseMoves) {
                    // from the cached cdfs as for the full-scale answers below, above ChainState.EXACT_ENOUGH
                    double before = ChainState.coarseFromCdfs(channel, cdf, n, i, r, k, cdf[at], cdf[at + n]);
                    double after = ChainState.coarseFromCdfs(channel, cdf, n, i, r, k, lowAfter, highAfter);
                    if (before > ChainState.EXACT_ENOUGH && after > ChainState.EXACT_ENOUGH) {
                        product *= after / before;
                    } else {
                        change += ResponseLikelihood.logCoarse(channel, scratch, 0, r, x, -1, 0)
                                - ResponseLikelihood.logCoarse(channel, t, row, r, x, -1, 0);
                    }
                }
                continue;
            }
            double low = cdf[at];
            double high = cdf[at + n];
            double normaliser = s.normaliser[i];
            double moved = normaliser
                    + (lowAfter - low) * excess[base + k - 1]
                    + (highAfter - lowAfter) * excessAfter - (high - low) * excess[base + k]
                    + (high - highAfter) * excess[base + k + 1];
            product *= normaliser / moved;
            if (r >= k - 1 && r <= k + 1) {
                // from the cached cdfs: their differences carry an absolute error near 1e-16, so
                // above ChainState.EXACT_ENOUGH the ratio is good to 1e-10; below it, the tail-exact path
                double before = r == k ? high - low : r < k ? low - cdf[at - n] : cdf[at + 2 * n] - high;
                double after = r == k ? highAfter - lowAfter : r < k ? lowAfter - cdf[at - n] : cdf[at + 2 * n] - highAfter;
                if (before <= ChainState.EXACT_ENOUGH || after <= ChainState.EXACT_ENOUGH) {
                    before = ResponseLikelihood.full(t, row, r, x, -1, 0);
                    after = ResponseLikelihood.full(scratch, 0, r, x, -1, 0);
                }
                if (before > 1e-280 && after > 1e-280) {
                    product *= after / before;
                } else {
                    change += ResponseLikelihood.logFull(scratch, 0, r, x) - ResponseLikelihood.logFull(t, row, r, x);
                }
                if (r == k) {
                    change += e;
                }
            }
            if (product < RunningProducts.LOW || product > RunningProducts.HIGH) {
                change += Math.log(product);
                product = 1;
            }
        }
        return change + Math.log(product);
    }

    private static double sq(double x) {
        return x * x;
    }

    /** Log prior ratio of a[g,k] from {@code from} to {@code to}. */
    private double attractionPriorChange(int k, double from, double to) {
        ChainState s = state;
        if (s.groups > 1) {
            double mean = s.attractionMean[k];
            double sd = s.attractionSd;
            double a = (from - mean) / sd;
            double b = (to - mean) / sd;
            return 0.5 * (a * a - b * b);
        }
        return meanPrior.logDensity(to) - meanPrior.logDensity(from);
    }

    private void step(int g, int j, boolean adapt) {
        ChainState s = state;
        int m = s.categories;
        int k = attracted[j];
        int slot = g * attracted.length + j;
        double current = s.attraction[g * m + k];
        double proposed = current + Math.exp(logScale[slot]) * normal.sample();
        double oddsChange = Math.exp(proposed) - Math.exp(current);
        double terms = answers(g, k) * (proposed - current) + attractionPriorChange(k, current, proposed);
        int from = s.start[g * m];
        int to = s.start[(g + 1) * m];
        boolean accept = Math.log(rng.nextDouble()) < terms + stepLikelihoodChange(from, to, k, oddsChange);
        if (accept) {
            s.attraction[g * m + k] = proposed;
            if (s.groups == 1) {
                s.attractionMean[k] = proposed;
            }
            excess[g * m + k] = Math.expm1(proposed);
            int low = k * s.size;
            int high = low + s.size;
            for (int i = from; i < to; i++) {
                s.normaliser[i] += (s.cdf[high + i] - s.cdf[low + i]) * oddsChange;
            }
        }
        if (adapt) {
            logScale[slot] += Math.pow(warmupStep + 1.0, -0.6) * ((accept ? 1 : 0) - TARGET_ACCEPTANCE);
        }
    }

    /** For tests: the likelihood part of a move of a[g,k] alone to {@code proposed}. */
    double singleChange(int g, int k, double proposed) {
        int m = state.categories;
        double oddsChange = Math.exp(proposed) - Math.exp(state.attraction[g * m + k]);
        return stepLikelihoodChange(state.start[g * m], state.start[(g + 1) * m], k, oddsChange);
    }

    /** Sum over full-scale respondents from..to-1 of log N_i - log N_i' when exp(a[g,k]) grows by oddsChange. */
    private double stepLikelihoodChange(int from, int to, int k, double oddsChange) {
        ChainState s = state;
        double[] cdf = s.cdf;
        double[] normaliser = s.normaliser;
        byte[] classes = s.coarse;
        double change = 0;
        double after = 1;
        double before = 1;
        int low = k * s.size;
        int high = low + s.size;
        for (int i = from; i < to; i++) {
            if (classes != null && classes[i] == 1) {
                continue;
            }
            // the likelihood is proportional to 1 / N_i: two products, no division per respondent
            double n = normaliser[i];
            after *= n;
            before *= n + (cdf[high + i] - cdf[low + i]) * oddsChange;
            if (RunningProducts.outside(after, before)) {
                change += Math.log(after / before);
                after = 1;
                before = 1;
            }
        }
        return change + Math.log(after / before);
    }

    /** How many of group g's full-scale respondents answered position k (respondents are sorted by category). */
    private int answers(int g, int k) {
        ChainState s = state;
        int m = s.categories;
        int from = s.start[g * m + k];
        int to = s.start[g * m + k + 1];
        if (s.coarse == null) {
            return to - from;
        }
        int full = 0;
        for (int i = from; i < to; i++) {
            full += 1 - s.coarse[i];
        }
        return full;
    }

    /**
     * A move of tau_a that scales every deviation a[g,j] - abar[j] with it, on the likelihood: in
     * the centred moves tau_a can only follow the deviations and they only follow tau_a, which is
     * slow where tau_a is small (Yu & Meng 2011, To center or not to center, JCGS 20, section 2;
     * here a Metropolis step on log tau_a with the standardised deviations fixed, whose Jacobian
     * is tau_a'/tau_a).
     */
    private void spreadStep(boolean adapt) {
        ChainState s = state;
        int m = s.categories;
        double step = Math.exp(spreadLogScale) * normal.sample();
        double ratio = Math.exp(step);
        double logRatio = sdPrior.logDensity(s.attractionSd * ratio) - sdPrior.logDensity(s.attractionSd) + step;
        for (int g = 0; g < s.groups; g++) {
            for (int k : attracted) {
                int at = g * m + k;
                proposed[at] = s.attractionMean[k] + ratio * (s.attraction[at] - s.attractionMean[k]);
                proposedExcess[at] = Math.expm1(proposed[at]);
                logRatio += answers(g, k) * (proposed[at] - s.attraction[at]);
            }
        }
        logRatio += normaliserChange(null, proposedExcess);
        boolean accept = Math.log(rng.nextDouble()) < logRatio;
        if (accept) {
            s.attractionSd *= ratio;
            for (int g = 0; g < s.groups; g++) {
                for (int k : attracted) {
                    s.attraction[g * m + k] = proposed[g * m + k];
                    excess[g * m + k] = proposedExcess[g * m + k];
                }
                s.refreshNormalisers(g, s.start[g * m], s.start[(g + 1) * m]);
            }
        }
        if (adapt) {
            spreadLogScale += Math.pow(warmupStep + 1.0, -0.6) * ((accept ? 1 : 0) - TARGET_ACCEPTANCE);
        }
    }

    /**
     * tau_a and every a[g,j] in one Metropolis-Hastings step (Knorr-Held & Rue 2002, On block
     * updating in Markov random field models for disease mapping, Scandinavian Journal of
     * Statistics 29, section 3, from memory): log tau_a' = log tau_a + a normal step, then each
     * group's a[g,.] drawn from a normal approximation of its full conditional given tau_a' (the
     * mode by Newton's method from abar, the curvature there), accepted with the ratio of the
     * exact densities and of the approximations at tau_a' and tau_a. The centred and
     * non-centred moves above each hold one of tau_a and the deviations while the other moves,
     * and both conditionals are narrow; this one redraws the deviations at every proposed spread.
     * The approximation is a fixed function of tau_a, abar and the data, so the step is exact
     * whatever its quality, which only sets the acceptance rate.
     */
    private void blockStep(boolean adapt) {
        ChainState s = state;
        int m = s.categories;
        int count = attracted.length;
        for (int g = 0; g < s.groups; g++) {
            for (int j = 0; j < count; j++) {
                fullAnswers[g * count + j] = answers(g, attracted[j]);
            }
        }
        // The approximations depend on tau_a, abar, the levels, thresholds and classes, which none of
        // these steps changes: the current spread's is fitted once, then kept from step to step.
        // Every fit starts at abar, where the likelihood's terms do not depend on tau_a.
        for (int g = 0; g < s.groups; g++) {
            tabulate(g);
        }
        for (int g = 0; g < s.groups; g++) {
            for (int j = 0; j < count; j++) {
                blockPoint[j] = s.attractionMean[attracted[j]];
            }
            logDensityTerms(g, 0);
            System.arraycopy(blockGradient, 0, meanGradient, g * count, count);
            System.arraycopy(blockCurvature, 0, meanCurvature, g * count * count, count * count);
        }
        int here = 0;
        for (int g = 0; g < s.groups; g++) {
            if (!fitGroup(g, s.attractionSd, blockMode[here], blockFactor[here])) {
                return;
            }
        }
        boolean independent = !adapt && spreadCount >= RECORDS;
        double centre = spreadSum / Math.max(1, spreadCount);
        double scale = WIDENING * Math.sqrt(Math.max(1e-4, spreadSquares / Math.max(1, spreadCount) - centre * centre));
        for (int b = 0; b < blockSteps; b++) {
            int there = 1 - here;
            double sd = s.attractionSd;
            double logSd = Math.log(sd);
            double step;
            double proposalRatio = 0;
            if (independent && b % 2 == 1) {
                // log tau_a' from a Student t fitted to warm-up's log tau_a, whatever the current value
                double chi = 0;
                for (int f = 0; f < FREEDOM; f++) {
                    double z = normal.sample();
                    chi += z * z;
                }
                double next = centre + scale * normal.sample() / Math.sqrt(chi / FREEDOM);
                step = next - logSd;
                proposalRatio = logStudent((logSd - centre) / scale) - logStudent((next - centre) / scale);
            } else {
                step = Math.exp(blockLogScale) * normal.sample();
            }
            double sdAfter = sd * Math.exp(step);
            boolean accept = true;
            for (int g = 0; g < s.groups && accept; g++) {
                accept = fitGroup(g, sdAfter, blockMode[there], blockFactor[there]);
            }
            if (accept) {
                // delayed acceptance (Christen & Fox 2005, Markov chain Monte Carlo using an
                // approximation, JCGS 14, section 2): first on the likelihood read from the grid,
                // then, only if that accepts, on the exact likelihood over the grid's
                double terms = blockLogRatio(here, there, sd, sdAfter, step) + proposalRatio;
                double approximate = tabulatedChange();
                accept = Math.log(rng.nextDouble()) < terms + approximate
                        && Math.log(rng.nextDouble()) < exactChange() - approximate;
            }
            if (accept) {
                s.attractionSd = sdAfter;
                for (int g = 0; g < s.groups; g++) {
                    for (int k : attracted) {
                        s.attraction[g * m + k] = proposed[g * m + k];
                        excess[g * m + k] = proposedExcess[g * m + k];
                    }
                    s.refreshNormalisers(g, s.start[g * m], s.start[(g + 1) * m]);
                }
                here = there;
            }
            if (adapt) {
                blockLogScale += Math.pow(warmupStep + 1.0, -0.6) * ((accept ? 1 : 0) - TARGET_ACCEPTANCE) / blockSteps;
            }
        }
        if (adapt && warmupStep >= SETTLING) {
            double logSd = Math.log(s.attractionSd);
            spreadCount++;
            spreadSum += logSd;
            spreadSquares += logSd * logSd;
        }
    }

    /**
     * For tests: group g's likelihood gradient, then the lower triangle of minus its Hessian (row
     * by row, count x count), at a[g,.] = {@code point}, as the block moves read them.
     */
    double[] blockTerms(int g, double[] point) {
        int m = state.categories;
        int count = attracted.length;
        cache();
        for (int j = 0; j < count; j++) {
            fullAnswers[g * count + j] = answers(g, attracted[j]);
        }
        tabulate(g);
        System.arraycopy(point, 0, blockPoint, 0, count);
        logDensityTerms(g, 0);
        double[] out = new double[count + count * count];
        System.arraycopy(blockGradient, 0, out, 0, count);
        System.arraycopy(blockCurvature, 0, out, count, count * count);
        return out;
    }

    /**
     * {@link #exactChange} with each group's sum over respondents read from its grid of latent
     * levels ({@link #tabulate}: cubic Hermite, so within about 1e-7 relative on the demo's
     * groups): a fixed function of the attractions, tau_a and the levels, so a valid first stage.
     */
    private double tabulatedChange() {
        ChainState s = state;
        int m = s.categories;
        int count = attracted.length;
        double change = 0;
        for (int g = 0; g < s.groups; g++) {
            int first = g * BLOCK_NODES;
            for (int node = first; node < first + nodeCount[g]; node++) {
                double value = nodeWeight[node];
                double slope = nodeSlopeWeight[node];
                if (value == 0 && slope == 0) {
                    continue;
                }
                int c = node * count;
                double before = 1;
                double beforeSlope = 0;
                double after = 1;
                double afterSlope = 0;
                for (int j = 0; j < count; j++) {
                    int at = g * m + attracted[j];
                    before += nodeShare[c + j] * excess[at];
                    beforeSlope += nodeShareSlope[c + j] * excess[at];
                    after += nodeShare[c + j] * proposedExcess[at];
                    afterSlope += nodeShareSlope[c + j] * proposedExcess[at];
                }
                change += value * Math.log(before / after) + slope * (beforeSlope / before - afterSlope / after);
            }
        }
        return change;
    }

    /** log of the Student t density with {@link #FREEDOM} degrees of freedom at x, up to a constant. */
    private static double logStudent(double x) {
        return -0.5 * (FREEDOM + 1) * Math.log1p(x * x / FREEDOM);
    }

    /**
     * Draws every a[g,.] from the approximation in slot {@code there} into {@link #proposed} and
     * returns the log acceptance ratio of the move from (sd, a) to (sdAfter, a'), the current
     * spread's approximation in slot {@code here}, but for the part through the normalisers N_i
     * ({@link #exactChange}, approximated by {@link #tabulatedChange}).
     */
    private double blockLogRatio(int here, int there, double sd, double sdAfter, double step) {
        ChainState s = state;
        int m = s.categories;
        int count = attracted.length;
        double logRatio = sdPrior.logDensity(sdAfter) - sdPrior.logDensity(sd) + step;
        for (int g = 0; g < s.groups; g++) {
            int at = g * count;
            for (int j = 0; j < count; j++) {
                blockPoint[j] = normal.sample();
            }
            solveTransposed(blockFactor[there], g, blockPoint);
            for (int j = 0; j < count; j++) {
                proposed[g * m + attracted[j]] = blockMode[there][at + j] + blockPoint[j];
            }
            // q(a | sd) / q(a' | sdAfter), then the prior of the a's and the answers' own terms
            logRatio += logApproximation(g, here, s.attraction) - logApproximation(g, there, proposed);
            for (int j = 0; j < count; j++) {
                int k = attracted[j];
                double mean = s.attractionMean[k];
                double before = (s.attraction[g * m + k] - mean) / sd;
                double after = (proposed[g * m + k] - mean) / sdAfter;
                logRatio += 0.5 * (before * before - after * after) - step
                        + fullAnswers[at + j] * (proposed[g * m + k] - s.attraction[g * m + k]);
                proposedExcess[g * m + k] = Math.expm1(proposed[g * m + k]);
            }
        }
        return logRatio;
    }

    /**
     * Sum over full-scale respondents of log N_i - log N_i' for the proposed attractions
     * ({@link #proposedExcess}) against the current ones, from the cached cdfs: the exact part of
     * a block move's ratio.
     */
    private double exactChange() {
        return normaliserChange(excess, proposedExcess);
    }

    /**
     * For tests: the exact stage of the block moves (or, with {@code cachedBefore}, of the spread
     * move, which reads the cached N_i) for the attractions {@code proposedAttraction}, by group
     * and position.
     */
    double normaliserChange(double[] proposedAttraction, boolean cachedBefore) {
        cache();
        for (int at = 0; at < proposedExcess.length; at++) {
            proposedExcess[at] = Math.expm1(proposedAttraction[at]);
        }
        return normaliserChange(cachedBefore ? null : excess, proposedExcess);
    }

    /**
     * Sum over full-scale respondents of log N_i - log N_i', N_i' from the cached cdfs and the
     * attractions' exp(a) - 1 in {@code after} (by group and position), N_i likewise from
     * {@code before}, or the cached N_i where that is null. Group by group, with the likelihoods
     * after and before in two running products, so that a respondent costs no division.
     */
    private double normaliserChange(double[] before, double[] after) {
        ChainState s = state;
        int m = s.categories;
        int n = s.size;
        int na = attracted.length;
        double[] cdf = s.cdf;
        byte[] classes = s.coarse;
        double change = 0;
        double likelihoodAfter = 1;
        double likelihoodBefore = 1;
        for (int g = 0; g < s.groups; g++) {
            for (int j = 0; j < na; j++) {
                weightBefore[j] = before == null ? 0 : before[g * m + attracted[j]];
                weightAfter[j] = after[g * m + attracted[j]];
            }
            for (int i = s.start[g * m], end = s.start[(g + 1) * m]; i < end; i++) {
                if (classes != null && classes[i] == 1) {
                    continue;
                }
                double normaliserBefore = 1;
                double normaliserAfter = 1;
                for (int j = 0; j < na; j++) {
                    int k = attracted[j];
                    double pi = cdf[(k + 1) * n + i] - cdf[k * n + i];
                    normaliserBefore += pi * weightBefore[j];
                    normaliserAfter += pi * weightAfter[j];
                }
                // the likelihood is proportional to 1 / N_i
                likelihoodAfter *= before == null ? s.normaliser[i] : normaliserBefore;
                likelihoodBefore *= normaliserAfter;
                if (RunningProducts.outside(likelihoodAfter, likelihoodBefore)) {
                    change += Math.log(likelihoodAfter / likelihoodBefore);
                    likelihoodAfter = 1;
                    likelihoodBefore = 1;
                }
            }
        }
        return change + Math.log(likelihoodAfter / likelihoodBefore);
    }

    /**
     * The normal approximation of group g's a[g,.] given tau_a = sd: Newton's method from abar on
     * sum over its full-scale respondents of (a[r] - log N_i) plus the normal prior (concave: a
     * log-sum-exp and a quadratic), steps capped at 1, until the squared Newton decrement falls
     * below 1e-12 or after 50 steps; the mode to {@code mode}, the lower Cholesky factor L of minus
     * the Hessian at the last step's start (precision L L') to {@code factor}. False if that fails.
     */
    private boolean fitGroup(int g, double sd, double[] mode, double[] factor) {
        ChainState s = state;
        int m = s.categories;
        int count = attracted.length;
        int at = g * count;
        double precision = 1 / (sd * sd);
        for (int j = 0; j < count; j++) {
            blockPoint[j] = s.attractionMean[attracted[j]];
        }
        for (int iteration = 0; iteration < 50; iteration++) {
            if (iteration == 0) {
                System.arraycopy(meanGradient, at, blockGradient, 0, count);
                System.arraycopy(meanCurvature, at * count, blockCurvature, 0, count * count);
            } else {
                logDensityTerms(g, precision);
            }
            int f = at * count;
            for (int j = 0; j < count; j++) {
                for (int l = 0; l <= j; l++) {
                    factor[f + j * count + l] = blockCurvature[j * count + l] + (j == l ? precision : 0);
                }
            }
            if (!Cholesky.factor(factor, f, factor, f, count)) {
                return false;
            }
            // the Newton step: (L L') delta = gradient
            double[] delta = blockShare;
            System.arraycopy(blockGradient, 0, delta, 0, count);
            Cholesky.solveLower(factor, f, count, delta);
            double decrement = 0;
            for (int j = 0; j < count; j++) {
                decrement += delta[j] * delta[j];
            }
            Cholesky.solveUpper(factor, f, count, delta);
            double largest = 0;
            for (int j = 0; j < count; j++) {
                largest = Math.max(largest, Math.abs(delta[j]));
            }
            double scale = largest > 1 ? 1 / largest : 1;
            for (int j = 0; j < count; j++) {
                blockPoint[j] += scale * delta[j];
            }
            if (!(decrement >= 1e-12)) {
                break;
            }
        }
        for (int j = 0; j < count; j++) {
            if (!Double.isFinite(blockPoint[j])) {
                return false;
            }
            mode[at + j] = blockPoint[j];
        }
        return true;
    }

    /**
     * Group g's full-scale respondents on a grid of latent levels, for {@link #logDensityTerms}:
     * each adds its cubic Hermite basis at its eta to the weights of the two nodes around it, and
     * each node keeps pi_k and its derivative in eta for the attracted numbers. A sum over the
     * respondents of a smooth function of eta is then a sum over the nodes of the weights times
     * the function and its slope there: the sum of the function's Hermite interpolants at the
     * respondents' levels, within about 1e-7 of the exact sum (nodes 1/8 apart), at a cost per
     * Newton step that does not grow with the survey. The approximation only shapes the block
     * moves' proposal, a fixed function of the levels, thresholds, classes, abar and the proposed
     * tau_a, so the moves stay exact.
     */
    private void tabulate(int g) {
        ChainState s = state;
        int m = s.categories;
        int count = attracted.length;
        int from = s.start[g * m];
        int to = s.start[(g + 1) * m];
        double low = Double.POSITIVE_INFINITY;
        double high = Double.NEGATIVE_INFINITY;
        for (int i = from; i < to; i++) {
            if (!coarse(i)) {
                low = Math.min(low, eta[i]);
                high = Math.max(high, eta[i]);
            }
        }
        if (low > high) {
            nodeCount[g] = 0;
            return;
        }
        double h = Math.max(NormaliserGrid.SPACING, (high - low) / (BLOCK_NODES - 2));
        int nodes = Math.min(BLOCK_NODES, (int) Math.ceil((high - low) / h) + 2);
        int first = g * BLOCK_NODES;
        nodeLow[g] = low;
        nodeSpacing[g] = h;
        nodeCount[g] = nodes;
        java.util.Arrays.fill(nodeWeight, first, first + nodes, 0);
        java.util.Arrays.fill(nodeSlopeWeight, first, first + nodes, 0);
        for (int i = from; i < to; i++) {
            if (coarse(i)) {
                continue;
            }
            double t = (eta[i] - low) / h;
            int j = Math.min(nodes - 2, (int) t);
            double u = t - j;
            double r = 1 - u;
            nodeWeight[first + j] += (1 + 2 * u) * r * r;
            nodeSlopeWeight[first + j] += h * u * r * r;
            nodeWeight[first + j + 1] += u * u * (3 - 2 * u);
            nodeSlopeWeight[first + j + 1] += h * u * u * (u - 1);
        }
        int base = g * (m + 1);
        nodeCdf[m] = 1;
        for (int j = 0; j < nodes; j++) {
            double x = low + j * h;
            for (int k = 1; k < m; k++) {
                nodeCdf[k] = StandardNormal.cdf(s.thresholds[base + k] - x, nodeDensity, k);
            }
            int at = (first + j) * count;
            for (int a = 0; a < count; a++) {
                int k = attracted[a];
                nodeShare[at + a] = nodeCdf[k + 1] - nodeCdf[k];
                // d/d eta [Phi(c_{k+1} - eta) - Phi(c_k - eta)] = phi(c_k - eta) - phi(c_{k+1} - eta)
                nodeShareSlope[at + a] = nodeDensity[k] - nodeDensity[k + 1];
            }
        }
    }

    /**
     * At a[g,.] = {@link #blockPoint}: the gradient of group g's full-scale likelihood, sum over its
     * respondents of (a[r] - log N_i), plus that of the normal prior with mean abar and the given
     * precision, to {@link #blockGradient}; minus the likelihood's Hessian (lower triangle) to
     * {@link #blockCurvature}. With precision 0 (the prior's term is then exactly 0 at abar) the
     * likelihood's alone. The sum over respondents is read from the grid of {@link #tabulate}: with
     * w_k = pi_k exp(a_k) / N, each respondent adds -w to the gradient and diag(w) - w w' to the
     * curvature, and each node the same, and their slopes in eta, times its weights.
     */
    private void logDensityTerms(int g, double precision) {
        ChainState s = state;
        int count = attracted.length;
        int at = g * count;
        for (int j = 0; j < count; j++) {
            blockExcess[j] = Math.expm1(blockPoint[j]);
            blockGradient[j] = fullAnswers[at + j] - precision * (blockPoint[j] - s.attractionMean[attracted[j]]);
        }
        java.util.Arrays.fill(blockCurvature, 0);
        int first = g * BLOCK_NODES;
        for (int node = first; node < first + nodeCount[g]; node++) {
            double value = nodeWeight[node];
            double slope = nodeSlopeWeight[node];
            if (value == 0 && slope == 0) {
                continue;
            }
            int c = node * count;
            double n = 1;
            double nSlope = 0;
            for (int j = 0; j < count; j++) {
                n += nodeShare[c + j] * blockExcess[j];
                nSlope += nodeShareSlope[c + j] * blockExcess[j];
            }
            for (int j = 0; j < count; j++) {
                double odds = (blockExcess[j] + 1) / n;
                double w = nodeShare[c + j] * odds;
                blockShare[j] = w;
                blockShareSlope[j] = nodeShareSlope[c + j] * odds - w * nSlope / n;
            }
            for (int j = 0; j < count; j++) {
                double w = blockShare[j];
                double ws = blockShareSlope[j];
                double both = value * w + slope * ws;
                blockGradient[j] -= both;
                blockCurvature[j * count + j] += both;
                for (int l = 0; l <= j; l++) {
                    blockCurvature[j * count + l] -= value * w * blockShare[l] + slope * (ws * blockShare[l] + w * blockShareSlope[l]);
                }
            }
        }
    }

    /** log q(a[g,.]) of the approximation in {@code slot}, up to the constant shared by both slots: log det L - |L'(a - mode)|^2 / 2. */
    private double logApproximation(int g, int slot, double[] values) {
        int m = state.categories;
        int count = attracted.length;
        int at = g * count;
        double[] factor = blockFactor[slot];
        int f = at * count;
        double log = 0;
        double square = 0;
        for (int j = 0; j < count; j++) {
            // (L' x)_j = sum over l >= j of L[l][j] x_l
            double v = 0;
            for (int l = j; l < count; l++) {
                v += factor[f + l * count + j] * (values[g * m + attracted[l]] - blockMode[slot][at + l]);
            }
            square += v * v;
            log += Math.log(factor[f + j * count + j]);
        }
        return log - 0.5 * square;
    }

    /** Solves L' x = v in place with group g's factor: x ~ N(0, (L L')^-1) when v ~ N(0, I). */
    private void solveTransposed(double[] factor, int g, double[] v) {
        int count = attracted.length;
        Cholesky.solveUpper(factor, g * count * count, count, v);
    }

    /** abar[j] given a[.,j] (conjugate normal), then tau_a given the deviations (slice on log tau_a). */
    private void pool() {
        ChainState s = state;
        int m = s.categories;
        int groups = s.groups;
        double dataPrecision = groups / (s.attractionSd * s.attractionSd);
        sumOfSquares = 0;
        for (int k : attracted) {
            double sum = 0;
            for (int g = 0; g < groups; g++) {
                sum += s.attraction[g * m + k];
            }
            double precision = meanPrior.precision() + dataPrecision;
            double mean = (meanPrior.precision() * meanPrior.mean() + dataPrecision * sum / groups) / precision;
            s.attractionMean[k] = mean + normal.sample() / Math.sqrt(precision);
            for (int g = 0; g < groups; g++) {
                double d = s.attraction[g * m + k] - s.attractionMean[k];
                sumOfSquares += d * d;
            }
        }
        s.attractionSd = Math.exp(slice.sample(Math.log(s.attractionSd), this));
    }

    /** Log density of log tau_a: Half-Normal(tau) tau^-(G |A|) exp(-SS / (2 tau^2)) times the Jacobian tau. */
    @Override
    public double at(double logSd) {
        double sd = Math.exp(logSd);
        return sdPrior.logDensity(sd) - state.groups * attracted.length * logSd - sumOfSquares / (2 * sd * sd) + logSd;
    }

    @Override
    public void save(DataOutput out) throws IOException {
        Checkpointed.writeDoubles(out, logScale);
        Checkpointed.writeDoubles(out, jointLogScale);
        Checkpointed.writeDouble(out, spreadLogScale);
        Checkpointed.writeDouble(out, blockLogScale);
        out.writeLong(spreadCount);
        Checkpointed.writeDouble(out, spreadSum);
        Checkpointed.writeDouble(out, spreadSquares);
        out.writeInt(warmupStep);
        out.writeInt(warmupCalls);
    }

    @Override
    public void restore(DataInput in) throws IOException {
        Checkpointed.readDoubles(in, logScale);
        Checkpointed.readDoubles(in, jointLogScale);
        spreadLogScale = Checkpointed.readDouble(in);
        blockLogScale = Checkpointed.readDouble(in);
        spreadCount = in.readLong();
        spreadSum = Checkpointed.readDouble(in);
        spreadSquares = Checkpointed.readDouble(in);
        warmupStep = in.readInt();
        warmupCalls = in.readInt();
    }
}
