package org.rungs.sampler;

import java.io.DataInput;
import java.io.DataOutput;
import java.io.IOException;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.rungs.priors.HalfNormal;
import org.rungs.priors.Priors;

/**
 * Non-centred moves of two spreads on the posterior of {@link CollapsedPosterior} (latent levels,
 * classes and rejected draws summed out), for surveys of many groups: tau_d with every group's
 * threshold deviations d[g,k] = c[g,k] - c[k], and tau_gamma with every gamma[g] - mu_gamma,
 * each multiplied by one factor f = exp(step). With d = tau_d u the prior of u does not depend on
 * tau_d (the same for gamma), and the collapsed density holds the deviations' prior without its
 * normalising constant, so the ratio is the collapsed density at the moved state with the moved
 * spread over the current one, times the spread's prior and the Jacobian f of the step on its log
 * (Papaspiliopoulos, Roberts & Skold 2007, Statistical Science 22, 59-73).
 *
 * <p>The centred draws of the spreads given 150 groups' deviations ({@link ThresholdSpreadUpdate},
 * {@link PoolingUpdate}) move them by a few per cent a sweep, and the non-centred tau_d step of
 * {@link ThresholdRescaleUpdate}, which carries every latent value, by about a tenth; summed out,
 * the move is as wide as the ratings allow. On 150 groups of 100 (bench/many-groups, seed 7) the
 * bulk ESS of threshold_sd rose from 36 to 165 and of style_sd from 14 to 191, for a third more
 * time. Where the joint step's metric is an {@link ArrowMetric} the moves run from the start
 * ({@link #of}). Elsewhere a spread's moves start at three quarters of warm-up only if its chain
 * has been slow ({@link #ifSlow}): on the demo (12 groups of 1,500) they cost a fifth more time and
 * gave no more ESS (seed 3: smallest bulk ESS 685 against 753), while on 30 groups of 1,000 or 12
 * of 300 whose true spreads are 0 the smallest bulk ESS per fit rose from between 7 and 126 to
 * between 143 and 425 (bench/many-groups, seeds 7 and 8; BENCHMARKS.md). Under attraction only
 * tau_gamma moves here. The thresholds' coordinates there are scaled logs of gaps already in
 * units of tau_d ({@link CollapsedPosterior}), so a move of tau_d alone would be exact, and it
 * passed calibration, but on 150 groups of 15 it lowered threshold_sd's bulk ESS (seeds 7 to 11:
 * from 25 to 68 to 20 to 30) and on 60 groups of 30 it raised it by half for about a fifth more
 * time (SAMPLER-RESEARCH.md, fortieth session).
 *
 * <p>Placed right after the joint step: the steps after it sum the latent quantities out too or
 * redraw them before they condition on them. The plain model (no joint step) moves tau_d alone,
 * first in its sweep, before the latent levels are redrawn (van Dyk & Park 2008).
 */
final class CollapsedSpreadUpdate implements Update, Checkpointed {
    private static final double TARGET_ACCEPTANCE = 0.44;
    /**
     * Moves of each spread per sweep, one density pass each. On 150 groups of 15 (seed 7) one move
     * gave the smallest bulk ESS 55 in 14.7 s of sampling, three 116 in 18.4 s.
     */
    private static final int MOVES = 3;
    /**
     * Lag-1 autocorrelation of a spread's log over the decision window above which its moves
     * start. A chain of autocorrelation rho keeps about n (1 - rho) / (1 + rho) effective draws of
     * n (the AR(1) formula, e.g. Geyer 1992, Statistical Science 7, section 3.3): at 0.8 about
     * 440 of the default 4 x 1,000, near the 400 the verdict asks. Measured in the window of
     * 1,000 warm-up sweeps (coarse class, two seeds each): 12 to 40 groups of 10 to 300 drawn
     * alike 0.74 to 0.97; 6 to 12 groups of 300 to 1,000 that use the scale differently 0.17 to
     * 0.75; the demo's sampling draws 0.38 to 0.55.
     */
    static final double SLOW = 0.8;
    /** Fewest warm-up sweeps in the decision window; with fewer the moves never start. */
    static final int FEWEST = 40;
    private final ChainState state;
    private final Priors priors;
    private final UniformRandomProvider rng;
    private final ZigguratSampler.NormalizedGaussian normal;
    private final HalfNormal thresholdPrior;
    private final HalfNormal stylePrior;
    /** Per spread (0 tau_d, 1 tau_gamma): whether the model has it to move, and whether its moves run. */
    private final boolean[] present;
    private final boolean[] active;
    /** Warm-up sweeps [windowFrom, windowTo) whose log spreads decide, at windowTo, which moves start. */
    private final int windowFrom;
    private final int windowTo;
    private final double[][] window;
    private int warmupSweeps;
    /** Built when a move first runs, so that a chain that never moves them holds no second copy. */
    private CollapsedPosterior posterior;
    private double[] theta;
    private double[] proposal;
    /** Log step sizes on log tau_d and log tau_gamma, and the warm-up moves they adapted over. */
    private final double[] logScale = {Math.log(0.5), Math.log(0.5)};
    private int warmupMoves;

    private CollapsedSpreadUpdate(ChainState state, Priors priors, UniformRandomProvider rng, boolean always, int warmup) {
        this.state = state;
        this.priors = priors;
        this.rng = rng;
        this.normal = ZigguratSampler.NormalizedGaussian.of(rng);
        this.thresholdPrior = priors.thresholdSd();
        this.stylePrior = priors.styleSd();
        this.present = new boolean[] {state.byGroup && !state.attractionOn(), state.channel != null};
        this.active = always ? present.clone() : new boolean[2];
        boolean decides = !always && warmup * 3 / 4 - warmup * 9 / 16 >= FEWEST;
        this.windowFrom = decides ? warmup * 9 / 16 : Integer.MAX_VALUE;
        this.windowTo = decides ? warmup * 3 / 4 : Integer.MAX_VALUE;
        this.window = new double[2][decides ? windowTo - windowFrom : 0];
    }

    /** The moves for a chain of several groups, running from the start, or null when neither spread is there to move. */
    static CollapsedSpreadUpdate of(ChainState state, Priors priors, UniformRandomProvider rng) {
        return has(state) ? new CollapsedSpreadUpdate(state, priors, rng, true, 0) : null;
    }

    /**
     * The moves for a chain of several groups whose warm-up has {@code warmup} sweeps, each
     * spread's starting only if the chain's other steps leave it slow: at three quarters of
     * warm-up, when the lag-1 autocorrelation of its log over the three sixteenths before (from
     * 1/16 of warm-up after the joint step's build at half-way) exceeds {@value #SLOW}; with fewer
     * than {@value #FEWEST} sweeps there, never. Null when neither spread is there to move. Where
     * no move starts (the demos) the chain's draws are those of a sweep without this step.
     */
    static CollapsedSpreadUpdate ifSlow(ChainState state, Priors priors, UniformRandomProvider rng, int warmup) {
        return has(state) ? new CollapsedSpreadUpdate(state, priors, rng, false, warmup) : null;
    }

    private static boolean has(ChainState state) {
        return state.groups > 1 && ((state.byGroup && !state.attractionOn()) || state.channel != null);
    }

    /** The spreads whose moves run, by their names in draws.csv, comma-separated, or "none". */
    String movedSpreads() {
        return active[0] ? (active[1] ? "threshold_sd, style_sd" : "threshold_sd") : active[1] ? "style_sd" : "none";
    }

    @Override
    public void update(boolean adapt) {
        if (adapt) {
            watch();
        }
        if (!active[0] && !active[1]) {
            return;
        }
        if (posterior == null) {
            posterior = new CollapsedPosterior(state, priors);
            theta = new double[posterior.dimension()];
            proposal = new double[theta.length];
        }
        posterior.read(theta);
        double current = posterior.logDensity(theta);
        for (int t = 0; t < MOVES; t++) {
            for (int which = 0; which < 2; which++) {
                if (active[which]) {
                    current = move(which, current, adapt);
                }
            }
        }
        if (adapt) {
            warmupMoves++;
        }
    }

    /** Keeps a warm-up sweep's log spreads in the window, and at its end starts the slow spreads' moves. */
    private void watch() {
        int at = warmupSweeps++;
        if (at >= windowFrom && at < windowTo) {
            window[0][at - windowFrom] = present[0] ? Math.log(state.thresholdSd) : 0;
            window[1][at - windowFrom] = present[1] ? Math.log(state.style.sd) : 0;
        }
        if (at == windowTo) {
            for (int which = 0; which < 2; which++) {
                active[which] = present[which] && lagOneAutocorrelation(window[which]) > SLOW;
            }
        }
    }

    /** sum (x[t] - m)(x[t+1] - m) / sum (x[t] - m)^2, m the mean; 0 for a constant series. */
    static double lagOneAutocorrelation(double[] x) {
        double mean = 0;
        for (double v : x) {
            mean += v / x.length;
        }
        double lagged = 0;
        double square = 0;
        for (int t = 0; t < x.length; t++) {
            double d = x[t] - mean;
            square += d * d;
            if (t + 1 < x.length) {
                lagged += d * (x[t + 1] - mean);
            }
        }
        return square > 0 ? lagged / square : 0;
    }

    /** One move of spread {@code which} (0 tau_d, 1 tau_gamma) from {@link #theta} at {@code current}; returns the density after it. */
    private double move(int which, double current, boolean adapt) {
        ChainState s = state;
        double step = Math.exp(logScale[which]) * normal.sample();
        double factor = Math.exp(step);
        System.arraycopy(theta, 0, proposal, 0, theta.length);
        double spread;
        HalfNormal prior;
        if (which == 0) {
            int from = posterior.deviationAt;
            for (int i = from; i < from + s.groups * (s.categories - 2); i++) {
                proposal[i] *= factor;
            }
            spread = s.thresholdSd;
            prior = thresholdPrior;
            s.thresholdSd = spread * factor;
        } else {
            int from = posterior.gammaAt;
            double mean = theta[from + s.groups];
            for (int g = 0; g < s.groups; g++) {
                proposal[from + g] = mean + factor * (theta[from + g] - mean);
            }
            spread = s.style.sd;
            prior = stylePrior;
            s.style.sd = spread * factor;
        }
        double moved = posterior.logDensity(proposal);
        double ratio = moved - current + prior.logDensity(spread * factor) - prior.logDensity(spread) + step;
        boolean accept = moved != Double.NEGATIVE_INFINITY && !Double.isNaN(moved) && Math.log(rng.nextDouble()) < ratio;
        if (accept) {
            System.arraycopy(proposal, 0, theta, 0, theta.length);
            posterior.write(theta);
            s.cdfCurrent = false;
        } else if (which == 0) {
            s.thresholdSd = spread;
        } else {
            s.style.sd = spread;
        }
        if (adapt) {
            logScale[which] += Math.pow(warmupMoves + 1.0, -0.6) * ((accept ? 1 : 0) - TARGET_ACCEPTANCE);
        }
        return accept ? moved : current;
    }

    @Override
    public void save(DataOutput out) throws IOException {
        Checkpointed.writeDoubles(out, logScale);
        out.writeInt(warmupMoves);
        out.writeInt(warmupSweeps);
        out.writeBoolean(active[0]);
        out.writeBoolean(active[1]);
        Checkpointed.writeDoubles(out, window[0]);
        Checkpointed.writeDoubles(out, window[1]);
    }

    @Override
    public void restore(DataInput in) throws IOException {
        Checkpointed.readDoubles(in, logScale);
        warmupMoves = in.readInt();
        warmupSweeps = in.readInt();
        active[0] = in.readBoolean();
        active[1] = in.readBoolean();
        Checkpointed.readDoubles(in, window[0]);
        Checkpointed.readDoubles(in, window[1]);
    }
}
