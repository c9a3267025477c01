package org.rungs.sampler;

import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.rungs.priors.HalfNormal;
import org.rungs.priors.Normal;

/**
 * A block's pooling hyperparameters given its group intercepts (MODEL.md 2 and 4): the mean by
 * its conjugate normal full conditional, then the spread by slice sampling (Neal 2003) on
 * log sd, whose density is Half-Normal(sd) * sd^-G * exp(-sum (intercept - mean)^2 / (2 sd^2))
 * times the Jacobian sd. Used only with two or more groups.
 */
final class PoolingUpdate implements Update, SliceSampler.LogDensity {
    private final RegressionBlock block;
    private final Normal meanPrior;
    private final HalfNormal sdPrior;
    private final ZigguratSampler.NormalizedGaussian normal;
    private final SliceSampler slice;
    private double sumOfSquares;

    private PoolingUpdate(RegressionBlock block, Normal meanPrior, HalfNormal sdPrior, UniformRandomProvider rng) {
        this.block = block;
        this.meanPrior = meanPrior;
        this.sdPrior = sdPrior;
        this.normal = ZigguratSampler.NormalizedGaussian.of(rng);
        this.slice = SliceSampler.of(rng, 1.0);
    }

    static PoolingUpdate of(RegressionBlock block, Normal meanPrior, HalfNormal sdPrior, UniformRandomProvider rng) {
        return new PoolingUpdate(block, meanPrior, sdPrior, rng);
    }

    @Override
    public void update(boolean adapt) {
        RegressionBlock b = block;
        int groups = b.groups;
        double dataPrecision = groups / (b.sd * b.sd);
        double sum = 0;
        for (int g = 0; g < groups; g++) {
            sum += b.intercept[g];
        }
        double precision = meanPrior.precision() + dataPrecision;
        double mean = (meanPrior.precision() * meanPrior.mean() + dataPrecision * sum / groups) / precision;
        b.mean = mean + normal.sample() / Math.sqrt(precision);
        sumOfSquares = 0;
        for (int g = 0; g < groups; g++) {
            double d = b.intercept[g] - b.mean;
            sumOfSquares += d * d;
        }
        b.sd = Math.exp(slice.sample(Math.log(b.sd), this));
    }

    @Override
    public double at(double logSd) {
        double sd = Math.exp(logSd);
        return sdPrior.logDensity(sd) - block.groups * logSd - sumOfSquares / (2 * sd * sd) + logSd;
    }
}
