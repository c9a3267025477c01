package org.rungs.sampler;

import java.io.DataInput;
import java.io.DataOutput;
import java.io.IOException;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.factory.DecompositionFactory_DDRM;
import org.ejml.interfaces.decomposition.EigenDecomposition_F64;
import org.rungs.priors.Priors;

/**
 * One Metropolis-Hastings step that moves every parameter the data touch at once, on their
 * posterior with the latent levels, classes and rejected draws summed out
 * ({@link CollapsedPosterior}): a Hamiltonian proposal (Duane, Kennedy, Pendleton & Roweth 1987,
 * Hybrid Monte Carlo, Physics Letters B 195; Neal 2011, MCMC using Hamiltonian dynamics, Handbook
 * of MCMC, chapter 5: the leapfrog steps of section 2.3 and, as the metric, the linear
 * transformation of section 4.1; section numbers from memory) accepted with the Metropolis ratio
 * of the joint energy, so the posterior stays exact. It mixes the direction
 * that the Gibbs steps crawl along: the coarse share traded against the end and middle thresholds
 * and the style coefficients, survey-wide, which the augmented classes and levels pin down from
 * one sweep to the next (bulk ESS of the demo's slowest parameter from about 30 to 261 to 332
 * on seeds 1 to 5, in about a minute).
 *
 * <p>Warm-up, in sweeps: off for the first half. At half-way the metric is fitted at the chain's
 * state: H, minus the Hessian by finite differences of the exact gradient (one gradient per
 * survey-wide coordinate and per coordinate of a group, {@link CollapsedPosterior#negativeHessian}),
 * made positive definite where needed by taking its eigenvalues' absolute values, recomputed
 * after Newton steps towards the mode until they gain less than {@link #CONVERGED} (on a large
 * survey the search runs on a sample, {@link #METRIC_RESPONDENTS}, and the last Newton steps and
 * Hessian on the whole survey). From then on the step size adapts towards a mean acceptance
 * probability of {@link #TARGET} (Robbins-Monro on its log, as for the other
 * proposals). At three quarters the metric becomes the covariance of the states since half-way,
 * shrunk towards H^-1, which sees the long flat tails that the curvature at the mode misses, and
 * the step size adapts afresh; at seven eighths the same again with the states since half-way
 * (half as many again; on the demo the slowest bulk ESS rose from 310, 285, 341, 269, 255 to
 * 349, 340, 408, 334, 344 on seeds 1 to 5, while three refits, at five eighths too, or the last
 * at fifteen sixteenths did no better). Under number attraction the first refit also fits a
 * change of variables per coordinate ({@link CoordinateWarp}) from the same states, and from then
 * on the step runs in its coordinates: the logarithm of the attractions' spread has a long lower
 * tail (the neck of the funnel that the non-centred coordinates only narrow) which the map folds
 * in. On the attraction demo the slowest bulk ESS (each time attraction_sd's) went from 887, 869,
 * 769, 612 to 825, 934, 955, 967 on seeds 1 to 4, in the same time; on the coarse demo without
 * attraction it fell (seed 4 ended "not converged"), so there the map stays the identity.
 * Trajectories are about one unit long in the metric's scale on
 * average: the step size jittered by +-10% and the number of leapfrog steps drawn uniformly from
 * 1 to 2L - 1 around its mean L, which breaks the near-periodic returns of a fixed length (Neal
 * 2011, section 3.2, from memory). A chain whose warm-up is shorter than 2 sweeps never uses it.
 *
 * <p>Placed first in a sweep: every later step either integrates out the per-respondent latent
 * quantities too or redraws them given the parameters before it conditions on them (van Dyk &
 * Park 2008, section 3).
 */
final class JointHamiltonianUpdate implements Update, Checkpointed {
    /** Mean acceptance probability aimed at (Neal 2011, section 4.2, from memory: about 0.65 is optimal in high dimension). */
    private static final double TARGET = 0.7;
    /**
     * Mean trajectory length in units of the metric, and a cap on the mean number of leapfrog
     * steps. On the demo a length of 1 gave the slowest bulk ESS 404 with 6 leapfrog steps
     * (default seed, fixed length); 1.5 cost a third more time for no more ESS. With the number of
     * steps drawn around its mean: 310, 285 and 341 on seeds 1 to 3, against 282, 310 and 249
     * with it fixed, on the same code otherwise.
     */
    private static final double LENGTH = 1.0;
    private static final int MAX_LEAPS = 12;
    /**
     * Trajectories per sweep. Two on the demo (default seed) raised the smallest bulk ESS from 282
     * to 431 for half as much time again (162 s against 107 s): the same ESS per second.
     */
    private static final int TRAJECTORIES = 1;
    /** Newton steps per Hessian, step halvings per Newton step, Hessians at most, and the gain taken as converged. */
    private static final int NEWTON_STEPS = 10;
    private static final int HALVINGS = 12;
    private static final int ROUNDS = 4;
    private static final double CONVERGED = 0.1;
    /**
     * On a larger survey the search for the mode runs on a systematic sample of about this many
     * respondents, each counted n / sample times; then Newton steps and one last Hessian use the
     * whole survey. The sample's Hessian alone is not enough: in the weakly identified directions
     * (the coarse share against the end thresholds) its curvature is mostly sampling noise, and
     * at a million respondents the step size it allowed took the full 12 leapfrog steps.
     */
    private static final int METRIC_RESPONDENTS = 20_000;
    /** Warm-up states kept for the refits at most; beyond, every second is dropped and the stride doubles. */
    static final int STORED = 1000;
    /**
     * Above this many coordinates the metric is an {@link ArrowMetric} instead of a dense one: on
     * 150 groups of 15 with the coarse class (1,662 coordinates; bench/many-groups) 4 chains of
     * 1,000 + 1,000 sampled in 14 to 15 s against 146 to 280 s, with the dense metric's fits most
     * of that, while every survey of the demos and of the benchmark (at most 976 coordinates)
     * keeps its draws (our rule).
     */
    static final int DENSE_UP_TO = 1000;

    private final ChainState state;
    private final CollapsedPosterior posterior;
    private final UniformRandomProvider rng;
    private final ZigguratSampler.NormalizedGaussian normal;
    private final int dimension;
    private final int size;
    private int buildAt;
    private int buildAttempts;
    private final int warmup;
    private final double[] theta;
    private final double[] proposal;
    private final double[] mode;
    private final double[] gradient;
    private final double[] work;
    private final double[] momentum;
    /** Lower Cholesky factor R of the metric's precision R R', row-major; the momentum has covariance R R'. */
    private final double[] factor;
    /** R' row-major, so that solving with R' reads memory in order (the same arithmetic as from R); set by {@link #factorChanged}. */
    private final double[] factorTransposed;
    /** The metric in place of {@link #factor} on a survey of many groups; null otherwise. */
    private final ArrowMetric arrow;
    private boolean built;
    /** Warm-up sweeps at which the draws since the build replace the metric. */
    private final int refitAt;
    private final int lastRefitAt;
    /** Warm-up states since the build, in theta, row by row: every {@link #storeStride}-th, at most {@link #STORED} rows. */
    private final double[] stored;
    private int storedCount;
    private int storeStride = 1;
    private int storeSkip;
    /** The change of variables the step runs in, fitted at the first refit ({@link CoordinateWarp}). */
    private final CoordinateWarp warp;
    private boolean warpFitted;
    /** Whether the step fits {@link #warp}: under attraction only (see the class comment). */
    private final boolean warped;
    /** The start's s, and the position's theta along a trajectory. */
    private final double[] position;
    private final double[] point;
    private int stepStart;
    private int warmupCalls;
    /** log of the leapfrog step size in the metric's units, and the warm-up sweep its adaptation (re)started. */
    private double logStep = Math.log(0.5);
    private long proposed;
    private long accepted;
    /** While sampling: leapfrog steps asked for, and trajectories stopped where the log density is minus infinity. */
    private long leapfrogSteps;
    private long walls;

    /** The warm-up sweep at which the step is first built, and from which it runs: half-way. */
    static int buildAt(int warmup) {
        return warmup / 2;
    }

    private JointHamiltonianUpdate(ChainState state, Priors priors, int warmup, UniformRandomProvider rng, int denseUpTo) {
        this.state = state;
        this.posterior = new CollapsedPosterior(state, priors);
        this.rng = rng;
        this.normal = ZigguratSampler.NormalizedGaussian.of(rng);
        this.dimension = posterior.dimension();
        this.size = state.size;
        this.buildAt = warmup >= 2 ? buildAt(warmup) : Integer.MAX_VALUE;
        this.warmup = warmup;
        this.refitAt = warmup >= 8 ? warmup * 3 / 4 : Integer.MAX_VALUE;
        this.lastRefitAt = warmup >= 16 ? warmup * 7 / 8 : Integer.MAX_VALUE;
        // the states from the build (half-way) to the last refit (seven eighths), every one up to STORED
        int rows = lastRefitAt == Integer.MAX_VALUE ? (refitAt == Integer.MAX_VALUE ? 0 : warmup - buildAt) : lastRefitAt - buildAt;
        this.stored = new double[Math.max(2, Math.min(STORED, rows + 1)) * dimension];
        this.warp = new CoordinateWarp(dimension);
        this.warped = state.attracted.length > 0;
        this.position = new double[dimension];
        this.point = new double[dimension];
        this.theta = new double[dimension];
        this.proposal = new double[dimension];
        this.mode = new double[dimension];
        this.gradient = new double[dimension];
        this.work = new double[dimension];
        this.momentum = new double[dimension];
        boolean sparse = dimension > denseUpTo && posterior.groupCount() > 1 && posterior.ownPerGroup() > 0;
        this.arrow = sparse ? new ArrowMetric(posterior.owners(), posterior.slotsOf(), posterior.groupCount(), posterior.ownPerGroup()) : null;
        this.factor = new double[sparse ? 0 : dimension * dimension];
        this.factorTransposed = new double[factor.length];
    }

    /** The step for a chain whose warm-up has {@code warmup} sweeps. */
    static JointHamiltonianUpdate of(ChainState state, Priors priors, int warmup, UniformRandomProvider rng) {
        return new JointHamiltonianUpdate(state, priors, warmup, rng, DENSE_UP_TO);
    }

    /** For tests: the metric is an {@link ArrowMetric} above {@code denseUpTo} coordinates. */
    static JointHamiltonianUpdate of(ChainState state, Priors priors, int warmup, UniformRandomProvider rng, int denseUpTo) {
        return new JointHamiltonianUpdate(state, priors, warmup, rng, denseUpTo);
    }

    /** Whether the metric is an {@link ArrowMetric} (many groups; {@link Chain} then adds {@link CollapsedSpreadUpdate}). */
    boolean sparseMetric() {
        return arrow != null;
    }

    @Override
    public void update(boolean adapt) {
        if (adapt) {
            warmupCalls++;
            if (!built && warmupCalls >= buildAt) {
                build();
                if (!built) {
                    // A failed fit costs dozens of passes; try again a sixteenth of warm-up later.
                    buildAt = warmupCalls + Math.max(1, warmup / 16);
                }
            }
        }
        if (!built) {
            return;
        }
        for (int t = 0; t < TRAJECTORIES; t++) {
            trajectory(adapt);
        }
        if (adapt) {
            if (warmupCalls == refitAt || warmupCalls == lastRefitAt) {
                refit();
            } else if (warmupCalls < lastRefitAt) {
                collect();
            }
        }
    }

    private void trajectory(boolean adapt) {
        posterior.read(theta);
        // Under attraction every kick takes the interpolated force and the ends only the density,
        // which costs half the exact gradient there (its normal densities at every threshold)
        boolean forceAtEnds = posterior.forceAtEnds();
        // ...and its passes leave each respondent's cdfs, the current state's or the proposal's,
        // for the threshold and attraction steps after it (ChainState.cdfCurrent)
        boolean keepCdfs = forceAtEnds && posterior.keepsCdfs();
        double start = keepCdfs ? posterior.logDensity(theta, state.cdf, state.normaliser)
                : forceAtEnds ? posterior.logDensity(theta) : posterior.gradient(theta, gradient);
        if (forceAtEnds) {
            posterior.force(theta, gradient);
        }
        // the step runs on s, theta = theta(s) (CoordinateWarp): the density there gains the Jacobian
        warp.toS(theta, position);
        start += warp.logJacobian(position);
        warp.chain(position, gradient);
        whiten(gradient);
        double step = Math.exp(logStep) * (0.9 + 0.2 * rng.nextDouble());
        int mean = (int) Math.min(MAX_LEAPS, Math.ceil(LENGTH / Math.exp(logStep)));
        int leaps = 1 + rng.nextInt(2 * mean - 1);
        double energy = -start;
        for (int j = 0; j < dimension; j++) {
            momentum[j] = normal.sample();
            energy += 0.5 * momentum[j] * momentum[j];
        }
        System.arraycopy(position, 0, proposal, 0, dimension);
        double end = start;
        for (int l = 0; l < leaps && end != Double.NEGATIVE_INFINITY && !Double.isNaN(end); l++) {
            for (int j = 0; j < dimension; j++) {
                momentum[j] += 0.5 * step * gradient[j];
                work[j] = step * momentum[j];
            }
            solveUpper(work);
            for (int j = 0; j < dimension; j++) {
                proposal[j] += work[j];
            }
            warp.toTheta(proposal, point);
            // Only the last position's density enters the acceptance. Between the ends the force
            // may be any fixed function of the position (an interpolated gradient,
            // CollapsedPosterior.force): both half-kicks at an inner position use it, whichever way
            // the trajectory runs, and at both ends either the exact gradient or, under attraction,
            // the same force, so the map stays reversible and volume-preserving and the Metropolis
            // ratio exact (Neal 2011, section 5.5.1).
            if (l < leaps - 1) {
                end = posterior.force(point, gradient);
            } else if (!forceAtEnds) {
                end = posterior.gradient(point, gradient);
            } else {
                end = posterior.force(point, gradient);
                if (end != Double.NEGATIVE_INFINITY && !Double.isNaN(end)) {
                    end = keepCdfs ? posterior.logDensity(point, state.spareCdf, state.spareNormaliser) : posterior.logDensity(point);
                }
            }
            end += warp.logJacobian(proposal);
            warp.chain(proposal, gradient);
            whiten(gradient);
            for (int j = 0; j < dimension; j++) {
                momentum[j] += 0.5 * step * gradient[j];
            }
        }
        double probability = 0;
        if (end != Double.NEGATIVE_INFINITY && !Double.isNaN(end)) {
            double next = -end;
            for (int j = 0; j < dimension; j++) {
                next += 0.5 * momentum[j] * momentum[j];
            }
            probability = Double.isNaN(next) ? 0 : Math.min(1, Math.exp(energy - next));
        }
        boolean accept = rng.nextDouble() < probability;
        if (accept) {
            posterior.write(point);
            if (keepCdfs) {
                state.swapCdf();
            }
        } else if (keepCdfs) {
            // the state as the start's pass read it (the thresholds and attractions rebuilt from
            // theta may differ from the state's in the last bit), so that its cdfs are the state's
            posterior.write(theta);
        }
        state.cdfCurrent = keepCdfs;
        if (!adapt) {
            proposed++;
            accepted += accept ? 1 : 0;
            leapfrogSteps += leaps;
            walls += end == Double.NEGATIVE_INFINITY ? 1 : 0;
        }
        if (adapt) {
            logStep += Math.pow(warmupCalls - stepStart + 1.0, -0.6) * (probability - TARGET);
        }
    }

    /** Keeps the state after this step among the warm-up draws (every storeStride-th). */
    private void collect() {
        if (++storeSkip < storeStride) {
            return;
        }
        storeSkip = 0;
        int d = dimension;
        if ((storedCount + 1) * d > stored.length) {
            // full: keep every second row and store half as often
            for (int t = 1; 2 * t < storedCount; t++) {
                System.arraycopy(stored, 2 * t * d, stored, t * d, d);
            }
            storedCount = (storedCount + 1) / 2;
            storeStride *= 2;
        }
        posterior.read(theta);
        System.arraycopy(theta, 0, stored, storedCount * d, d);
        storedCount++;
    }

    /**
     * Replaces the metric by the covariance of the warm-up draws since the build, shrunk towards
     * the Laplace approximation's with weight d / (n + d) (common practice for a dense metric
     * from few draws, no source): the draws see the long flat tails that the curvature at the
     * mode does not. The step size then adapts afresh.
     */
    private void refit() {
        int d = dimension;
        int n = storedCount;
        if (n < 10) {
            return;
        }
        // under attraction the first refit fits the change of variables too, and the metric's old
        // covariance, in theta, becomes one in s by the map's slopes at the centre
        boolean first = !warpFitted;
        if (first && warped) {
            warp.fit(stored, n);
        }
        double[] draws = new double[n * d];
        double[] sum = new double[d];
        for (int t = 0; t < n; t++) {
            System.arraycopy(stored, t * d, theta, 0, d);
            warp.toS(theta, position);
            System.arraycopy(position, 0, draws, t * d, d);
            for (int i = 0; i < d; i++) {
                sum[i] += position[i];
            }
        }
        if (arrow != null) {
            if (arrow.refit(draws, n, d, first ? warp::slope : null)) {
                warpFitted = true;
                stepStart = warmupCalls;
            } else if (first) {
                warp.clear();
            }
            return;
        }
        DMatrixRMaj inverse = new DMatrixRMaj(d, d);
        double[] column = new double[d];
        for (int j = 0; j < d; j++) {
            java.util.Arrays.fill(column, 0);
            column[j] = 1;
            solveLower(column);
            solveUpper(column);
            for (int i = 0; i < d; i++) {
                inverse.set(i, j, column[i]);
            }
        }
        double weight = (double) n / (n + d);
        DMatrixRMaj covariance = new DMatrixRMaj(d, d);
        for (int i = 0; i < d; i++) {
            for (int j = 0; j <= i; j++) {
                double cross = 0;
                for (int t = 0; t < n; t++) {
                    cross += draws[t * d + i] * draws[t * d + j];
                }
                double sample = (cross - sum[i] * sum[j] / n) / (n - 1);
                double old = 0.5 * (inverse.get(i, j) + inverse.get(j, i));
                if (first) {
                    old /= warp.slope(i) * warp.slope(j);
                }
                double v = weight * sample + (1 - weight) * old;
                covariance.set(i, j, v);
                covariance.set(j, i, v);
            }
        }
        if (!org.ejml.dense.row.CommonOps_DDRM.invert(covariance)) {
            if (first) {
                warp.clear();
            }
            return;
        }
        double[] precision = new double[d * d];
        for (int i = 0; i < d; i++) {
            for (int j = 0; j < d; j++) {
                precision[i * d + j] = 0.5 * (covariance.get(i, j) + covariance.get(j, i));
            }
        }
        double[] kept = factor.clone();
        if (!cholesky(precision)) {
            System.arraycopy(kept, 0, factor, 0, factor.length);
            factorChanged();
            if (first) {
                warp.clear();
            }
            return;
        }
        warpFitted = true;
        stepStart = warmupCalls;
    }

    /** The gradient in the whitened coordinates z = R'(theta - m): R^-1 g. */
    private void whiten(double[] g) {
        solveLower(g);
    }

    /** For tests: how often the metric's fit was attempted. */
    int buildAttempts() {
        return buildAttempts;
    }

    /** Share of proposals accepted while sampling (NaN before the first, or when the step never started). */
    double acceptanceRate() {
        return proposed == 0 ? Double.NaN : (double) accepted / proposed;
    }

    /**
     * Mean leapfrog steps per trajectory while sampling (NaN as above): near {@link #MAX_LEAPS},
     * the cap on the mean, the step size rather than the trajectory's length sets the cost.
     */
    double meanLeapfrogSteps() {
        return proposed == 0 ? Double.NaN : (double) leapfrogSteps / proposed;
    }

    /**
     * Share of trajectories while sampling that stopped on a wall, where the log density is minus
     * infinity (NaN as above): where some group's thresholds would cross (about a quarter on
     * the coarse demo), or under attraction, whose gap coordinates ({@link CollapsedPosterior})
     * keep them increasing, a trajectory that diverged far out (1 to 9%). Each is a rejected
     * proposal.
     */
    double wallShare() {
        return proposed == 0 ? Double.NaN : (double) walls / proposed;
    }

    /** Solves R' y = v in place, so y ~ N(0, H^-1) when v ~ N(0, I). */
    private void solveUpper(double[] v) {
        if (arrow != null) {
            arrow.solveUpper(v);
            return;
        }
        Cholesky.solveTransposedLower(factorTransposed, dimension, v);
    }

    /** Solves R v = b in place. */
    private void solveLower(double[] v) {
        if (arrow != null) {
            arrow.solveLower(v);
            return;
        }
        Cholesky.solveLower(factor, 0, dimension, v);
    }

    /** Fits the metric from the chain's current state, on a sample of a large survey; leaves the step off if that fails. */
    private void build() {
        buildAttempts++;
        int sample = Math.max(1, size / METRIC_RESPONDENTS);
        posterior.sampleEvery(sample);
        try {
            fit();
        } finally {
            posterior.sampleEvery(1);
        }
        if (built && sample > 1) {
            newton();
            built = curvature(mode);
        }
        stepStart = warmupCalls;
    }

    /** H at the mode, found by Newton steps from the state with H recomputed up to {@link #ROUNDS} times. */
    private void fit() {
        posterior.read(mode);
        if (posterior.logDensity(mode) == Double.NEGATIVE_INFINITY) {
            return;
        }
        for (int round = 0; round < ROUNDS; round++) {
            if (!curvature(mode)) {
                return;
            }
            double decrement = newton();
            if (decrement < CONVERGED) {
                break;
            }
        }
        if (!curvature(mode)) {
            return;
        }
        built = true;
    }

    /**
     * Newton steps from {@link #mode} with the current H, each halved until the density rises;
     * returns the last Newton decrement g' H^-1 g (about twice the log density still to gain).
     */
    private double newton() {
        double at = posterior.gradient(mode, gradient);
        double decrement = Double.POSITIVE_INFINITY;
        for (int step = 0; step < NEWTON_STEPS; step++) {
            System.arraycopy(gradient, 0, work, 0, dimension);
            solveLower(work);
            decrement = 0;
            for (double v : work) {
                decrement += v * v;
            }
            if (decrement < CONVERGED / 10) {
                break;
            }
            solveUpper(work);
            double scale = 1;
            boolean moved = false;
            for (int h = 0; h < HALVINGS && !moved; h++, scale /= 2) {
                for (int j = 0; j < dimension; j++) {
                    proposal[j] = mode[j] + scale * work[j];
                }
                moved = posterior.logDensity(proposal) > at;
            }
            if (!moved) {
                break;
            }
            System.arraycopy(proposal, 0, mode, 0, dimension);
            at = posterior.gradient(mode, gradient);
        }
        return decrement;
    }

    /**
     * H = minus the Hessian at x ({@link CollapsedPosterior#negativeHessian}); where it is not
     * positive definite (away from the mode), its eigenvalues are replaced by their absolute
     * values, floored at 1e-8 of the largest. Stores its Cholesky factor. False if the gradient
     * cannot be evaluated there.
     */
    private boolean curvature(double[] x) {
        if (arrow != null) {
            return posterior.negativeHessian(x, arrow) && arrow.factorMeasured();
        }
        int d = dimension;
        double[] negative = posterior.negativeHessian(x);
        if (negative == null) {
            return false;
        }
        if (cholesky(negative)) {
            return true;
        }
        DMatrixRMaj h = DMatrixRMaj.wrap(d, d, negative);
        EigenDecomposition_F64<DMatrixRMaj> eig = DecompositionFactory_DDRM.eig(d, true, true);
        if (!eig.decompose(h)) {
            return false;
        }
        double largest = 0;
        for (int k = 0; k < d; k++) {
            largest = Math.max(largest, Math.abs(eig.getEigenvalue(k).getReal()));
        }
        double[] fixed = new double[d * d];
        for (int k = 0; k < d; k++) {
            double lambda = Math.max(Math.abs(eig.getEigenvalue(k).getReal()), 1e-8 * largest);
            DMatrixRMaj v = eig.getEigenVector(k);
            for (int i = 0; i < d; i++) {
                double vi = lambda * v.get(i);
                for (int j = 0; j < d; j++) {
                    fixed[i * d + j] += vi * v.get(j);
                }
            }
        }
        return cholesky(fixed);
    }

    /** Lower Cholesky factor of the row-major symmetric matrix a into {@link #factor}. */
    private boolean cholesky(double[] a) {
        java.util.Arrays.fill(factor, 0);
        boolean positive = Cholesky.factor(a, 0, factor, 0, dimension);
        factorChanged();
        return positive;
    }

    /** Every write of {@link #factor} ends here. */
    private void factorChanged() {
        Cholesky.transpose(factor, factorTransposed, dimension);
    }

    /** Warm-up position, step size, acceptance counts, the kept warm-up states, the change of variables and the metric. */
    @Override
    public void save(DataOutput out) throws IOException {
        out.writeBoolean(built);
        out.writeInt(buildAt);
        out.writeInt(warmupCalls);
        Checkpointed.writeDouble(out, logStep);
        out.writeInt(stepStart);
        out.writeLong(proposed);
        out.writeLong(accepted);
        out.writeLong(leapfrogSteps);
        out.writeLong(walls);
        out.writeInt(storedCount);
        out.writeInt(storeStride);
        out.writeInt(storeSkip);
        for (int i = 0; i < storedCount * dimension; i++) {
            Checkpointed.writeDouble(out, stored[i]);
        }
        out.writeBoolean(warpFitted);
        warp.save(out);
        if (built && arrow != null) {
            arrow.save(out);
        } else if (built) {
            Checkpointed.writeDoubles(out, factor);
        }
    }

    @Override
    public void restore(DataInput in) throws IOException {
        built = in.readBoolean();
        buildAt = in.readInt();
        warmupCalls = in.readInt();
        logStep = Checkpointed.readDouble(in);
        stepStart = in.readInt();
        proposed = in.readLong();
        accepted = in.readLong();
        leapfrogSteps = in.readLong();
        walls = in.readLong();
        storedCount = in.readInt();
        storeStride = in.readInt();
        storeSkip = in.readInt();
        for (int i = 0; i < storedCount * dimension; i++) {
            stored[i] = Checkpointed.readDouble(in);
        }
        warpFitted = in.readBoolean();
        warp.restore(in);
        if (built && arrow != null) {
            arrow.restore(in);
        } else if (built) {
            Checkpointed.readDoubles(in, factor);
            factorChanged();
        }
    }
}
