package org.rungs.sampler;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.LUDecomposition;
import org.apache.commons.math3.special.Erf;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.simple.RandomSource;
import org.junit.jupiter.api.Test;
import org.rungs.models.ModelSpec;
import org.rungs.models.NumberAttraction;
import org.rungs.models.RoundingChannel;
import org.rungs.models.StyleClasses;
import org.rungs.models.ThresholdMode;
import org.rungs.models.survey.Survey;
import org.rungs.priors.Priors;

/**
 * The trade step of tau_a with the thresholds ({@link AttractionTradeUpdate}) against a direct
 * computation written here: the map of its class comment with Commons Math 3.6.1's erfc and
 * inverse normal cdf, the log posterior of MODEL.md 4a-4c and 5 respondent by respondent (classes
 * given), and the Jacobian of the map of (alpha[g], c[g,.]) by central differences instead of its
 * formula. Also that the maps compose (the step's validity as a random walk on log f rests on it).
 */
class AttractionTradeUpdateTest {
    /** Scale 1..5: coarse points at positions 0, 2, 4 (MODEL.md 4a's default), 1 and 3 attracted. */
    private static final int[] ATTRACTED = {1, 3};
    private static final NormalDistribution NORMAL = new NormalDistribution(0, 1);

    @Test
    void ratioMapAndCdfsMatchADirectComputation() {
        ChainState s = state();
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(3L);
        AttractionTradeUpdate update = AttractionTradeUpdate.of(s, Priors.defaults(), rng);
        int m = s.categories;
        for (double factor : new double[] {1.6, 0.55}) {
            double[] rows = s.thresholds.clone();
            double[] alpha = s.level.intercept.clone();
            double[] attraction = s.attraction.clone();
            double logJacobian = (1 + s.groups * ATTRACTED.length) * Math.log(factor);
            for (int g = 0; g < s.groups; g++) {
                double[] delta = deltas(s, g, factor);
                for (int k : ATTRACTED) {
                    attraction[g * m + k] += delta[k];
                }
                logJacobian += groupLogJacobian(rows, g * (m + 1), alpha[g], delta, m);
                double[] moved = map(rows, g * (m + 1), alpha[g], delta, m);
                alpha[g] = moved[0];
                System.arraycopy(moved, 1, rows, g * (m + 1) + 1, m - 1);
            }
            double expected = logPosterior(s, rows, alpha, attraction, s.attractionSd * factor)
                    - logPosterior(s, s.thresholds, s.level.intercept, s.attraction, s.attractionSd) + logJacobian;
            // sums over 280 respondents of terms of order 1 and a Jacobian by central differences
            // (step 1e-5, error about 1e-9): 1e-6
            assertEquals(expected, update.proposalChange(factor) + update.likelihoodChange(), 1e-6, "log ratio at factor " + factor);
        }

        // kept: the thresholds and levels of the map, and the cdfs and N_i of the new state
        double factor = 1.6;
        double[] rows = s.thresholds.clone();
        double[] alpha = s.level.intercept.clone();
        for (int g = 0; g < s.groups; g++) {
            double[] moved = map(s.thresholds, g * (m + 1), s.level.intercept[g], deltas(s, g, factor), m);
            alpha[g] = moved[0];
            System.arraycopy(moved, 1, rows, g * (m + 1) + 1, m - 1);
        }
        update.proposalChange(factor);
        update.likelihoodChange();
        update.keep(factor);
        for (int g = 0; g < s.groups; g++) {
            assertEquals(alpha[g], s.level.intercept[g], 1e-10, "alpha of group " + g);
            for (int k = 1; k < m; k++) {
                assertEquals(rows[g * (m + 1) + k], s.thresholds[g * (m + 1) + k], 1e-10, "threshold " + k + " of group " + g);
            }
        }
        double[] cdf = s.cdf.clone();
        double[] normaliser = s.normaliser.clone();
        fillCdfs(s);
        for (int i = 0; i < cdf.length; i++) {
            assertEquals(s.cdf[i], cdf[i], 1e-12, "kept cdf " + i);
        }
        for (int i = 0; i < normaliser.length; i++) {
            assertEquals(s.normaliser[i], normaliser[i], 1e-12, "kept N_i " + i);
        }
    }

    /**
     * Across the bound of the redraw scheme's cost (BoundedRedrawSteps) the step is refused both
     * ways; on one side of it, it is not. Group 0's deviations are 0.5 and -0.5 about abar = 0 on
     * numbers 1 and 3 (a span of 1), against a bound of 1.5: a factor of 1.4 stays inside (1.4),
     * 1.6 crosses (1.6); from a state at 1.6, 0.7 comes back (1.12) and 1.1 stays out.
     */
    @Test
    void proposalsAcrossTheRedrawBoundAreRefused() {
        ChainState s = state();
        int m = s.categories;
        for (int g = 0; g < s.groups; g++) {
            s.attractionMean[1] = 0;
            s.attractionMean[3] = 0;
            s.attraction[g * m + 1] = g == 0 ? 0.5 : 0.1;
            s.attraction[g * m + 3] = g == 0 ? -0.5 : -0.1;
        }
        fillCdfs(s);
        AttractionTradeUpdate update = AttractionTradeUpdate.of(s, Priors.defaults(), RandomSource.XO_RO_SHI_RO_128_PP.create(6L), 1.5);
        assertTrue(Double.isFinite(update.proposalChange(1.4)), "inside to inside");
        assertTrue(Double.isNaN(update.proposalChange(1.6)), "inside to outside");
        s.attraction[1] = 0.8;
        s.attraction[3] = -0.8;
        fillCdfs(s);
        assertTrue(Double.isNaN(update.proposalChange(0.7)), "outside to inside");
        assertTrue(Double.isFinite(update.proposalChange(1.1)), "outside to outside");
    }

    /**
     * The delayed acceptance's first stage, the likelihood read from a grid in x'beta, against the
     * exact change over the respondents. Tolerance: cubic interpolation on nodes 0.125 apart, error
     * per respondent about 1e-5 times the fourth derivative of a log probability of order 1, over
     * 280 respondents, most of it common to both states (3e-7 seen): 1e-5, well within what the first stage needs.
     */
    @Test
    void theFirstStageFollowsTheExactLikelihoodChange() {
        ChainState s = state();
        s.level.coefficient[0] = 0.8;
        fillCdfs(s);
        AttractionTradeUpdate update = AttractionTradeUpdate.of(s, Priors.defaults(), RandomSource.XO_RO_SHI_RO_128_PP.create(5L));
        for (double factor : new double[] {1.6, 0.55, 1.05}) {
            update.proposalChange(factor);
            double exact = update.likelihoodChange();
            double approximate = update.tabulatedChange();
            assertTrue(Math.abs(exact) > 1e-2, "a change worth approximating at factor " + factor + ": " + exact);
            assertEquals(exact, approximate, 1e-5, "first stage at factor " + factor);
        }
    }

    @Test
    void theMapsOfTwoFactorsComposeToTheMapOfTheirProduct() {
        ChainState once = state();
        ChainState twice = state();
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(4L);
        AttractionTradeUpdate direct = AttractionTradeUpdate.of(once, Priors.defaults(), rng);
        AttractionTradeUpdate stepwise = AttractionTradeUpdate.of(twice, Priors.defaults(), rng);
        direct.proposalChange(1.3 * 0.6);
        direct.likelihoodChange();
        direct.keep(1.3 * 0.6);
        stepwise.proposalChange(1.3);
        stepwise.likelihoodChange();
        stepwise.keep(1.3);
        stepwise.proposalChange(0.6);
        stepwise.likelihoodChange();
        stepwise.keep(0.6);
        // a few quantiles and cdfs of order 1 apart: 1e-12
        for (int i = 0; i < once.thresholds.length; i++) {
            assertEquals(once.thresholds[i], twice.thresholds[i], 1e-12, "threshold " + i);
        }
        for (int g = 0; g < once.groups; g++) {
            assertEquals(once.level.intercept[g], twice.level.intercept[g], 1e-12, "alpha " + g);
        }
        for (int i = 0; i < once.attraction.length; i++) {
            assertEquals(once.attraction[i], twice.attraction[i], 1e-12, "attraction " + i);
        }
        assertEquals(once.attractionSd, twice.attractionSd, 1e-15);
    }

    /**
     * The ridge move's log ratio (class comment) is that of a reversible move: from a state to its
     * proposal and back with the opposite step of log tau_a and the opposite changes of the
     * attractions, the two log ratios, likelihood included, add up to zero. Each reverse
     * proposal's density must be read at the state it starts from and at the spread it returns
     * to; with the reverse proposal formed at the current state instead of the proposal, or at
     * the new spread, the sum is far from zero. Tolerance: the maps of Delta and -Delta undo each
     * other to about 1e-12 in the thresholds, over 280 respondents and the priors: 1e-8.
     */
    @Test
    void ridgeMovesAreReversible() {
        ChainState s = state();
        AttractionTradeUpdate update = AttractionTradeUpdate.of(s, Priors.defaults(), RandomSource.XO_RO_SHI_RO_128_PP.create(9L));
        update.tabulate();
        int size = ATTRACTED.length;
        int m = s.categories;
        double[] before = s.attraction.clone();
        for (double step : new double[] {0.7, -1.1}) {
            double forward = update.ridgeChange(step) + update.likelihoodChange();
            assertTrue(Double.isFinite(forward), "a proposal with a finite ratio at step " + step + ": " + forward);
            update.keep(Math.exp(step));
            double[] back = new double[s.groups * size];
            double moved = 0;
            for (int g = 0; g < s.groups; g++) {
                for (int j = 0; j < size; j++) {
                    int at = g * m + ATTRACTED[j];
                    back[g * size + j] = before[at] - s.attraction[at];
                    moved = Math.max(moved, Math.abs(back[g * size + j]));
                }
            }
            assertTrue(moved > 0.01, "the attractions moved at step " + step + ": " + moved);
            update.tabulate();
            double backward = update.ridgeChange(-step, back) + update.likelihoodChange();
            assertEquals(0, forward + backward, 1e-8, "forward " + forward + " and back " + backward + " at step " + step);
            update.keep(Math.exp(-step));
            for (int i = 0; i < before.length; i++) {
                assertEquals(before[i], s.attraction[i], 1e-12, "attraction " + i + " after the way back");
            }
        }
    }

    /**
     * Exactness of the ridge moves in a whole chain (joint step, threshold, class, attraction,
     * trade, latent-level, rescaling and regression steps) on a four-group survey with the coarse
     * class and numbers 2 and 4 of 1..5 attracted: chains with and without them must agree on the
     * posterior means of the level coefficient, group 0's intercept, a threshold of group 1, abar
     * and a[0,.] of the number 2, and log tau_a. Tolerance: 4.5 standard errors of the difference,
     * each from 40 batch means of 20,000 sweeps (common practice, no source; a false alarm near
     * 1e-5 per quantity), fixed seeds. The ridge moves are accepted about a third of the time here, at
     * steps of log tau_a of about 1.3. With the attractions' prior Jacobian (-log tau_a' + log
     * tau_a per term) left out of their ratio, log tau_a's means differed by 0.62 (z = 58).
     */
    @Test
    void ridgeMovesKeepThePosterior() {
        double[][] with = chain(AttractionTradeUpdate.RIDGES, 41L);
        double[][] without = chain(0, 42L);
        AttractionUpdateTest.assertSameMeans(with, without, "with the ridge moves", "level coefficient", "intercept[0]",
                "threshold[1,2]", "abar[2]", "a[0,2]", "log attraction_sd");
    }

    private static double[][] chain(double ridges, long seed) {
        ModelSpec spec = new ModelSpec(ThresholdMode.BY_GROUP, Priors.defaults(), StyleClasses.coarse(new int[] {1, 3, 5}))
                .withAttraction(NumberAttraction.of(2, 4));
        int warmup = 1_000;
        Chain chain = Chain.of(SurveyOrder.of(FitterTest.smallSurvey(6L, 40)), spec, true, warmup,
                RandomSource.XO_RO_SHI_RO_128_PP.create(seed), BoundedRedrawSteps.MAX_RANGE, ridges);
        return BoundedRedrawStepsTest.record(chain, warmup, 20_000);
    }

    /** The small four-group survey, a third of its coarse-point answers in the coarse class, every cache filled. */
    private static ChainState state() {
        Survey survey = FitterTest.smallSurvey(5L, 70);
        RoundingChannel channel = RoundingChannel.of(survey.scale(), RoundingChannel.defaultPoints(survey.scale()));
        ChainState s = new ChainState(SurveyOrder.of(survey), true, channel, ATTRACTED);
        InitialValues.apply(s, -1, RandomSource.XO_RO_SHI_RO_128_PP.create(8L));
        int m = s.categories;
        int stride = m + 1;
        s.level.coefficient[0] = 0.4;
        s.level.mean = 0.1;
        s.level.sd = 0.3;
        s.attractionSd = 0.2;
        s.thresholdSd = 0.15;
        for (int g = 0; g < s.groups; g++) {
            s.level.intercept[g] = 0.1 * g - 0.2;
            for (int k = 1; k < m; k++) {
                s.thresholds[g * stride + k] = s.common[k] + 0.03 * (g - 1.5) * (k - 2.5);
            }
        }
        for (int k : ATTRACTED) {
            s.attractionMean[k] = 0.1 * k - 0.15;
            for (int g = 0; g < s.groups; g++) {
                s.attraction[g * m + k] = s.attractionMean[k] + 0.07 * (g - 1.5) * (k - 1.2);
            }
        }
        for (int i = 0; i < s.size; i++) {
            s.coarse[i] = (byte) (i % 3 == 0 && channel.isPoint(s.category[i]) ? 1 : 0);
        }
        fillCdfs(s);
        return s;
    }

    private static void fillCdfs(ChainState s) {
        int m = s.categories;
        for (int g = 0; g < s.groups; g++) {
            for (int i = s.start[g * m]; i < s.start[(g + 1) * m]; i++) {
                for (int k = 1; k < m; k++) {
                    s.cdf[k * s.size + i] = phi(s.thresholds[g * (m + 1) + k] - s.eta(i));
                }
            }
            s.refreshNormalisers(g, s.start[g * m], s.start[(g + 1) * m]);
        }
    }

    private static double[] deltas(ChainState s, int g, double factor) {
        double[] delta = new double[s.categories];
        for (int k : ATTRACTED) {
            delta[k] = (factor - 1) * (s.attraction[g * s.categories + k] - s.attractionMean[k]);
        }
        return delta;
    }

    private static double phi(double x) {
        return 0.5 * Erf.erfc(-x / Math.sqrt(2));
    }

    /** The class comment's map of one group: (alpha', c'[1..M-1]) from alpha and the row at {@code row}. */
    private static double[] map(double[] rows, int row, double alpha, double[] delta, int m) {
        double[] p = new double[m];
        double z = 0;
        for (int k = 0; k < m; k++) {
            double upper = k == m - 1 ? 1 : phi(rows[row + k + 1] - alpha);
            double lower = k == 0 ? 0 : phi(rows[row + k] - alpha);
            p[k] = upper - lower;
            z += p[k] * Math.exp(-delta[k]);
        }
        double[] out = new double[m];
        double cumulative = 0;
        double sumC = 0;
        double sumQ = 0;
        for (int k = 1; k < m; k++) {
            cumulative += p[k - 1] * Math.exp(-delta[k - 1]) / z;
            out[k] = NORMAL.inverseCumulativeProbability(cumulative);
            sumC += rows[row + k];
            sumQ += out[k];
        }
        out[0] = (sumC - sumQ) / (m - 1);
        for (int k = 1; k < m; k++) {
            out[k] += out[0];
        }
        return out;
    }

    /**
     * log |det| of the map of (alpha, c[1..M-2]) (c[M-1] fixed by the thresholds' sum), by
     * central differences.
     */
    private static double groupLogJacobian(double[] rows, int row, double alpha, double[] delta, int m) {
        int d = m - 1;
        double sum = 0;
        for (int k = 1; k < m; k++) {
            sum += rows[row + k];
        }
        double[][] jacobian = new double[d][d];
        double h = 1e-5;
        for (int c = 0; c < d; c++) {
            double[] up = free(rows, row, alpha, m);
            double[] down = up.clone();
            up[c] += h;
            down[c] -= h;
            double[] fu = mapFree(up, sum, delta, m);
            double[] fd = mapFree(down, sum, delta, m);
            for (int r = 0; r < d; r++) {
                jacobian[r][c] = (fu[r] - fd[r]) / (2 * h);
            }
        }
        return Math.log(Math.abs(new LUDecomposition(new Array2DRowRealMatrix(jacobian)).getDeterminant()));
    }

    private static double[] free(double[] rows, int row, double alpha, int m) {
        double[] x = new double[m - 1];
        x[0] = alpha;
        System.arraycopy(rows, row + 1, x, 1, m - 2);
        return x;
    }

    private static double[] mapFree(double[] x, double sum, double[] delta, int m) {
        double[] rows = new double[m + 1];
        rows[0] = Double.NEGATIVE_INFINITY;
        rows[m] = Double.POSITIVE_INFINITY;
        double last = sum;
        for (int k = 1; k < m - 1; k++) {
            rows[k] = x[k];
            last -= x[k];
        }
        rows[m - 1] = last;
        double[] out = map(rows, 0, x[0], delta, m);
        return java.util.Arrays.copyOf(out, m - 1);
    }

    /** MODEL.md 4a-4c and 5, written out: the terms that the trade step can change. */
    private static double logPosterior(ChainState s, double[] rows, double[] alpha, double[] attraction, double tau) {
        int m = s.categories;
        int stride = m + 1;
        double log = 0;
        for (int i = 0; i < s.size; i++) {
            int g = s.group[i];
            double eta = s.eta(i) - s.level.intercept[g] + alpha[g];
            double[] pi = new double[m];
            for (int k = 0; k < m; k++) {
                double upper = k == m - 1 ? 1 : phi(rows[g * stride + k + 1] - eta);
                double lower = k == 0 ? 0 : phi(rows[g * stride + k] - eta);
                pi[k] = upper - lower;
            }
            int r = s.category[i];
            if (s.coarse[i] == 1) {
                double p = 0;
                for (int k = 0; k < m; k++) {
                    p += s.channel.probability(r, k) * pi[k];
                }
                log += Math.log(p);
            } else {
                double normaliser = 0;
                for (int k = 0; k < m; k++) {
                    normaliser += pi[k] * Math.exp(attraction[g * m + k]);
                }
                log += Math.log(pi[r] * Math.exp(attraction[g * m + r]) / normaliser);
            }
        }
        for (int g = 0; g < s.groups; g++) {
            log += -0.5 * (alpha[g] - s.level.mean) * (alpha[g] - s.level.mean) / (s.level.sd * s.level.sd);
            for (int k : ATTRACTED) {
                double t = attraction[g * m + k] - s.attractionMean[k];
                log += -0.5 * t * t / (tau * tau) - Math.log(tau);
            }
            for (int k = 1; k < m; k++) {
                double d = rows[g * stride + k] - s.common[k];
                log += -0.5 * d * d / (s.thresholdSd * s.thresholdSd);
            }
        }
        // tau_a ~ Half-Normal(0, 0.3), MODEL.md 5
        return log - 0.5 * tau * tau / 0.09;
    }
}
