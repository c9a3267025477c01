package org.rungs.posteriors;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/** Behaviour of the public functions beyond the reference values (see ConvergenceReferenceTest). */
class ConvergenceTest {

    /** posterior 1.4.0 returns NA for constant draws (should_return_NA); here NaN. */
    @Test
    void constantDrawsHaveUndefinedDiagnostics() {
        double[][] constant = {{2.5, 2.5, 2.5, 2.5, 2.5, 2.5, 2.5, 2.5}, {2.5, 2.5, 2.5, 2.5, 2.5, 2.5, 2.5, 2.5}};
        assertTrue(Double.isNaN(Convergence.rhat(constant)));
        assertTrue(Double.isNaN(Convergence.essBulk(constant)));
        assertTrue(Double.isNaN(Convergence.essTail(constant)));
        assertTrue(Double.isNaN(Convergence.essMean(constant)));
        assertTrue(Double.isNaN(Convergence.mcseMean(constant)));
        assertTrue(Double.isNaN(Convergence.mcseQuantile(constant, 0.5)));
    }

    @Test
    void nanDrawsMakeEveryDiagnosticNaN() {
        double[][] draws = randomDraws(4, 100, 3);
        draws[1][10] = Double.NaN;
        assertTrue(Double.isNaN(Convergence.rhat(draws)));
        assertTrue(Double.isNaN(Convergence.essBulk(draws)));
        assertTrue(Double.isNaN(Convergence.mcseSd(draws)));
    }

    /** Rank-based diagnostics depend only on the order of the draws. */
    @Test
    void bulkDiagnosticsAreInvariantUnderMonotoneTransforms() {
        double[][] draws = randomDraws(4, 300, 9);
        double[][] transformed = new double[4][300];
        for (int c = 0; c < 4; c++) {
            for (int i = 0; i < 300; i++) {
                transformed[c][i] = Math.exp(3 * draws[c][i]);
            }
        }
        assertEquals(Convergence.rhatBulk(draws), Convergence.rhatBulk(transformed), 0);
        assertEquals(Convergence.essBulk(draws), Convergence.essBulk(transformed), 0);
    }

    @Test
    void rhatIsTheLargerOfBulkAndTail() {
        double[][] draws = randomDraws(3, 200, 21);
        // a wider third chain raises the folded (tail) R-hat more than the bulk one
        for (int i = 0; i < 200; i++) {
            draws[2][i] *= 3;
        }
        double tail = Convergence.rhatTail(draws);
        assertTrue(tail > Convergence.rhatBulk(draws));
        assertEquals(tail, Convergence.rhat(draws), 0);
    }

    @Test
    void rejectsRaggedChainsAndBadProbabilities() {
        assertThrows(IllegalArgumentException.class, () -> Convergence.rhat(new double[][] {{1, 2, 3}, {1, 2}}));
        assertThrows(IllegalArgumentException.class, () -> Convergence.rhat(new double[0][]));
        assertThrows(IllegalArgumentException.class, () -> Convergence.essQuantile(randomDraws(2, 10, 1), 1.5));
    }

    static double[][] randomDraws(int chains, int iterations, long seed) {
        SplittableRandom random = new SplittableRandom(seed);
        double[][] draws = new double[chains][iterations];
        for (double[] chain : draws) {
            for (int i = 0; i < iterations; i++) {
                chain[i] = random.nextGaussian();
            }
        }
        return draws;
    }
}
