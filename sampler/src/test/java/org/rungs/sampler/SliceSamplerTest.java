package org.rungs.sampler;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTimeoutPreemptively;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.time.Duration;
import org.apache.commons.rng.simple.RandomSource;
import org.junit.jupiter.api.Test;

class SliceSamplerTest {
    /**
     * Draws of a standard normal: mean 0 and variance 1. Tolerance: 5 Monte Carlo standard errors
     * of 200,000 draws with the chain's autocorrelation allowed for generously (a slice chain on a
     * normal has lag-1 autocorrelation well below 0.5, so an effective size above 50,000: se of
     * the mean below 0.0045, of the variance below 0.0064); fixed seed.
     */
    @Test
    void drawsAStandardNormal() {
        SliceSampler slice = SliceSampler.of(RandomSource.XO_RO_SHI_RO_128_PP.create(4L), 1.0);
        int n = 200_000;
        double x = 3;
        double sum = 0;
        double sumSq = 0;
        for (int t = 0; t < n; t++) {
            x = slice.sample(x, v -> -0.5 * v * v);
            sum += x;
            sumSq += x * x;
        }
        double mean = sum / n;
        assertEquals(0, mean, 5 * 0.0045);
        assertEquals(1, sumSq / n - mean * mean, 5 * 0.0064);
    }

    /**
     * A start outside the support (log density minus infinity or NaN) used to loop for ever in the
     * shrinkage: an extreme prior made a fit hang with no output. It is now an error at once.
     */
    @Test
    void aStartOutsideTheSupportIsAnErrorNotAHang() {
        SliceSampler slice = SliceSampler.of(RandomSource.XO_RO_SHI_RO_128_PP.create(5L), 1.0);
        assertTimeoutPreemptively(Duration.ofSeconds(20), () -> {
            IllegalStateException e = assertThrows(IllegalStateException.class,
                    () -> slice.sample(-1, v -> v > 0 ? -v : Double.NEGATIVE_INFINITY));
            assertTrue(e.getMessage().contains("left the posterior's support"), e.getMessage());
            assertThrows(IllegalStateException.class, () -> slice.sample(0.5, v -> Double.NaN));
        });
    }
}
