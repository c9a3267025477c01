package org.rungs.sampler;

import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.rungs.priors.HalfNormal;
import org.rungs.priors.Normal;
import org.rungs.priors.Priors;

/**
 * The group-level hyperparameters of MODEL.md section 2 given the group levels: mu_alpha by its
 * conjugate normal full conditional, then tau_alpha by slice sampling (Neal 2003) on log tau,
 * whose density is Half-Normal(tau) * tau^-G * exp(-sum (alpha - mu)^2 / (2 tau^2)) times the
 * Jacobian tau. Used only with two or more groups.
 */
final class GroupLevelUpdate implements Update, SliceSampler.LogDensity {
    private final ChainState state;
    private final Normal meanPrior;
    private final HalfNormal sdPrior;
    private final ZigguratSampler.NormalizedGaussian normal;
    private final SliceSampler slice;
    private double sumOfSquares;

    private GroupLevelUpdate(ChainState state, Priors priors, UniformRandomProvider rng) {
        this.state = state;
        this.meanPrior = priors.groupMean();
        this.sdPrior = priors.groupSd();
        this.normal = ZigguratSampler.NormalizedGaussian.of(rng);
        this.slice = SliceSampler.of(rng, 1.0);
    }

    static GroupLevelUpdate of(ChainState state, Priors priors, UniformRandomProvider rng) {
        return new GroupLevelUpdate(state, priors, rng);
    }

    @Override
    public void update(boolean adapt) {
        ChainState s = state;
        int groups = s.groups;
        double dataPrecision = groups / (s.groupSd * s.groupSd);
        double sum = 0;
        for (int g = 0; g < groups; g++) {
            sum += s.alpha[g];
        }
        double precision = meanPrior.precision() + dataPrecision;
        double mean = (meanPrior.precision() * meanPrior.mean() + dataPrecision * sum / groups) / precision;
        s.groupMean = mean + normal.sample() / Math.sqrt(precision);
        sumOfSquares = 0;
        for (int g = 0; g < groups; g++) {
            double d = s.alpha[g] - s.groupMean;
            sumOfSquares += d * d;
        }
        s.groupSd = Math.exp(slice.sample(Math.log(s.groupSd), this));
    }

    @Override
    public double at(double logSd) {
        double sd = Math.exp(logSd);
        return sdPrior.logDensity(sd) - state.groups * logSd - sumOfSquares / (2 * sd * sd) + logSd;
    }
}
