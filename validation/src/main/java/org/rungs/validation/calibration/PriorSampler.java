package org.rungs.validation.calibration;

import java.util.Arrays;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.rungs.priors.Priors;

/**
 * Draws the parameters of the ordered probit and of the coarse class from their prior (MODEL.md
 * sections 2 to 5), written apart from the sampler so that a mistake in one is not repeated in
 * the other.
 *
 * <p>The threshold prior is the product of b[k] ~ N(0, sd_b), tau_d ~ HN(sd_d) and
 * s[g,k] ~ N(0, tau_d), restricted to the region where the common thresholds c = b - mean(b) and
 * every group's c + d[g] (d[g] = s[g] - mean_k s[g,k]) increase, with no per-group
 * renormalisation. It is drawn by rejection of the whole draw: b is proposed as the sorted
 * values of M-1 iid normals (the iid density restricted to increasing order, since c increases
 * exactly when b does), tau_d and every s[g] from their densities, and all of them are drawn
 * again unless every group's thresholds increase. The accepted draws have exactly the restricted
 * joint density; rejecting only s given b would renormalise per b and be wrong.
 */
final class PriorSampler {
    /** Proposals before giving up: a prior this concentrated on disordered thresholds is a configuration error. */
    private static final int MAX_PROPOSALS = 10_000_000;

    private PriorSampler() {
    }

    /**
     * @param groups     G; with one group there is no tau_alpha and no threshold deviation
     * @param categories M
     * @param byGroup    whether thresholds vary by group (ignored with one group)
     */
    static TrueParameters draw(Priors priors, int covariates, int groups, int categories, boolean byGroup,
            UniformRandomProvider rng) {
        ZigguratSampler.NormalizedGaussian normal = ZigguratSampler.NormalizedGaussian.of(rng);
        double[] beta = new double[covariates];
        for (int j = 0; j < covariates; j++) {
            beta[j] = priors.level().mean() + priors.level().sd() * normal.sample();
        }
        double groupMean = priors.groupMean().mean() + priors.groupMean().sd() * normal.sample();
        double[] alpha = new double[groups];
        double groupSd = Double.NaN;
        if (groups > 1) {
            groupSd = Math.abs(priors.groupSd().sd() * normal.sample());
            for (int g = 0; g < groups; g++) {
                alpha[g] = groupMean + groupSd * normal.sample();
            }
        } else {
            alpha[0] = groupMean;
        }
        boolean deviations = byGroup && groups > 1;
        int m1 = categories - 1;
        double[] common = new double[m1];
        double[][] thresholds = new double[groups][m1];
        double[] s = new double[m1];
        for (int proposal = 0; proposal < MAX_PROPOSALS; proposal++) {
            for (int k = 0; k < m1; k++) {
                common[k] = priors.threshold().sd() * normal.sample();
            }
            Arrays.sort(common);
            centre(common);
            double thresholdSd = deviations ? Math.abs(priors.thresholdSd().sd() * normal.sample()) : Double.NaN;
            boolean ordered = true;
            for (int g = 0; g < groups && ordered; g++) {
                if (deviations) {
                    for (int k = 0; k < m1; k++) {
                        s[k] = thresholdSd * normal.sample();
                    }
                    centre(s);
                }
                for (int k = 0; k < m1; k++) {
                    thresholds[g][k] = common[k] + (deviations ? s[k] : 0);
                    ordered &= k == 0 || thresholds[g][k] > thresholds[g][k - 1];
                }
            }
            if (ordered) {
                return new TrueParameters(beta, groupMean, groupSd, alpha, common.clone(), thresholdSd, thresholds,
                        deviations);
            }
        }
        throw new IllegalArgumentException("no ordered thresholds in " + MAX_PROPOSALS
                + " draws from the threshold prior; widen the threshold prior or narrow threshold_sd");
    }

    /**
     * Draws the coarse class's parameters from their prior (MODEL.md 4 and 5): delta[j] ~ style prior,
     * mu_gamma ~ style_mean prior, tau_gamma ~ style_sd prior and gamma[g] = mu_gamma + tau_gamma v[g]
     * with v[g] ~ N(0,1); with one group gamma = mu_gamma and there is no tau_gamma.
     */
    static StyleParameters drawStyle(Priors priors, int covariates, int groups, UniformRandomProvider rng) {
        ZigguratSampler.NormalizedGaussian normal = ZigguratSampler.NormalizedGaussian.of(rng);
        double[] delta = new double[covariates];
        for (int j = 0; j < covariates; j++) {
            delta[j] = priors.style().mean() + priors.style().sd() * normal.sample();
        }
        double mean = priors.styleMean().mean() + priors.styleMean().sd() * normal.sample();
        double[] gamma = new double[groups];
        double sd = Double.NaN;
        if (groups > 1) {
            sd = Math.abs(priors.styleSd().sd() * normal.sample());
            for (int g = 0; g < groups; g++) {
                gamma[g] = mean + sd * normal.sample();
            }
        } else {
            gamma[0] = mean;
        }
        return new StyleParameters(delta, mean, sd, gamma);
    }

    /**
     * Draws the attraction of the numbers of A from their prior (MODEL.md 4b and 5):
     * abar[j] ~ attraction_mean prior, tau_a ~ attraction_sd prior, a[g,j] = abar[j] + tau_a v[g,j]
     * with v ~ N(0,1); with one group a = abar and there is no tau_a.
     */
    static AttractionParameters drawAttraction(Priors priors, int[] numbers, int groups, UniformRandomProvider rng) {
        ZigguratSampler.NormalizedGaussian normal = ZigguratSampler.NormalizedGaussian.of(rng);
        double[] mean = new double[numbers.length];
        for (int j = 0; j < numbers.length; j++) {
            mean[j] = priors.attractionMean().mean() + priors.attractionMean().sd() * normal.sample();
        }
        double sd = groups > 1 ? Math.abs(priors.attractionSd().sd() * normal.sample()) : Double.NaN;
        double[][] a = new double[groups][numbers.length];
        for (int g = 0; g < groups; g++) {
            for (int j = 0; j < numbers.length; j++) {
                a[g][j] = groups > 1 ? mean[j] + sd * normal.sample() : mean[j];
            }
        }
        return new AttractionParameters(numbers.clone(), mean, sd, a);
    }

    /** Subtracts the mean: c = b - mean(b), d = s - mean(s). */
    private static void centre(double[] values) {
        double sum = 0;
        for (double v : values) {
            sum += v;
        }
        double mean = sum / values.length;
        for (int k = 0; k < values.length; k++) {
            values[k] -= mean;
        }
    }
}
