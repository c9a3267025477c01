package org.rungs.sampler;

import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.simple.RandomSource;
import org.junit.jupiter.api.Test;
import org.rungs.priors.Priors;

/**
 * The block moves of tau_a and every a[g,j] ({@link AttractionUpdate}, Knorr-Held & Rue 2002)
 * must leave the same distribution invariant as the update's other moves: run alone, the update
 * samples (abar, tau_a, a, the jointly moved category widths) given the levels and classes, so
 * chains with and without the block moves must agree on every mean within Monte Carlo error.
 */
class AttractionUpdateTest {
    private static final int WARMUP = 1_000;
    private static final int SWEEPS = 40_000;
    private static final int BATCHES = 40;

    /**
     * Means of log tau_a, abar[2], abar[4] and a[0,2] on the three-group survey of
     * {@link CollapsedPosteriorTest} (attraction on 2 and 4, coarse points 0, 3, 6). Tolerance:
     * 4.5 standard errors of the difference, each from 40 batch means (common practice, no
     * source), so a false alarm has probability near 1e-5 per quantity; the seeds are fixed. With
     * the a's prior Jacobian (-log tau_a' + log tau_a per term) left out of the acceptance, log
     * tau_a's means differed by 1.25 (z = 73); with the approximations' ratio left out, the chain
     * ran off and the test did not finish in ten minutes.
     */
    @Test
    void blockMovesKeepTheConditionalPosterior() {
        double[][] with = run(AttractionUpdate.BLOCK_STEPS, 21L);
        double[][] without = run(0, 22L);
        String[] names = {"log attraction_sd", "abar[2]", "abar[4]", "a[0,2]"};
        for (int q = 0; q < names.length; q++) {
            double[] a = batchMeanAndError(with[q]);
            double[] b = batchMeanAndError(without[q]);
            double z = (a[0] - b[0]) / Math.sqrt(a[1] * a[1] + b[1] * b[1]);
            assertTrue(Math.abs(z) < 4.5, names[q] + ": " + a[0] + " +- " + a[1] + " with the block moves, "
                    + b[0] + " +- " + b[1] + " without (z = " + z + ")");
        }
    }

    /** The block moves must do what they are for: log tau_a's lag-1 autocorrelation falls. */
    @Test
    void blockMovesMixTheSpread() {
        double with = lagOne(run(AttractionUpdate.BLOCK_STEPS, 23L)[0]);
        double without = lagOne(run(0, 24L)[0]);
        assertTrue(with < without - 0.1, "lag-1 autocorrelation of log tau_a " + with + " with, " + without + " without");
    }

    private static double[][] run(int blockSteps, long seed) {
        ChainState s = CollapsedPosteriorTest.state(true, true, true, 0.5);
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(seed);
        Priors priors = Priors.defaults();
        ThresholdUpdate.of(s, s.start, priors, rng).refresh();
        AttractionUpdate update = AttractionUpdate.of(s, priors, rng, blockSteps);
        for (int t = 0; t < WARMUP; t++) {
            update.update(true);
        }
        int m = s.categories;
        double[][] out = new double[4][SWEEPS];
        for (int t = 0; t < SWEEPS; t++) {
            update.update(false);
            out[0][t] = Math.log(s.attractionSd);
            out[1][t] = s.attractionMean[2];
            out[2][t] = s.attractionMean[4];
            out[3][t] = s.attraction[2];
        }
        assertTrue(m == 7);
        return out;
    }

    static double[] batchMeanAndError(double[] x) {
        int size = x.length / BATCHES;
        double sum = 0;
        double squares = 0;
        for (int b = 0; b < BATCHES; b++) {
            double mean = 0;
            for (int i = b * size; i < (b + 1) * size; i++) {
                mean += x[i];
            }
            mean /= size;
            sum += mean;
            squares += mean * mean;
        }
        double mean = sum / BATCHES;
        double variance = (squares - BATCHES * mean * mean) / (BATCHES - 1);
        return new double[] {mean, Math.sqrt(variance / BATCHES)};
    }

    private static double lagOne(double[] x) {
        double mean = 0;
        for (double v : x) {
            mean += v;
        }
        mean /= x.length;
        double cross = 0;
        double squares = 0;
        for (int i = 0; i < x.length; i++) {
            squares += (x[i] - mean) * (x[i] - mean);
            if (i > 0) {
                cross += (x[i] - mean) * (x[i - 1] - mean);
            }
        }
        return cross / squares;
    }
}
