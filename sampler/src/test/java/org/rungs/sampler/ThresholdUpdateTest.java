package org.rungs.sampler;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;
import org.rungs.priors.StandardNormal;

class ThresholdUpdateTest {
    /**
     * The fast ratio must equal the difference of log interval probabilities computed in log
     * space by StandardNormal (itself checked against 256-bit references), in the body and in
     * both tails, including where the probabilities underflow.
     */
    @Test
    void fastLikelihoodRatioMatchesLogSpaceComputation() {
        double[][] cases = {
            {-0.5, 0.3, 0.35}, {-1e300, 0.1, -0.2}, {1.5, 2.0, 2.5}, {6, 7, 6.5}, {9, 10, 12},
            {-10, -9, -9.5}, {-3, Double.POSITIVE_INFINITY, 2}, {39, 40, 41}, {-41, -40, -39.9}, {0.2, 0.2001, 0.2002}
        };
        for (double[] c : cases) {
            double lower = c[0];
            double upper = c[1];
            double moved = c[2];
            if (!(moved > lower)) {
                continue;
            }
            double expected = StandardNormal.logIntervalProbability(lower, moved) - StandardNormal.logIntervalProbability(lower, upper);
            double actual = ThresholdUpdate.logRatioUpperMoved(lower, upper, moved);
            assertTrue(Double.isFinite(actual), "finite for " + java.util.Arrays.toString(c));
            // Ratios of probabilities each accurate to ~1e-15 relative: 1e-9 absolute leaves room for
            // the narrow interval, whose probabilities lose ~1e-12 to the rounding of the bounds.
            assertEquals(expected, actual, 1e-9 * Math.max(1, Math.abs(expected)), java.util.Arrays.toString(c));
        }
    }
}
