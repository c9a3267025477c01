package org.rungs.posteriors;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.apache.commons.math3.stat.descriptive.moment.Mean;
import org.apache.commons.math3.stat.descriptive.moment.StandardDeviation;
import org.apache.commons.math3.stat.descriptive.rank.Percentile;
import org.junit.jupiter.api.Test;

class SummariesTest {

    /** reference: R 4.2.2, package posterior 1.4.0, rhat = 1.1454 for this fixture (reference.csv). */
    @Test
    void shiftedChainsAreFlaggedForRhat() throws IOException {
        ParameterSummary shifted = Summaries.of(ConvergenceReferenceTest.drawsOf("shifted")).get(0);
        assertTrue(shifted.rhat() > 1.01, "rhat " + shifted.rhat());
        assertTrue(shifted.flagged());
        assertTrue(shifted.flagReasons().contains("rhat>1.01"), shifted.flagReasons().toString());
    }

    /** AR(1) with phi = 0.5 over 4 x 1000 draws mixes well: ESS about 1300 > 400 (posterior 1.4.0 agrees). */
    @Test
    void wellMixedChainsPass() throws IOException {
        ParameterSummary ar = Summaries.of(ConvergenceReferenceTest.drawsOf("ar05")).get(0);
        assertFalse(ar.flagged(), ar.toString());
        assertEquals("ok", ar.flag());
    }

    /** Quantiles against Commons Math's own R-7 estimator, moments against its Mean and StandardDeviation. */
    @Test
    void quantilesAndMomentsMatchADirectComputation() {
        SplittableRandom random = new SplittableRandom(2024);
        for (int[] shape : new int[][] {{4, 1000}, {3, 101}, {1, 7}, {2, 50}}) {
            double[][] draws = new double[shape[0]][shape[1]];
            double[] all = new double[shape[0] * shape[1]];
            for (int c = 0; c < shape[0]; c++) {
                for (int i = 0; i < shape[1]; i++) {
                    double v = Math.exp(random.nextGaussian());
                    draws[c][i] = v;
                    all[c * shape[1] + i] = v;
                }
            }
            ParameterSummary s = Summaries.of("x", draws);
            Percentile r7 = new Percentile().withEstimationType(Percentile.EstimationType.R_7);
            String shapeText = shape[0] + "x" + shape[1];
            // the two type-7 formulas differ only in rounding
            assertEquals(r7.evaluate(all, 5), s.q05(), 1e-14, shapeText);
            assertEquals(r7.evaluate(all, 50), s.q50(), 1e-14, shapeText);
            assertEquals(r7.evaluate(all, 95), s.q95(), 1e-14, shapeText);
            assertEquals(new Mean().evaluate(all), s.mean(), 1e-13, shapeText);
            assertEquals(new StandardDeviation().evaluate(all), s.sd(), 1e-13, shapeText);
        }
    }

    @Test
    void parallelSummariesEqualOneByOneSummaries() {
        Draws draws = randomDraws(57, 3, 120, 8);
        List<ParameterSummary> all = Summaries.of(draws);
        for (int p = 0; p < draws.parameterCount(); p++) {
            assertEquals(Summaries.of(draws.names().get(p), draws.chainsOf(p)), all.get(p));
        }
    }

    /** MODEL.md section 7: undefined diagnostics of a constant parameter do not flag it. */
    @Test
    void constantParameterIsNotFlagged() {
        Draws draws = randomDraws(2, 4, 100, 3);
        for (int c = 0; c < 4; c++) {
            for (int i = 0; i < 100; i++) {
                draws.set(1, c, i, 0.25);
            }
        }
        ParameterSummary constant = Summaries.of(draws).get(1);
        assertTrue(Double.isNaN(constant.rhat()) && Double.isNaN(constant.essBulk()));
        assertEquals(0.25, constant.mean(), 0);
        assertEquals(0, constant.sd(), 0);
        assertFalse(constant.flagged());
    }

    @Test
    void nonFiniteDrawsAreFlagged() {
        Draws draws = randomDraws(2, 4, 100, 4);
        draws.set(0, 2, 50, Double.POSITIVE_INFINITY);
        draws.set(1, 0, 0, Double.NaN);
        for (ParameterSummary s : Summaries.of(draws)) {
            assertTrue(s.flagged(), s.toString());
            assertTrue(s.flagReasons().contains("non-finite draws"), s.flagReasons().toString());
        }
    }

    /** Chains of 5 iterations split into halves of 2, too short for an ESS (posterior needs 3). */
    @Test
    void tooShortChainsAreFlagged() {
        ParameterSummary s = Summaries.of(randomDraws(1, 4, 5, 6)).get(0);
        assertTrue(Double.isNaN(s.essBulk()));
        assertTrue(s.flagReasons().contains("too few draws"), s.flagReasons().toString());
    }

    /** Chains of 1 to 3 iterations cannot be split into halves long enough for R-hat (2) or ESS (3). */
    @Test
    void tinyChainsGiveUndefinedDiagnosticsButValidSummaries() {
        for (int iterations = 1; iterations <= 3; iterations++) {
            ParameterSummary s = Summaries.of(randomDraws(1, 2, iterations, iterations)).get(0);
            assertTrue(Double.isNaN(s.rhat()) && Double.isNaN(s.essBulk()) && Double.isNaN(s.essTail()), s.toString());
            assertTrue(Double.isFinite(s.mean()) && s.q05() <= s.q50() && s.q50() <= s.q95(), s.toString());
            assertTrue(s.flagged(), s.toString());
        }
    }


    /** Parameter p is AR(1) with phi = (p mod 10)/10, so some parameters mix slowly. */
    static Draws randomDraws(int parameters, int chains, int iterations, long seed) {
        List<String> names = new ArrayList<>();
        for (int p = 0; p < parameters; p++) {
            names.add("theta[" + (p + 1) + "]");
        }
        Draws draws = new Draws(names, chains, iterations);
        SplittableRandom random = new SplittableRandom(seed);
        for (int p = 0; p < parameters; p++) {
            double phi = (p % 10) / 10.0;
            for (int c = 0; c < chains; c++) {
                double v = random.nextGaussian();
                for (int i = 0; i < iterations; i++) {
                    v = phi * v + Math.sqrt(1 - phi * phi) * random.nextGaussian();
                    draws.set(p, c, i, v);
                }
            }
        }
        return draws;
    }
}
