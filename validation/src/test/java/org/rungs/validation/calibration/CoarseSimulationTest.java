package org.rungs.validation.calibration;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.simple.RandomSource;
import org.junit.jupiter.api.Test;
import org.rungs.models.ModelSpec;
import org.rungs.models.StyleClasses;
import org.rungs.models.ThresholdMode;
import org.rungs.models.survey.Scale;
import org.rungs.priors.Priors;

/** The coarse-class prior draws and the rounding of the simulator (MODEL.md 4, 4a, 5). */
class CoarseSimulationTest {

    /**
     * Moments of the default style prior: E[mu_gamma] = -1; E[tau_gamma] = sqrt(2/pi) = 0.7979
     * for HN(1); Var(gamma[g]) = Var(mu_gamma) + E[tau_gamma^2] = 1 + 1 = 2; E[delta] = 0,
     * Var(delta) = 1. Tolerance: 5 Monte Carlo standard errors of 40,000 draws (sd at most
     * sqrt(2)/200 = 0.0071 for the means, about 0.016 for the variance of gamma, whose fourth
     * moment is 3 + 6 + 3 = 12 from the normal mixture; the sd of a variance estimate is then
     * sqrt((12 - 4)/40000)); the seed is fixed.
     */
    @Test
    void styleDrawsHaveThePriorMoments() {
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(new long[] {3, 4});
        int n = 40_000;
        double mean = 0;
        double sd = 0;
        double gamma = 0;
        double gammaSquares = 0;
        double delta = 0;
        double deltaSquares = 0;
        for (int i = 0; i < n; i++) {
            StyleParameters s = PriorSampler.drawStyle(Priors.defaults(), 1, 3, rng);
            mean += s.mean();
            sd += s.sd();
            gamma += s.gamma()[1];
            gammaSquares += s.gamma()[1] * s.gamma()[1];
            delta += s.delta()[0];
            deltaSquares += s.delta()[0] * s.delta()[0];
        }
        mean /= n;
        gamma /= n;
        delta /= n;
        assertEquals(-1, mean, 5 * 0.005);
        assertEquals(Math.sqrt(2 / Math.PI), sd / n, 5 * 0.003);
        assertEquals(-1, gamma, 5 * 0.0071);
        assertEquals(2, gammaSquares / n - gamma * gamma, 5 * 0.016);
        assertEquals(0, delta, 5 * 0.005);
        assertEquals(1, deltaSquares / n - delta * delta, 5 * 0.0071);
    }

    @Test
    void oneGroupHasNoSpreadAndItsInterceptIsTheMean() {
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(new long[] {5, 6});
        StyleParameters s = PriorSampler.drawStyle(Priors.defaults().with("style_mean=normal(2,0.1)"), 0, 1, rng);
        assertTrue(Double.isNaN(s.sd()));
        assertEquals(s.mean(), s.gamma()[0]);
        assertEquals(2, s.mean(), 0.6, "six prior sd");
    }

    /** MODEL.md 4a: default points {L, floor((L+U)/2), U}: {0,5,10} on 0..10 and {1,5,10} on 1..10. */
    @Test
    void defaultCoarsePointsFollowTheContract() {
        assertArrayEquals(new int[] {0, 5, 10}, SimulatedData.coarsePoints(new Scale(0, 10), StyleClasses.coarse(null)));
        assertArrayEquals(new int[] {1, 5, 10}, SimulatedData.coarsePoints(new Scale(1, 10), StyleClasses.coarse(null)));
        assertArrayEquals(new int[] {2, 4, 8}, SimulatedData.coarsePoints(new Scale(0, 10), StyleClasses.coarse(new int[] {8, 2, 4})));
    }

    /**
     * Ratings nearest one point go there; 1 and 3 on {0,2,4} are ties and go to each side with
     * probability 1/2. Tolerance: 5 binomial sd of 20,000 ties, 5 x 0.0035; the seed is fixed.
     */
    @Test
    void roundingGoesToTheNearestPointAndSplitsTies() {
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(new long[] {7, 8});
        int[] points = {0, 2, 4};
        assertEquals(0, SimulatedData.nearest(points, 0, rng));
        assertEquals(2, SimulatedData.nearest(points, 2, rng));
        assertEquals(4, SimulatedData.nearest(points, 4, rng));
        assertEquals(5, SimulatedData.nearest(new int[] {1, 5, 10}, 7, rng));
        assertEquals(10, SimulatedData.nearest(new int[] {1, 5, 10}, 8, rng));
        int n = 20_000;
        int low1 = 0;
        int low3 = 0;
        for (int i = 0; i < n; i++) {
            int r1 = SimulatedData.nearest(points, 1, rng);
            int r3 = SimulatedData.nearest(points, 3, rng);
            assertTrue(r1 == 0 || r1 == 2);
            assertTrue(r3 == 2 || r3 == 4);
            low1 += r1 == 0 ? 1 : 0;
            low3 += r3 == 2 ? 1 : 0;
        }
        assertEquals(0.5, (double) low1 / n, 5 * 0.0035);
        assertEquals(0.5, (double) low3 / n, 5 * 0.0035);
    }

    /**
     * A simulated survey where everyone is coarse has only coarse points: gamma is 8 within
     * 0.05, delta ~ N(0, 0.1), so q_i = Phi(gamma + w_i delta) is below 1 by less than
     * Phi(-5) = 3e-7 unless |w_i delta| > 3 (a 6-sd event); the seed is fixed. The style
     * covariate reaches the survey under its name.
     */
    @Test
    void coarseRespondersReportOnlyCoarsePoints() {
        Priors allCoarse = Priors.defaults().with("style_mean=normal(8,0.01)").with("style_sd=half-normal(0.01)")
                .with("style=normal(0,0.1)");
        CalibrationConfig config = CalibrationConfig.coarse(11, 1);
        config = config.withModel(new ModelSpec(ThresholdMode.BY_GROUP, allCoarse, StyleClasses.coarse(null)));
        SimulatedData data = SimulatedData.draw(config, ReplicationSeeds.stream(11, 0));
        assertEquals("w1", data.survey().style().name(0));
        assertEquals(1, data.styleStandardised().length);
        for (byte k : data.survey().category()) {
            assertTrue(k == 0 || k == 2 || k == 4, "rating " + k + " is not a coarse point");
        }
    }
}
