package org.rungs.validation.calibration;

import org.apache.commons.rng.UniformRandomProvider;

/**
 * The rank statistic of simulation-based calibration (Talts et al. 2018, algorithm 1): the number
 * of L posterior draws below the true value, in 0..L, uniform when the fit is exact and the L
 * draws are independent. The chains are laid end to end and L draws taken at equal spacing,
 * which thins each chain by the same factor; ties (possible only for a discrete quantity) are
 * broken uniformly at random.
 */
final class RankStatistic {
    private RankStatistic() {
    }

    /** Index of the j-th of L thinned draws among N pooled draws, j = 0..L-1. */
    static int thinnedIndex(int j, int rankDraws, int pooled) {
        return (int) ((long) j * pooled / rankDraws);
    }

    static int of(double truth, double[][] chains, int rankDraws, UniformRandomProvider rng) {
        int iterations = chains[0].length;
        int pooled = chains.length * iterations;
        int below = 0;
        int ties = 0;
        for (int j = 0; j < rankDraws; j++) {
            int index = thinnedIndex(j, rankDraws, pooled);
            double draw = chains[index / iterations][index % iterations];
            if (draw < truth) {
                below++;
            } else if (draw == truth) {
                ties++;
            }
        }
        return ties == 0 ? below : below + rng.nextInt(ties + 1);
    }
}
