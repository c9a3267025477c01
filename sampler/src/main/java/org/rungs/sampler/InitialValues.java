package org.rungs.sampler;

import org.apache.commons.rng.UniformRandomProvider;
import org.rungs.priors.StandardNormal;

/**
 * Dispersed starting points, so that R-hat can reveal chains that have not mixed: thresholds
 * from the probits of the smoothed cumulative shares of the ratings with jittered spacings,
 * levels and coefficients jittered around them, spreads drawn over a wide range.
 */
final class InitialValues {
    private InitialValues() {
    }

    /**
     * @param styleMean centre of the coarse-class intercepts (the prior mean of mu_gamma); every
     *                  respondent starts in the full-scale class
     */
    static void apply(ChainState s, double styleMean, UniformRandomProvider rng) {
        int m = s.categories;
        long[] counts = new long[m];
        for (int i = 0; i < s.size; i++) {
            counts[s.category[i]]++;
        }
        double[] cut = new double[m];
        double cumulative = 0;
        double total = s.size + 0.5 * m;
        for (int k = 1; k < m; k++) {
            cumulative += counts[k - 1] + 0.5;
            cut[k] = StandardNormal.quantile(cumulative / total);
        }
        double value = cut[1];
        double sum = 0;
        s.common[1] = value;
        for (int k = 2; k < m; k++) {
            value += (cut[k] - cut[k - 1]) * Math.exp(uniform(rng, -0.3, 0.3));
            s.common[k] = value;
        }
        for (int k = 1; k < m; k++) {
            sum += s.common[k];
        }
        double mean = sum / (m - 1);
        for (int k = 1; k < m; k++) {
            s.common[k] -= mean;
        }
        s.shareCommonThresholds();
        disperse(s.level, -mean, rng);
        s.thresholdSd = Math.exp(uniform(rng, Math.log(0.05), Math.log(0.5)));
        if (s.style != null) {
            disperse(s.style, styleMean, rng);
        }
        if (s.attractionOn()) {
            s.attractionSd = Math.exp(uniform(rng, Math.log(0.05), Math.log(0.3)));
            for (int k : s.attracted) {
                s.attractionMean[k] = uniform(rng, -0.2, 0.2);
                for (int g = 0; g < s.groups; g++) {
                    s.attraction[g * m + k] = s.groups > 1 ? s.attractionMean[k] + uniform(rng, -0.1, 0.1) : s.attractionMean[k];
                }
            }
        }
    }

    /** Intercepts, mean, spread and coefficients of a block jittered around {@code centre}. */
    private static void disperse(RegressionBlock block, double centre, UniformRandomProvider rng) {
        block.mean = centre + uniform(rng, -0.5, 0.5);
        block.sd = Math.exp(uniform(rng, Math.log(0.1), Math.log(1.0)));
        for (int g = 0; g < block.groups; g++) {
            block.intercept[g] = block.groups > 1 ? block.mean + uniform(rng, -0.5, 0.5) : block.mean;
        }
        for (int j = 0; j < block.count; j++) {
            block.coefficient[j] = uniform(rng, -0.5, 0.5);
        }
    }

    private static double uniform(UniformRandomProvider rng, double low, double high) {
        return low + (high - low) * rng.nextDouble();
    }
}
