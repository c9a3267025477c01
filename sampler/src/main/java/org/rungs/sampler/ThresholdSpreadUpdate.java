package org.rungs.sampler;

import org.apache.commons.rng.UniformRandomProvider;
import org.rungs.priors.HalfNormal;
import org.rungs.priors.Priors;

/**
 * By-group mode: tau_d given the group deviations d[g] = c[g] - c (MODEL.md 3), by slice
 * sampling (Neal 2003) on log tau_d. Each d[g] lies in the (M-2)-dimensional sum-to-zero
 * subspace, where s[g] ~ Normal(0, tau_d I) induces the density
 * tau_d^-(M-2) exp(-|d[g]|^2 / (2 tau_d^2)); the order restriction is not renormalised.
 */
final class ThresholdSpreadUpdate implements Update, SliceSampler.LogDensity {
    private final ChainState state;
    private final HalfNormal prior;
    private final SliceSampler slice;
    private double sumOfSquares;
    private double dimensions;

    private ThresholdSpreadUpdate(ChainState state, Priors priors, UniformRandomProvider rng) {
        this.state = state;
        this.prior = priors.thresholdSd();
        this.slice = SliceSampler.of(rng, 1.0);
    }

    static ThresholdSpreadUpdate of(ChainState state, Priors priors, UniformRandomProvider rng) {
        return new ThresholdSpreadUpdate(state, priors, rng);
    }

    @Override
    public void update(boolean adapt) {
        ChainState s = state;
        int m = s.categories;
        int stride = m + 1;
        sumOfSquares = 0;
        for (int g = 0; g < s.groups; g++) {
            for (int k = 1; k < m; k++) {
                double d = s.thresholds[g * stride + k] - s.common[k];
                sumOfSquares += d * d;
            }
        }
        dimensions = (double) s.groups * (m - 2);
        s.thresholdSd = Math.exp(slice.sample(Math.log(s.thresholdSd), this));
    }

    @Override
    public double at(double logSd) {
        double sd = Math.exp(logSd);
        return prior.logDensity(sd) - dimensions * logSd - sumOfSquares / (2 * sd * sd) + logSd;
    }
}
