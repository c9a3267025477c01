package org.rungs.posteriors;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.SplittableRandom;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * Textbook check: for a stationary AR(1) chain x_t = phi x_(t-1) + sqrt(1 - phi^2) e_t the
 * integrated autocorrelation time is tau = (1 + phi)/(1 - phi), so the ESS of the mean of N
 * draws is N (1 - phi)/(1 + phi) (e.g. Geyer 1992, Statistical Science 7, section 3).
 *
 * <p>Tolerance: 4 Monte Carlo standard deviations of the estimate. By Sokal's approximation
 * (Sokal 1997, "Monte Carlo methods in statistical mechanics", eq. 3.19)
 * var(tau_hat)/tau^2 ~ 2 (2M + 1)/N for a summation window M; Geyer's truncation stops well
 * inside M = 6 tau for these chains, so that bound is used. Seeded, so the outcome is fixed.
 */
class AutoregressiveEssTest {
    private static final int CHAINS = 4;
    private static final int ITERATIONS = 250_000;

    @ParameterizedTest
    @ValueSource(doubles = {0.0, 0.5, 0.9})
    void essOfTheMeanIsNTimesOneMinusPhiOverOnePlusPhi(double phi) {
        double[][] draws = autoregressive(phi, new SplittableRandom(7_654_321L + (long) (phi * 1000)));
        double n = (double) CHAINS * ITERATIONS;
        double tau = (1 + phi) / (1 - phi);
        double window = 6 * tau;
        double relativeSd = Math.sqrt(2 * (2 * window + 1) / n);

        double ess = Convergence.essMean(draws);

        assertEquals(n / tau, ess, 4 * relativeSd * n / tau, "ESS of the mean for phi = " + phi);
    }

    private static double[][] autoregressive(double phi, SplittableRandom random) {
        double innovationSd = Math.sqrt(1 - phi * phi);
        double[][] draws = new double[CHAINS][ITERATIONS];
        for (double[] chain : draws) {
            double x = random.nextGaussian();
            for (int t = 0; t < ITERATIONS; t++) {
                x = phi * x + innovationSd * random.nextGaussian();
                chain[t] = x;
            }
        }
        return draws;
    }
}
