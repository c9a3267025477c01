package org.rungs.posteriors;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/** The two ways of summing autocovariances, and the cases posterior answers with NA. */
class EffectiveSampleSizeTest {

    /** Direct sums and FFT compute the same autocovariances; only rounding may differ (1e-12 relative). */
    @Test
    void directSumsAndFftGiveTheSameEss() {
        SplittableRandom random = new SplittableRandom(11);
        for (double phi : new double[] {0.2, 0.9, 0.99}) {
            int chains = 6;
            int length = 700;
            double[] x = new double[chains * length];
            for (int c = 0; c < chains; c++) {
                double v = random.nextGaussian();
                for (int i = 0; i < length; i++) {
                    v = phi * v + random.nextGaussian();
                    x[c * length + i] = v;
                }
            }
            double direct = new EffectiveSampleSize(chains, length, length).of(x);
            double fft = new EffectiveSampleSize(chains, length, 0).of(x);
            double mixed = new EffectiveSampleSize(chains, length).of(x);
            assertEquals(direct, fft, 1e-12 * direct, "phi " + phi);
            assertEquals(direct, mixed, 1e-12 * direct, "phi " + phi);
        }
    }

    @Test
    void reusingTheWorkBuffersDoesNotCarryOverState() {
        SplittableRandom random = new SplittableRandom(5);
        EffectiveSampleSize reused = new EffectiveSampleSize(4, 200);
        for (int round = 0; round < 20; round++) {
            double[] x = random.doubles(800).map(v -> v < 0.3 ? 1 : 0).toArray();
            assertEquals(new EffectiveSampleSize(4, 200).of(x), reused.of(x), "round " + round);
        }
    }

    /** reference: R 4.2.2, posterior 1.4.0 source of .ess: NA below 3 iterations and for constant or non-finite draws. */
    @Test
    void undefinedCasesAreNaN() {
        assertTrue(Double.isNaN(new EffectiveSampleSize(4, 2).of(new double[] {1, 2, 3, 4, 5, 6, 7, 8})));
        assertTrue(Double.isNaN(new EffectiveSampleSize(2, 3).of(new double[] {1, 1, 1, 1, 1, 1})));
        assertTrue(Double.isNaN(new EffectiveSampleSize(2, 3).of(new double[] {1, 2, Double.NaN, 4, 5, 6})));
        assertTrue(Double.isNaN(new EffectiveSampleSize(2, 3).of(new double[] {1, 2, 3, 4, 5, Double.POSITIVE_INFINITY})));
    }

    /**
     * Antithetic chains would give an ESS far above S; posterior caps tau at 1/log10(S)
     * (reference: posterior 1.4.0 source of .ess). AR(1) with phi = -0.7 has tau = 0.3/1.7 = 0.18,
     * well below the cap 1/log10(4000) = 0.28 whatever the seed.
     */
    @Test
    void essIsCappedAtSLog10S() {
        int chains = 8;
        int length = 500;
        SplittableRandom random = new SplittableRandom(17);
        double[] x = new double[chains * length];
        for (int c = 0; c < chains; c++) {
            double v = random.nextGaussian();
            for (int i = 0; i < length; i++) {
                v = -0.7 * v + random.nextGaussian();
                x[c * length + i] = v;
            }
        }
        double draws = chains * length;
        assertEquals(draws * Math.log10(draws), new EffectiveSampleSize(chains, length).of(x), 1e-9 * draws);
    }

    /**
     * When the first pair of autocorrelations already sums to zero or less, posterior sums
     * rho_hat_t[1:0], which in R is the first element only, giving tau = 2.
     * reference: R 4.2.2, package posterior 1.4.0, ess_mean(matrix(x, 500, 2)) = 500 for this x.
     */
    @Test
    void alternatingChainsFollowPosteriorsFirstPairRule() {
        double[] x = new double[1000];
        for (int i = 0; i < x.length; i++) {
            x[i] = (i % 2 == 0 ? 1 : -1) + 1e-3 * (i % 7);
        }
        assertEquals(500, Convergence.essMean(new double[][] {
            Arrays.copyOfRange(x, 0, 500), Arrays.copyOfRange(x, 500, 1000)}), 1e-9);
    }
}
