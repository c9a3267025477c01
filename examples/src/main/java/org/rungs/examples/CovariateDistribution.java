package org.rungs.examples;

import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ContinuousSampler;
import org.apache.commons.rng.sampling.distribution.ContinuousUniformSampler;
import org.apache.commons.rng.sampling.distribution.LogNormalSampler;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;

/** How the simulator draws the raw value of a level covariate, on the user's scale. */
public sealed interface CovariateDistribution {

    /** A sampler of this distribution fed by {@code rng}. */
    ContinuousSampler sampler(UniformRandomProvider rng);

    /** Log-normal with the given median and standard deviation of the logarithm (e.g. income). */
    record LogNormal(double median, double sdLog) implements CovariateDistribution {
        public LogNormal {
            if (!(median > 0) || !Double.isFinite(median) || !(sdLog > 0) || !Double.isFinite(sdLog)) {
                throw new IllegalArgumentException("a log-normal needs a positive median and sdLog, got (" + median + ", " + sdLog + ")");
            }
        }

        @Override
        public ContinuousSampler sampler(UniformRandomProvider rng) {
            return LogNormalSampler.of(ZigguratSampler.NormalizedGaussian.of(rng), Math.log(median), sdLog);
        }
    }

    /** Normal restricted to [lower, upper] (e.g. age in years), drawn by rejection. */
    record TruncatedNormal(double mean, double sd, double lower, double upper) implements CovariateDistribution {
        public TruncatedNormal {
            if (!(sd > 0) || !Double.isFinite(sd) || !(lower < upper) || !(mean >= lower && mean <= upper)) {
                throw new IllegalArgumentException("a truncated normal needs sd > 0 and lower <= mean <= upper, got ("
                        + mean + ", " + sd + ", " + lower + ", " + upper + ")");
            }
        }

        @Override
        public ContinuousSampler sampler(UniformRandomProvider rng) {
            ContinuousSampler gaussian = ZigguratSampler.NormalizedGaussian.of(rng);
            return () -> {
                while (true) {
                    double x = mean + sd * gaussian.sample();
                    if (x >= lower && x <= upper) {
                        return x;
                    }
                }
            };
        }
    }

    /** Uniform on [lower, upper]. */
    record Uniform(double lower, double upper) implements CovariateDistribution {
        public Uniform {
            if (!(lower < upper) || !Double.isFinite(lower) || !Double.isFinite(upper)) {
                throw new IllegalArgumentException("a uniform needs finite lower < upper, got (" + lower + ", " + upper + ")");
            }
        }

        @Override
        public ContinuousSampler sampler(UniformRandomProvider rng) {
            return ContinuousUniformSampler.of(rng, lower, upper);
        }
    }
}
