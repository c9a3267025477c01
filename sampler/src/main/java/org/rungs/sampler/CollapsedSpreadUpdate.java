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
 * time; on the demo (12 groups of 1,500) it cost a fifth more time and gave no more ESS (seed 3:
 * smallest bulk ESS 685 against 753), so {@link Chain} runs it where the joint step's metric is an
 * {@link ArrowMetric}. Under attraction the thresholds' coordinates are logs of gaps scaled by
 * tau_d ({@link CollapsedPosterior}), so only tau_gamma moves here.
 *
 * <p>Placed right after the joint step: the steps after it sum the latent quantities out too or
 * redraw them before they condition on them.
 */
final class CollapsedSpreadUpdate implements Update, Checkpointed {
    private static final double TARGET_ACCEPTANCE = 0.44;
    /**
     * Moves of each spread per sweep, one density pass each. On 150 groups of 15 (seed 7) one move
     * gave the smallest bulk ESS 55 in 14.7 s of sampling, three 116 in 18.4 s.
     */
    private static final int MOVES = 3;
    private final ChainState state;
    private final CollapsedPosterior posterior;
    private final UniformRandomProvider rng;
    private final ZigguratSampler.NormalizedGaussian normal;
    private final HalfNormal thresholdPrior;
    private final HalfNormal stylePrior;
    private final boolean thresholds;
    private final boolean style;
    private final double[] theta;
    private final double[] proposal;
    /** Log step sizes on log tau_d and log tau_gamma, and the warm-up moves they adapted over. */
    private final double[] logScale = {Math.log(0.5), Math.log(0.5)};
    private int warmupMoves;

    private CollapsedSpreadUpdate(ChainState state, Priors priors, UniformRandomProvider rng) {
        this.state = state;
        this.posterior = new CollapsedPosterior(state, priors);
        this.rng = rng;
        this.normal = ZigguratSampler.NormalizedGaussian.of(rng);
        this.thresholdPrior = priors.thresholdSd();
        this.stylePrior = priors.styleSd();
        this.thresholds = state.byGroup && !state.attractionOn();
        this.style = state.channel != null;
        this.theta = new double[posterior.dimension()];
        this.proposal = new double[theta.length];
    }

    /** The moves for a chain of several groups, or null when neither spread is there to move. */
    static CollapsedSpreadUpdate of(ChainState state, Priors priors, UniformRandomProvider rng) {
        boolean any = state.groups > 1 && ((state.byGroup && !state.attractionOn()) || state.channel != null);
        return any ? new CollapsedSpreadUpdate(state, priors, rng) : null;
    }

    @Override
    public void update(boolean adapt) {
        posterior.read(theta);
        double current = posterior.logDensity(theta);
        for (int t = 0; t < MOVES; t++) {
            if (thresholds) {
                current = move(0, current, adapt);
            }
            if (style) {
                current = move(1, current, adapt);
            }
        }
        if (adapt) {
            warmupMoves++;
        }
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
    }

    @Override
    public void restore(DataInput in) throws IOException {
        Checkpointed.readDoubles(in, logScale);
        warmupMoves = in.readInt();
    }
}
