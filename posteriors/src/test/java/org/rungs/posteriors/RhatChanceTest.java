package org.rungs.posteriors;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * R-hat's chance on chains that do draw from one stationary distribution: AR(1) chains
 * x_t = phi x_(t-1) + sqrt(1 - phi^2) e_t started in stationarity, 4 chains of 1,000 draws,
 * 1,000 seeded replications per phi (bulk ESS about 4,000, 1,300 and 700). A chance is a
 * p-value, so about 5% of them fall below 0.05 and 1% below 0.01; the tolerances are about
 * four Monte Carlo standard deviations (sqrt(p (1 - p) / 1000): 0.007 and 0.003) plus the
 * approximation's own error (the prototype, on the raw draws, gave 0.045 to 0.057 at 0.05).
 */
class RhatChanceTest {
    private static final int CHAINS = 4;
    private static final int ITERATIONS = 1000;
    private static final int REPLICATIONS = 1000;

    @ParameterizedTest
    @ValueSource(doubles = {0.0, 0.5, 0.7})
    void isAboutUniformOnStationaryChains(double phi) {
        SplittableRandom random = new SplittableRandom(20261203L + (long) (phi * 100));
        int below5 = 0;
        int below1 = 0;
        int above101 = 0;
        for (int r = 0; r < REPLICATIONS; r++) {
            double[][] draws = autoregressive(phi, 0, random);
            double chance = Convergence.rhatChance(draws);
            below5 += chance < 0.05 ? 1 : 0;
            below1 += chance < 0.01 ? 1 : 0;
            above101 += Convergence.rhat(draws) > 1.01 ? 1 : 0;
        }
        double share5 = (double) below5 / REPLICATIONS;
        double share1 = (double) below1 / REPLICATIONS;
        assertTrue(share5 >= 0.025 && share5 <= 0.08, "share of chances below 0.05: " + share5);
        assertTrue(share1 <= 0.025, "share of chances below 0.01: " + share1);
        if (phi == 0.7) {
            // why the verdict needs the chance: at bulk ESS near 700, the published limit of 1.01
            // flags several in a hundred quantities of chains that have converged (6.5% measured
            // with another seed over 6,400 quantities)
            double share = (double) above101 / REPLICATIONS;
            assertTrue(share >= 0.03 && share <= 0.12, "share of R-hat above 1.01: " + share);
        }
    }

    /**
     * Chains that disagree: one of four shifted by half a standard deviation. With nearly
     * independent draws the chance stays below 0.05 / 640, so the verdict calls it disagreement
     * even among the demo's 640 quantities; at bulk ESS near 700 it stays below 0.05 (it reached
     * 0.003 in one replication here: among hundreds of quantities so small a shift can pass as
     * chance, which is why the verdict never puts an R-hat above 1.03 down to chance).
     */
    @ParameterizedTest
    @ValueSource(doubles = {0.0, 0.7})
    void isSmallWhenOneChainIsShifted(double phi) {
        SplittableRandom random = new SplittableRandom(77L);
        double limit = phi == 0 ? 0.05 / 640 : 0.05;
        for (int r = 0; r < 20; r++) {
            double chance = Convergence.rhatChance(autoregressive(phi, 0.5, random));
            assertTrue(chance < limit, "chance " + chance + " in replication " + r);
        }
    }

    private static double[][] autoregressive(double phi, double shift, SplittableRandom random) {
        double innovationSd = Math.sqrt(1 - phi * phi);
        double[][] draws = new double[CHAINS][ITERATIONS];
        for (int c = 0; c < CHAINS; c++) {
            double x = random.nextGaussian();
            for (int t = 0; t < ITERATIONS; t++) {
                x = phi * x + innovationSd * random.nextGaussian();
                draws[c][t] = x + (c == 0 ? shift : 0);
            }
        }
        return draws;
    }
}
