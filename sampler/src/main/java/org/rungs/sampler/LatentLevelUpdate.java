package org.rungs.sampler;

import java.util.Arrays;
import org.apache.commons.rng.UniformRandomProvider;

/**
 * Draws every respondent's latent level from its full conditional, a normal with mean eta_i and
 * sd 1 truncated to the interval of the reported category (Albert & Chib 1993, section 4), and
 * keeps only the sufficient statistics the conjugate coefficient update needs: the latent sum
 * per group and the cross-products with each covariate. The latent values themselves are not
 * stored, so memory does not grow with them.
 */
final class LatentLevelUpdate implements Update {
    private final ChainState state;
    private final TruncatedNormalSampler truncatedNormal;

    private LatentLevelUpdate(ChainState state, UniformRandomProvider rng) {
        this.state = state;
        this.truncatedNormal = TruncatedNormalSampler.of(rng);
    }

    static LatentLevelUpdate of(ChainState state, UniformRandomProvider rng) {
        return new LatentLevelUpdate(state, rng);
    }

    @Override
    public void update(boolean adapt) {
        ChainState s = state;
        double[] sums = s.latentSumByGroup;
        double[] cross = s.latentCross;
        Arrays.fill(sums, 0);
        Arrays.fill(cross, 0);
        double[] thresholds = s.thresholds;
        byte[] category = s.category;
        int[] group = s.group;
        double[][] level = s.level;
        int p = s.levelCount;
        int stride = s.categories + 1;
        for (int i = 0; i < s.size; i++) {
            int g = group[i];
            double eta = s.eta(i);
            int at = g * stride + category[i];
            double latent = eta + truncatedNormal.sample(thresholds[at] - eta, thresholds[at + 1] - eta);
            sums[g] += latent;
            for (int j = 0; j < p; j++) {
                cross[j] += level[j][i] * latent;
            }
        }
    }
}
