package org.rungs.sampler;

import java.io.DataInput;
import java.io.DataOutput;
import java.io.IOException;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.rungs.models.ResponseLikelihood;
import org.rungs.models.RoundingChannel;
import org.rungs.priors.HalfNormal;
import org.rungs.priors.Priors;
import org.rungs.priors.StandardNormal;

/**
 * A move of tau_a together with every group's thresholds and level (MODEL.md 3, 4b), on the
 * likelihood with the latent levels integrated out, in by-group mode with several groups.
 *
 * <p>A group's share of a number can come from its attraction or from the width its thresholds
 * give the number, and the moves of {@link AttractionUpdate} hold the thresholds: given them the
 * data pin the attractions and so tau_a (on the attraction demo, log tau_a moves with an sd of
 * about 0.15 under those moves alone, against 1.07 in the posterior). Here tau_a and every
 * deviation t[g,j] = a[g,j] - abar[j] are multiplied by one factor f, and each group's thresholds
 * and level alpha[g] are mapped so that the category probabilities at eta = alpha[g] are those
 * before, reweighted by exp(-Delta[g,k]), Delta = (f - 1) t the change of the attractions: at the
 * group's centre, a full-scale respondent's probabilities of MODEL.md 4b stay the same.
 *
 * <p>The map, per group: u_k = Phi(c[g,k] - alpha[g]), the probabilities p_k = u_(k+1) - u_k,
 * p'_k = p_k exp(-Delta_k) / Z, Z = sum_k p_k exp(-Delta_k), u' their cumulative sums,
 * q'_k = Phi^-1(u'_k); then alpha' = (sum_k c[g,k] - sum_k q'_k) / (M - 1) keeps the thresholds'
 * sum (MODEL.md 3) and c'[g,k] = alpha' + q'_k. On the thresholds' plane, (alpha[g], c[g,.]) and
 * u are one-to-one, the Jacobian of (alpha, c) with respect to u being a constant times
 * prod_k 1 / phi(q_k); p -> p' has Jacobian prod_k p'_k / p_k (additive log-ratios, Aitchison
 * 1986, The Statistical Analysis of Compositional Data, section 2.8, move by a constant). The
 * maps for f and f' compose to the map for f f', so a random walk on log f with the Jacobian is
 * a Metropolis-Hastings step (Liu & Sabatti 2000, Biometrika 87, section 3). Its log ratio: the
 * prior of tau_a with the Jacobian f on log tau_a (the standardised deviations' prior does not
 * change), the priors of alpha[g] and d[g,.], sum_k (-Delta_k - log Z) + log phi(q_k) -
 * log phi(q'_k), and the likelihood over every respondent (classes given), whose cdfs and N_i
 * at the proposal are written to {@link ChainState#spareCdf} and swapped in on acceptance.
 *
 * <p>The ridge move. Scaling every deviation by one factor also scales the deviations that only
 * noise supports, and where tau_a is large that moves every group's thresholds away from the
 * common row, which the deviations' prior refuses (on the attraction demo, above tau_a = 0.08, a
 * trade of log f = -0.8 was accepted 16% of the time, of +0.8 never). The ridge move instead
 * draws, after a random-walk step of log tau_a, each group's changes Delta of its attractions
 * from a normal approximation of their conditional along the same map (after Knorr-Held & Rue
 * 2002, block updating in Markov random field models): the attractions' prior at the new
 * tau_a, the priors of d[g,.] and alpha[g] through the map linearised at Delta = 0, and the
 * grid's likelihood to second order ({@link #ridgeProposal}); the map then moves the thresholds
 * and level with Delta. Since the map for -Delta undoes the map for Delta, the move from
 * (tau_a, a, c) with (step, Delta) and back with (-step, -Delta) is an involution whose
 * Jacobian is the map's (Green 1995, Biometrika 82, section 3.3), so the ratio is the trade's
 * with the attractions' prior written out and the reverse proposal's density at the new state
 * and the old tau_a over the forward one's. Delayed acceptance and the bound as for the trade.
 *
 * <p>A proposal whose attractions cross the bound of {@link BoundedRedrawSteps} (in or out) is
 * refused: the indicator is symmetric in the two states, so the step stays exact, and a chain
 * inside the bound is not carried out of it by this step, where the latent steps and the level's
 * regression would stop (in calibration fits of 3 groups of 40 with every answer on the top
 * number, the step without this rule left chains stuck there, R-hat up to 2.2).
 *
 * <p>Delayed acceptance (Christen & Fox 2005, Markov chain Monte Carlo using an approximation,
 * JCGS 14, section 2): a first stage on the likelihood read from a grid per group
 * ({@link #tabulate}), and only for a proposal that passes it the exact ratio over the
 * respondents, divided by the first stage's. The grid lies in x'beta, which the step does not
 * move, so the approximation is a fixed function of the state; where it is not finite at either
 * state the step takes the exact ratio alone, a rule symmetric in the two states.
 *
 * <p>A step that passes the first stage reads every respondent once (M - 1 normal cdfs each). The
 * trade runs {@link #TRADES} times and the ridge move {@link #RIDGES} times per sweep (the ridge
 * move from half-way through warm-up) up to {@link #FULL_RATE_SIZE} respondents, and
 * proportionally less often above (a random count per sweep with that mean), so that at a
 * million respondents they cost a few nanoseconds per respondent per sweep.
 */
final class AttractionTradeUpdate implements Update, Checkpointed {
    private static final double TARGET_ACCEPTANCE = 0.44;
    /**
     * Trade steps per sweep on surveys of at most {@link #FULL_RATE_SIZE} respondents. Attraction
     * demo, every second iteration kept: one step per sweep gave attraction_sd a bulk ESS of 437
     * and 435 on seeds 2 and 1, two 238 on seed 1; every fourth kept, two gave 906 on seed 2.
     */
    static final double TRADES = 2;
    /**
     * Ridge moves per sweep on surveys of at most {@link #FULL_RATE_SIZE} respondents (class
     * comment). Attraction demo, 2 chains of 1,000 + 2,000, every iteration kept: attraction_sd's
     * bulk ESS 498 against 241 without them (seed 1), the smallest of any parameter 288 against 169.
     */
    static final double RIDGES = 2;
    private static final double RIDGE_ACCEPTANCE = 0.3;
    static final int FULL_RATE_SIZE = 25_000;
    private final ChainState state;
    private final UniformRandomProvider rng;
    private final ZigguratSampler.NormalizedGaussian normal;
    private final HalfNormal sdPrior;
    private final double rate;
    /** The bound of {@link BoundedRedrawSteps} on the attractions' range in a group. */
    private final double maxRange;
    private final int m;
    private final int stride;
    private final double[] proposedRows;
    private final double[] proposedIntercept;
    private final double[] proposedAttraction;
    /** Per group and position: Delta, then scratch for the probabilities at the centre and the new cumulative sums. */
    private final double[] delta;
    private final double[] share;
    private final double[] quantile;
    /** One group's attractions, for the log-space path of {@link #likelihoodChange}; its exp(a) - 1 and exp(a) after and before. */
    private final double[] groupAttraction;
    private final double[] excessAfter;
    private final double[] oddsAfter;
    private final double[] oddsBefore;
    private double logScale = Math.log(0.3);
    private int warmupSteps;
    /** Ridge moves per sweep (mean), and the warm-up sweeps after which they start. */
    private final double ridgeRate;
    private final int ridgeStart;
    private int warmupCalls;
    private double ridgeLogScale = Math.log(1.2);
    private int ridgeWarmupSteps;
    /** The grid's likelihood at the proposal of the last {@link #decide}. */
    private double nextGrid;
    /**
     * Scratch of the ridge move's proposal ({@link #ridgeProposal}), by position in A: the map's
     * d q'_k / d Delta_j (k by row), d alpha' / d Delta_j, the precision's lower triangle and its
     * Cholesky factor, the mean, a draw; per node: exp(a), the densities, the gradient that every
     * full-scale answer shares and one answer's; the coarse answers' coefficients on the cdfs.
     */
    private final double[] ridgeSlope;
    private final double[] ridgeLevel;
    private final double[] ridgePrecision;
    private final double[] ridgeFactor;
    private final double[] ridgeMean;
    private final double[] ridgeDraw;
    private final double[] ridgeOdds;
    private final double[] nodeDensity;
    private final double[] ridgeShared;
    private final double[] ridgeAnswer;
    private final double[] coarseCoefficient;
    /** The first stage's grid in x'beta ({@link #tabulate}), at most this many nodes per group; scratch for the cdfs at a node and a group's exp(a) - 1. */
    static final int NODES = 160;
    private final CubicSpread grid;
    private final CubicSpread.Values covariatePart;
    private final double[] nodeCdf;
    private final double[] nodeExcess;

    private AttractionTradeUpdate(ChainState state, Priors priors, UniformRandomProvider rng, double maxRange, double ridges,
                                  int warmup) {
        this.state = state;
        this.maxRange = maxRange;
        this.rng = rng;
        this.normal = ZigguratSampler.NormalizedGaussian.of(rng);
        this.sdPrior = priors.attractionSd();
        this.rate = TRADES * Math.min(1, FULL_RATE_SIZE / (double) Math.max(1, state.size));
        this.m = state.categories;
        this.stride = m + 1;
        this.proposedRows = new double[state.thresholds.length];
        this.proposedIntercept = new double[state.groups];
        this.proposedAttraction = new double[state.attraction.length];
        this.delta = new double[state.attraction.length];
        this.share = new double[m];
        this.quantile = new double[m];
        this.groupAttraction = new double[m];
        this.excessAfter = new double[m];
        this.oddsAfter = new double[m];
        this.oddsBefore = new double[m];
        this.grid = new CubicSpread(state.groups, m, NODES);
        this.covariatePart = state.level::covariatePart;
        this.nodeCdf = new double[m + 1];
        this.nodeExcess = new double[m];
        this.ridgeRate = ridges * Math.min(1, FULL_RATE_SIZE / (double) Math.max(1, state.size));
        this.ridgeStart = warmup / 2;
        int size = state.attracted.length;
        this.ridgeSlope = new double[m * size];
        this.ridgeLevel = new double[size];
        this.ridgePrecision = new double[size * size];
        this.ridgeFactor = new double[size * size];
        this.ridgeMean = new double[size];
        this.ridgeDraw = new double[size];
        this.ridgeOdds = new double[m];
        this.nodeDensity = new double[m + 1];
        this.ridgeShared = new double[size];
        this.ridgeAnswer = new double[size];
        this.coarseCoefficient = new double[m * m];
        if (state.channel != null) {
            // a coarse answer's probability is linear in the cdfs at the thresholds
            double[] unit = new double[m + 1];
            unit[m] = 1;
            for (int r = 0; r < m; r++) {
                if (!state.channel.isPoint(r)) {
                    continue;
                }
                double base = ChainState.coarseFromCdfs(state.channel, unit, 1, 0, r, -2, 0, 0);
                for (int k = 1; k < m; k++) {
                    unit[k] = 1;
                    coarseCoefficient[r * m + k] = ChainState.coarseFromCdfs(state.channel, unit, 1, 0, r, -2, 0, 0) - base;
                    unit[k] = 0;
                }
            }
        }
    }

    /** The step, or null where it does not apply (attraction off, shared thresholds or one group). */
    static AttractionTradeUpdate of(ChainState state, Priors priors, UniformRandomProvider rng) {
        return of(state, priors, rng, BoundedRedrawSteps.MAX_RANGE);
    }

    /** maxRange: that of the chain's {@link BoundedRedrawSteps}. */
    static AttractionTradeUpdate of(ChainState state, Priors priors, UniformRandomProvider rng, double maxRange) {
        return of(state, priors, rng, maxRange, RIDGES, 0);
    }

    /** ridges: ridge moves per sweep on small surveys (0: none); they start half-way through the warm-up's sweeps. */
    static AttractionTradeUpdate of(ChainState state, Priors priors, UniformRandomProvider rng, double maxRange, double ridges,
                                    int warmup) {
        return state.attractionOn() && state.byGroup && state.groups > 1
                ? new AttractionTradeUpdate(state, priors, rng, maxRange, ridges, warmup) : null;
    }

    @Override
    public void update(boolean adapt) {
        int steps = (int) rate;
        if (rng.nextDouble() < rate - steps) {
            steps++;
        }
        if (adapt) {
            warmupCalls++;
        }
        int ridges = 0;
        if (!adapt || warmupCalls > ridgeStart) {
            ridges = (int) ridgeRate;
            if (ridgeRate > ridges && rng.nextDouble() < ridgeRate - ridges) {
                ridges++;
            }
        }
        double current = steps + ridges > 0 ? tabulate() : 0;
        for (int b = 0; b < steps; b++) {
            double step = Math.exp(logScale) * normal.sample();
            double factor = Math.exp(step);
            boolean accept = decide(proposalChange(factor), current);
            if (accept) {
                keep(factor);
                current = nextGrid;
            }
            if (adapt) {
                logScale += Math.pow(++warmupSteps, -0.6) * ((accept ? 1 : 0) - TARGET_ACCEPTANCE);
            }
        }
        for (int b = 0; b < ridges; b++) {
            double step = Math.exp(ridgeLogScale) * normal.sample();
            boolean accept = decide(ridgeChange(step), current);
            if (accept) {
                keep(Math.exp(step));
                current = nextGrid;
            }
            if (adapt) {
                ridgeLogScale += Math.pow(++ridgeWarmupSteps, -0.6) * ((accept ? 1 : 0) - RIDGE_ACCEPTANCE);
            }
        }
    }

    /**
     * Delayed acceptance of the filled proposal whose log ratio but for the likelihood is change
     * (NaN: refused): a first stage on the grid's likelihood (current: at the state), then the
     * exact ratio over the first stage's. Leaves the grid's likelihood at the proposal in
     * {@link #nextGrid}.
     */
    private boolean decide(double change, double current) {
        if (Double.isNaN(change)) {
            return false;
        }
        nextGrid = gridLikelihood(proposedRows, proposedAttraction, proposedIntercept);
        double approximate = nextGrid - current;
        if (Double.isFinite(approximate)) {
            return Math.log(rng.nextDouble()) < change + approximate
                    && Math.log(rng.nextDouble()) < likelihoodChange() - approximate;
        }
        return Math.log(rng.nextDouble()) < change + likelihoodChange();
    }

    /**
     * Fills the proposal for factor f and returns the log ratio but for the likelihood: the priors
     * and the Jacobians of the class comment. NaN where the proposed thresholds do not increase.
     */
    double proposalChange(double factor) {
        ChainState s = state;
        boolean bounded = BoundedRedrawSteps.bounded(s, maxRange);
        double sd = s.attractionSd;
        double change = sdPrior.logDensity(sd * factor) - sdPrior.logDensity(sd) + Math.log(factor);
        System.arraycopy(s.attraction, 0, proposedAttraction, 0, proposedAttraction.length);
        java.util.Arrays.fill(delta, 0);
        for (int g = 0; g < s.groups; g++) {
            int at = g * m;
            for (int k : s.attracted) {
                delta[at + k] = (factor - 1) * (s.attraction[at + k] - s.attractionMean[k]);
                proposedAttraction[at + k] += delta[at + k];
            }
            change = mapGroup(g, change);
            if (Double.isNaN(change)) {
                return Double.NaN;
            }
        }
        // refused across the bound of the redraw scheme, either way (see the class comment)
        boolean boundedAfter = true;
        for (int g = 0; g < s.groups && boundedAfter; g++) {
            boundedAfter = BoundedRedrawSteps.bounded(proposedAttraction, g * m, s.attracted, maxRange);
        }
        return boundedAfter == bounded ? change : Double.NaN;
    }

    /** Into {@link #share}: a group's category probabilities at its centre alpha, each from its own interval. */
    private void centreShares(double[] rows, int row, double alpha) {
        for (int k = 0; k < m; k++) {
            share[k] = StandardNormal.intervalProbability(rows[row + k] - alpha, rows[row + k + 1] - alpha);
        }
    }

    /**
     * The class comment's map of group g's thresholds and level for the changes of its attractions
     * in {@link #delta}: writes them to {@link #proposedRows} and {@link #proposedIntercept} and
     * adds to {@code change} the map's log Jacobian and the changes of the level's and the
     * deviations' priors. NaN where the mapped thresholds do not increase.
     */
    private double mapGroup(int g, double change) {
        ChainState s = state;
        int row = g * stride;
        int at = g * m;
        double mu = s.level.mean;
        double tauAlpha = s.level.sd;
        double tauD = s.thresholdSd;
        double alpha = s.level.intercept[g];
        // the probabilities at the centre, each from its own interval (no cancellation in the tails)
        centreShares(s.thresholds, row, alpha);
        double z = 0;
        for (int k = 0; k < m; k++) {
            z += share[k] * Math.exp(-delta[at + k]);
        }
        // the new cumulative sums from below up to one half and from above beyond it
        double below = 0;
        double above = 0;
        for (int k = 0; k < m; k++) {
            above += share[k] * Math.exp(-delta[at + k]) / z;
        }
        double sumC = 0;
        double sumQ = 0;
        for (int k = 1; k < m; k++) {
            double p = share[k - 1] * Math.exp(-delta[at + k - 1]) / z;
            below += p;
            above -= p;
            double q = below <= 0.5 ? StandardNormal.quantile(below) : -StandardNormal.quantile(above);
            quantile[k] = q;
            double before = s.thresholds[row + k] - alpha;
            change += 0.5 * (q * q - before * before);
            sumC += s.thresholds[row + k];
            sumQ += q;
        }
        for (int k = 0; k < m; k++) {
            change += -delta[at + k] - Math.log(z);
        }
        double alphaAfter = (sumC - sumQ) / (m - 1);
        proposedIntercept[g] = alphaAfter;
        change += -0.5 * ((alphaAfter - mu) * (alphaAfter - mu) - (alpha - mu) * (alpha - mu)) / (tauAlpha * tauAlpha);
        proposedRows[row] = s.thresholds[row];
        proposedRows[row + m] = s.thresholds[row + m];
        for (int k = 1; k < m; k++) {
            double c = alphaAfter + quantile[k];
            proposedRows[row + k] = c;
            if (!(c > proposedRows[row + k - 1])) {
                return Double.NaN;
            }
            double dBefore = s.thresholds[row + k] - s.common[k];
            double dAfter = c - s.common[k];
            change += -0.5 * (dAfter - dBefore) * (dAfter + dBefore) / (tauD * tauD);
        }
        return change;
    }

    /**
     * Fills the proposal of the ridge move for a step of log tau_a (class comment) and returns its
     * log ratio but for the likelihood: tau_a's prior with the Jacobian of the step, the
     * attractions' prior, {@link #mapGroup}'s terms, and the reverse proposal's density at the new
     * state over the forward one's. NaN where a proposal density cannot be formed, the mapped
     * thresholds do not increase, or the attractions cross the redraw scheme's bound.
     */
    double ridgeChange(double logStep) {
        return ridgeChange(logStep, null);
    }

    /** For tests: with {@code given} (by group and position in A) the changes of the attractions instead of a draw. */
    double ridgeChange(double logStep, double[] given) {
        ChainState s = state;
        boolean bounded = BoundedRedrawSteps.bounded(s, maxRange);
        int size = s.attracted.length;
        double sd = s.attractionSd;
        double sdAfter = sd * Math.exp(logStep);
        double change = sdPrior.logDensity(sdAfter) - sdPrior.logDensity(sd) + logStep;
        System.arraycopy(s.attraction, 0, proposedAttraction, 0, proposedAttraction.length);
        java.util.Arrays.fill(delta, 0);
        for (int g = 0; g < s.groups; g++) {
            int at = g * m;
            if (!ridgeProposal(g, s.thresholds, s.level.intercept[g], s.attraction, sdAfter)) {
                return Double.NaN;
            }
            if (given == null) {
                // Delta = mean + L'^-1 e, e standard normal, has precision L L'
                for (int j = 0; j < size; j++) {
                    ridgeDraw[j] = normal.sample();
                }
                Cholesky.solveUpper(ridgeFactor, 0, size, ridgeDraw);
            }
            for (int j = 0; j < size; j++) {
                int k = s.attracted[j];
                double d = given == null ? ridgeMean[j] + ridgeDraw[j] : given[g * size + j];
                delta[at + k] = d;
                proposedAttraction[at + k] += d;
                double before = s.attraction[at + k] - s.attractionMean[k];
                double after = proposedAttraction[at + k] - s.attractionMean[k];
                change += -0.5 * (after * after / (sdAfter * sdAfter) - before * before / (sd * sd)) - logStep;
            }
            change -= ridgeLogDensity(g, 1);
            change = mapGroup(g, change);
            if (Double.isNaN(change)) {
                return Double.NaN;
            }
        }
        // the reverse move: from the proposal, at the current spread, the changes -Delta
        for (int g = 0; g < s.groups; g++) {
            if (!ridgeProposal(g, proposedRows, proposedIntercept[g], proposedAttraction, sd)) {
                return Double.NaN;
            }
            change += ridgeLogDensity(g, -1);
        }
        boolean boundedAfter = true;
        for (int g = 0; g < s.groups && boundedAfter; g++) {
            boundedAfter = BoundedRedrawSteps.bounded(proposedAttraction, g * m, s.attracted, maxRange);
        }
        return boundedAfter == bounded ? change : Double.NaN;
    }

    /**
     * The log density, but for its constant, of sign times group g's changes in {@link #delta}
     * under the normal of {@link #ridgeProposal}: sum log L_ii - |L'(x - mean)|^2 / 2.
     */
    private double ridgeLogDensity(int g, double sign) {
        int size = state.attracted.length;
        int at = g * m;
        double out = 0;
        for (int j = 0; j < size; j++) {
            out += Math.log(ridgeFactor[j * size + j]);
            double v = 0;
            for (int k = j; k < size; k++) {
                v += ridgeFactor[k * size + j] * (sign * delta[at + state.attracted[k]] - ridgeMean[k]);
            }
            out -= 0.5 * v * v;
        }
        return out;
    }

    /**
     * The ridge move's normal proposal for group g's changes Delta of its attractions at state
     * (rows, alpha, attraction) and spread tau: the attractions' prior at tau, the priors of the
     * deviations d[g,.] and of alpha[g] through the map linearised at Delta = 0, and the
     * likelihood read from the grid ({@link #tabulate}) to second order (its gradient along the
     * map, and the outer products of the per-answer gradients for its curvature, Berndt, Hall,
     * Hall & Hausman 1974). Writes the precision's lower Cholesky factor to {@link #ridgeFactor}
     * and the mean to {@link #ridgeMean}; false if the precision is not positive definite.
     */
    private boolean ridgeProposal(int g, double[] rows, double alpha, double[] attraction, double tau) {
        ChainState s = state;
        int size = s.attracted.length;
        int row = g * stride;
        int at = g * m;
        // d q'_k / d Delta_j at 0: the map's u'_k = sum_(i<k) p_i e^-Delta_i / Z, q' = Phi^-1(u')
        double below = 0;
        java.util.Arrays.fill(ridgeLevel, 0);
        centreShares(rows, row, alpha);
        for (int k = 1; k < m; k++) {
            below += share[k - 1];
            double density = StandardNormal.density(rows[row + k] - alpha);
            for (int j = 0; j < size; j++) {
                int a = s.attracted[j];
                double v = share[a] * (below - (a < k ? 1 : 0)) / density;
                ridgeSlope[k * size + j] = v;
                ridgeLevel[j] -= v / (m - 1);
            }
        }
        double tauD = s.thresholdSd;
        double tauAlpha = s.level.sd;
        for (int j = 0; j < size; j++) {
            int a = s.attracted[j];
            double b = -(attraction[at + a] - s.attractionMean[a]) / (tau * tau)
                    - ridgeLevel[j] * (alpha - s.level.mean) / (tauAlpha * tauAlpha);
            for (int k = 1; k < m; k++) {
                b -= (ridgeLevel[j] + ridgeSlope[k * size + j]) * (rows[row + k] - s.common[k]) / (tauD * tauD);
            }
            ridgeMean[j] = b;
            for (int i = 0; i <= j; i++) {
                double v = (i == j ? 1 / (tau * tau) : 0) + ridgeLevel[i] * ridgeLevel[j] / (tauAlpha * tauAlpha);
                for (int k = 1; k < m; k++) {
                    v += (ridgeLevel[i] + ridgeSlope[k * size + i]) * (ridgeLevel[j] + ridgeSlope[k * size + j]) / (tauD * tauD);
                }
                ridgePrecision[j * size + i] = v;
            }
        }
        ridgeLikelihood(g, rows, alpha, attraction);
        if (!Cholesky.factor(ridgePrecision, 0, ridgeFactor, 0, size)) {
            return false;
        }
        Cholesky.solveLower(ridgeFactor, 0, size, ridgeMean);
        Cholesky.solveUpper(ridgeFactor, 0, size, ridgeMean);
        return true;
    }

    /**
     * Adds group g's grid likelihood's gradient along the map to {@link #ridgeMean} and the outer
     * products of its per-answer gradients to the lower triangle of {@link #ridgePrecision}. At a
     * node's level the map moves c[g,k] - eta by d q'_k (alpha cancels); a full-scale answer r has
     * d log P_r / d(c_k - eta) = phi_k ([k = r + 1] - [k = r]) / pi_r - phi_k (e^a[k-1] - e^a[k]) / N
     * and d log P_r / d a_j = [r = j] - pi_j e^a[j] / N (MODEL.md 4b); a coarse one, whose
     * probability is linear in the cdfs, phi_k times its coefficient over P_r.
     */
    private void ridgeLikelihood(int g, double[] rows, double alpha, double[] attraction) {
        ChainState s = state;
        RoundingChannel channel = s.channel;
        int size = s.attracted.length;
        int row = g * stride;
        int at = g * m;
        int full = grid.first(g, 0, 0);
        int coarseClass = grid.first(g, 1, 0);
        for (int k = 0; k < m; k++) {
            ridgeOdds[k] = Math.exp(attraction[at + k]);
        }
        nodeCdf[0] = 0;
        nodeCdf[m] = 1;
        for (int node = 0; node < grid.count[g]; node++) {
            double eta = alpha + grid.low[g] + (node - 1) * grid.spacing[g];
            for (int k = 1; k < m; k++) {
                nodeCdf[k] = StandardNormal.cdf(rows[row + k] - eta);
                nodeDensity[k] = StandardNormal.density(rows[row + k] - eta);
            }
            double norm = 0;
            for (int k = 0; k < m; k++) {
                norm += (nodeCdf[k + 1] - nodeCdf[k]) * ridgeOdds[k];
            }
            // the part every full-scale answer shares: -d log N / d Delta_j
            for (int j = 0; j < size; j++) {
                int a = s.attracted[j];
                double v = -(nodeCdf[a + 1] - nodeCdf[a]) * ridgeOdds[a] / norm;
                for (int k = 1; k < m; k++) {
                    v -= nodeDensity[k] * (ridgeOdds[k - 1] - ridgeOdds[k]) / norm * ridgeSlope[k * size + j];
                }
                ridgeShared[j] = v;
            }
            for (int r = 0; r < m; r++) {
                double w = grid.weight[full + r * NODES + node];
                double pi = nodeCdf[r + 1] - nodeCdf[r];
                if (w != 0 && pi > 0) {
                    for (int j = 0; j < size; j++) {
                        double v = ridgeShared[j] + (s.attracted[j] == r ? 1 : 0);
                        if (r + 1 < m) {
                            v += nodeDensity[r + 1] / pi * ridgeSlope[(r + 1) * size + j];
                        }
                        if (r > 0) {
                            v -= nodeDensity[r] / pi * ridgeSlope[r * size + j];
                        }
                        ridgeAnswer[j] = v;
                    }
                    addOuter(w);
                }
                double v = channel != null ? grid.weight[coarseClass + r * NODES + node] : 0;
                if (v != 0) {
                    double p = ChainState.coarseFromCdfs(channel, nodeCdf, 1, 0, r, -2, 0, 0);
                    if (p > 0) {
                        for (int j = 0; j < size; j++) {
                            double d = 0;
                            for (int k = 1; k < m; k++) {
                                d += coarseCoefficient[r * m + k] * nodeDensity[k] * ridgeSlope[k * size + j];
                            }
                            ridgeAnswer[j] = d / p;
                        }
                        addOuter(v);
                    }
                }
            }
        }
    }

    /** Adds w times {@link #ridgeAnswer} to the gradient and w times its outer product to the precision's lower triangle. */
    private void addOuter(double w) {
        int size = state.attracted.length;
        for (int j = 0; j < size; j++) {
            double v = w * ridgeAnswer[j];
            ridgeMean[j] += v;
            for (int i = 0; i <= j; i++) {
                ridgePrecision[j * size + i] += v * ridgeAnswer[i];
            }
        }
    }

    /**
     * Spreads every respondent of each group over the nodes of the group's grid in x'beta
     * ({@link CubicSpread}), by class and answer; returns {@link #gridLikelihood} at the current state.
     */
    double tabulate() {
        ChainState s = state;
        for (int g = 0; g < s.groups; g++) {
            grid.spread(s, g, covariatePart);
        }
        return gridLikelihood(s.thresholds, s.attraction, s.level.intercept);
    }

    /** For tests: the first stage's log-likelihood change for the proposal of {@link #proposalChange}. */
    double tabulatedChange() {
        double current = tabulate();
        return gridLikelihood(proposedRows, proposedAttraction, proposedIntercept) - current;
    }

    /** The log likelihood of every respondent, classes given, read from the grid of {@link #tabulate} at these parameters. */
    private double gridLikelihood(double[] rows, double[] attraction, double[] intercept) {
        ChainState s = state;
        RoundingChannel channel = s.channel;
        double total = 0;
        nodeCdf[0] = 0;
        nodeCdf[m] = 1;
        for (int g = 0; g < s.groups; g++) {
            int row = g * stride;
            int at = g * m;
            int full = grid.first(g, 0, 0);
            int coarseClass = grid.first(g, 1, 0);
            for (int k : s.attracted) {
                nodeExcess[k] = Math.expm1(attraction[at + k]);
            }
            for (int node = 0; node < grid.count[g]; node++) {
                double eta = intercept[g] + grid.low[g] + (node - 1) * grid.spacing[g];
                for (int k = 1; k < m; k++) {
                    nodeCdf[k] = StandardNormal.cdf(rows[row + k] - eta);
                }
                double norm = 1;
                for (int k : s.attracted) {
                    norm += (nodeCdf[k + 1] - nodeCdf[k]) * nodeExcess[k];
                }
                double logNorm = Math.log(norm);
                for (int r = 0; r < m; r++) {
                    double w = grid.weight[full + r * NODES + node];
                    if (w != 0) {
                        total += w * (Math.log(StandardNormal.intervalProbability(rows[row + r] - eta, rows[row + r + 1] - eta))
                                + attraction[at + r] - logNorm);
                    }
                    double v = channel != null ? grid.weight[coarseClass + r * NODES + node] : 0;
                    if (v != 0) {
                        total += v * Math.log(ChainState.coarseFromCdfs(channel, nodeCdf, 1, 0, r, -2, 0, 0));
                    }
                }
            }
        }
        return total;
    }

    /**
     * The log likelihood at the proposal of {@link #proposalChange} minus the current one, every
     * respondent with its class given; writes the proposal's cdfs and N_i to the spares.
     */
    double likelihoodChange() {
        ChainState s = state;
        int n = s.size;
        double[] cdf = s.cdf;
        double[] spare = s.spareCdf;
        double[] normaliser = s.normaliser;
        double[] spareNormaliser = s.spareNormaliser;
        byte[] classes = s.coarse;
        RoundingChannel channel = s.channel;
        int[] attracted = s.attracted;
        double log = 0;
        double after = 1;
        double before = 1;
        for (int g = 0; g < s.groups; g++) {
            int row = g * stride;
            int at = g * m;
            double shift = proposedIntercept[g] - s.level.intercept[g];
            for (int k = 0; k < m; k++) {
                excessAfter[k] = Math.expm1(proposedAttraction[at + k]);
                oddsAfter[k] = Math.exp(proposedAttraction[at + k]);
                oddsBefore[k] = Math.exp(s.attraction[at + k]);
            }
            for (int i = s.start[at], to = s.start[at + m]; i < to; i++) {
                double eta = s.level.linear(i, g) + shift;
                for (int k = 1; k < m; k++) {
                    spare[k * n + i] = StandardNormal.cdf(proposedRows[row + k] - eta);
                }
                double norm = 1;
                for (int k : attracted) {
                    norm += (spare[(k + 1) * n + i] - spare[k * n + i]) * excessAfter[k];
                }
                spareNormaliser[i] = norm;
                int r = s.category[i];
                double likelihoodAfter;
                double likelihoodBefore;
                if (classes != null && classes[i] == 1) {
                    likelihoodAfter = ChainState.coarseFromCdfs(channel, spare, n, i, r, -2, 0, 0);
                    likelihoodBefore = ChainState.coarseFromCdfs(channel, cdf, n, i, r, -2, 0, 0);
                } else {
                    likelihoodAfter = (spare[(r + 1) * n + i] - spare[r * n + i]) * oddsAfter[r] * normaliser[i];
                    likelihoodBefore = (cdf[(r + 1) * n + i] - cdf[r * n + i]) * oddsBefore[r] * norm;
                }
                if (!(likelihoodAfter > 1e-100 && likelihoodBefore > 1e-100)) {
                    // far in a tail the cdf differences lose their digits: the log-space path
                    log += exactLogLikelihood(proposedRows, proposedAttraction, g, i, r, eta)
                            - exactLogLikelihood(s.thresholds, s.attraction, g, i, r, eta - shift);
                    continue;
                }
                after *= likelihoodAfter;
                before *= likelihoodBefore;
                if (RunningProducts.outside(after, before)) {
                    log += Math.log(after / before);
                    after = 1;
                    before = 1;
                }
            }
        }
        return log + Math.log(after / before);
    }

    private double exactLogLikelihood(double[] rows, double[] attraction, int g, int i, int r, double eta) {
        ChainState s = state;
        if (s.coarse != null && s.coarse[i] == 1) {
            return ResponseLikelihood.logCoarse(s.channel, rows, g * stride, r, eta, -1, 0);
        }
        System.arraycopy(attraction, g * m, groupAttraction, 0, m);
        return ResponseLikelihood.logFullAttracted(rows, g * stride, r, eta, groupAttraction);
    }

    /** Keeps the proposal of {@link #proposalChange} and {@link #likelihoodChange} for factor f. */
    void keep(double factor) {
        ChainState s = state;
        s.attractionSd *= factor;
        System.arraycopy(proposedRows, 0, s.thresholds, 0, proposedRows.length);
        System.arraycopy(proposedIntercept, 0, s.level.intercept, 0, proposedIntercept.length);
        System.arraycopy(proposedAttraction, 0, s.attraction, 0, proposedAttraction.length);
        s.swapCdf();
    }

    @Override
    public void save(DataOutput out) throws IOException {
        Checkpointed.writeDouble(out, logScale);
        out.writeInt(warmupSteps);
        out.writeInt(warmupCalls);
        Checkpointed.writeDouble(out, ridgeLogScale);
        out.writeInt(ridgeWarmupSteps);
    }

    @Override
    public void restore(DataInput in) throws IOException {
        logScale = Checkpointed.readDouble(in);
        warmupSteps = in.readInt();
        warmupCalls = in.readInt();
        ridgeLogScale = Checkpointed.readDouble(in);
        ridgeWarmupSteps = in.readInt();
    }
}
