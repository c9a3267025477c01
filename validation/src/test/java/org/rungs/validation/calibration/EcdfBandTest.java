package org.rungs.validation.calibration;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.simple.RandomSource;
import org.junit.jupiter.api.Test;
import org.rungs.priors.StandardNormal;

class EcdfBandTest {

    /**
     * Fresh uniform samples (another seed than the band's) leave the band with probability alpha.
     * 4000 samples at alpha = 0.05: binomial sd 0.0034; the gamma from 10,000 simulations moves the
     * rate by about sqrt(0.05 x 0.95 / 10,000) = 0.0022; the discrete ranks make the test at most
     * alpha. Tolerance 0.015, over 3.5 combined sd.
     */
    @Test
    void uniformRanksLeaveTheBandWithProbabilityAlpha() {
        int n = 50;
        int l = 99;
        EcdfBand band = EcdfBand.of(n, l, 0.05);
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(new long[] {77, 78});
        int trials = 4000;
        int out = 0;
        for (int t = 0; t < trials; t++) {
            int[] h = new int[l + 1];
            for (int i = 0; i < n; i++) {
                h[rng.nextInt(l + 1)]++;
            }
            out += band.exceeded(h) ? 1 : 0;
        }
        assertEquals(0.05, (double) out / trials, 0.015);
    }

    @Test
    void bandIsWiderThanPointwiseAndHoldsTheExpectation() {
        EcdfBand band = EcdfBand.of(100, 19, 0.05);
        assertTrue(band.gamma() < 0.05, "simultaneous needs a smaller pointwise level: " + band.gamma());
        for (int k = 1; k <= 19; k++) {
            double expected = 100 * k / 20.0;
            assertTrue(band.lower(k) <= expected && expected <= band.upper(k));
        }
    }

    @Test
    void ranksPiledAtZeroLeaveTheBand() {
        int[] h = new int[100];
        h[0] = 30;
        h[50] = 20;
        EcdfBand band = EcdfBand.of(50, 99, 0.01);
        assertTrue(band.exceeded(h));
        assertEquals(0.6 - 0.01, EcdfBand.maxDeviation(h), 1e-12);
    }

    /** Hand computation: 20 ranks in 0..3, bins {0,1} and {2,3}, counts 14 and 6, expected 10 each. */
    @Test
    void chiSquareByHand() {
        ChiSquareUniformity chi = ChiSquareUniformity.of(new int[] {7, 7, 3, 3}, 2);
        assertArrayEquals(new int[] {14, 6}, chi.observed());
        assertEquals(3.2, chi.statistic(), 1e-12);
        assertEquals(1, chi.df());
        // one degree of freedom: P(chi2 > x) = 2 Q(sqrt(x)), Q the standard normal upper tail
        assertEquals(2 * StandardNormal.upperTail(Math.sqrt(3.2)), chi.p(), 1e-9);
        assertFalse(ChiSquareUniformity.of(new int[] {5, 5, 5, 5}, 2).p() < 1);
    }
}
