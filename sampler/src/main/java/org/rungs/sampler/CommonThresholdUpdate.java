package org.rungs.sampler;

import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.rungs.priors.Priors;

/**
 * By-group mode: the common thresholds c given every group's thresholds c[g] (MODEL.md 3).
 * Holding c[g] fixed and moving c (so d[g] = c[g] - c moves with it) leaves the likelihood
 * unchanged; on the sum-to-zero subspace the full conditional is Normal(m, P/a) with
 * a = 1/sd_b^2 + G/tau_d^2, m = (G/tau_d^2) mean_g c[g] / a and P the centring projector,
 * restricted to increasing c. It is drawn by independence Metropolis from the unrestricted
 * normal, which accepts exactly the increasing proposals; up to {@link #TRIES} tries per sweep.
 */
final class CommonThresholdUpdate implements Update {
    private static final int TRIES = 20;
    private final ChainState state;
    private final double priorPrecision;
    private final ZigguratSampler.NormalizedGaussian normal;
    private final double[] mean;
    private final double[] candidate;

    private CommonThresholdUpdate(ChainState state, Priors priors, UniformRandomProvider rng) {
        this.state = state;
        this.priorPrecision = priors.threshold().precision();
        this.normal = ZigguratSampler.NormalizedGaussian.of(rng);
        this.mean = new double[state.categories + 1];
        this.candidate = new double[state.categories + 1];
    }

    static CommonThresholdUpdate of(ChainState state, Priors priors, UniformRandomProvider rng) {
        return new CommonThresholdUpdate(state, priors, rng);
    }

    @Override
    public void update(boolean adapt) {
        ChainState s = state;
        int m = s.categories;
        int stride = m + 1;
        double groupPrecision = s.groups / (s.thresholdSd * s.thresholdSd);
        double precision = priorPrecision + groupPrecision;
        double sd = 1.0 / Math.sqrt(precision);
        for (int k = 1; k < m; k++) {
            double sum = 0;
            for (int g = 0; g < s.groups; g++) {
                sum += s.thresholds[g * stride + k];
            }
            mean[k] = groupPrecision * (sum / s.groups) / precision;
        }
        for (int attempt = 0; attempt < TRIES; attempt++) {
            double noiseMean = 0;
            for (int k = 1; k < m; k++) {
                candidate[k] = normal.sample();
                noiseMean += candidate[k];
            }
            noiseMean /= (m - 1);
            boolean increasing = true;
            for (int k = 1; k < m; k++) {
                candidate[k] = mean[k] + sd * (candidate[k] - noiseMean);
                if (k > 1 && candidate[k] <= candidate[k - 1]) {
                    increasing = false;
                }
            }
            if (increasing) {
                System.arraycopy(candidate, 1, s.common, 1, m - 1);
                return;
            }
        }
    }
}
