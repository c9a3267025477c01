package org.rungs.sampler;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.simple.RandomSource;
import org.junit.jupiter.api.Test;
import org.rungs.priors.Priors;

/**
 * The block moves of tau_a and every a[g,j] ({@link AttractionUpdate}, Knorr-Held & Rue 2002)
 * must leave the same distribution invariant as the update's other moves: run alone, the update
 * samples (abar, tau_a, a, the jointly moved category widths) given the levels and classes, so
 * chains with and without the block moves must agree on every mean within Monte Carlo error.
 */
class AttractionUpdateTest {
    private static final int WARMUP = 1_000;
    private static final int SWEEPS = 40_000;
    private static final int BATCHES = 40;

    /**
     * Means of log tau_a, abar[2], abar[4] and a[0,2] on the three-group survey of
     * {@link CollapsedPosteriorTest} (attraction on 2 and 4, coarse points 0, 3, 6). Tolerance:
     * 4.5 standard errors of the difference, each from 40 batch means (common practice, no
     * source), so a false alarm has probability near 1e-5 per quantity; the seeds are fixed. With
     * the a's prior Jacobian (-log tau_a' + log tau_a per term) left out of the acceptance, log
     * tau_a's means differed by 1.25 (z = 73); with the approximations' ratio left out, the chain
     * ran off and the test did not finish in ten minutes.
     */
    @Test
    void blockMovesKeepTheConditionalPosterior() {
        double[][] with = run(AttractionUpdate.BLOCK_STEPS, 21L);
        double[][] without = run(0, 22L);
        assertSameMeans(with, without, "with the block moves", "log attraction_sd", "abar[2]", "abar[4]", "a[0,2]");
    }

    /**
     * The ridge moves (abar[j], every a[g,j] and category j's width together) take a first stage
     * on a grid of latent levels and only then the exact likelihood (delayed acceptance): chains
     * with and without that first stage must agree on the means of what the moves change, the
     * width of categories 2 and 4, abar[2], abar[4] and a[0,2], within 4.5 standard errors as above.
     * With the second stage's ratio not divided by the first's, abar[2]'s means differed by 0.12
     * (z = 23.5).
     */
    @Test
    void gridFirstStagesKeepTheConditionalPosterior() {
        double[][] with = run(AttractionUpdate.BLOCK_STEPS, 25L, true);
        double[][] without = run(AttractionUpdate.BLOCK_STEPS, 26L, false);
        assertSameMeans(with, without, "with the first stage", "log attraction_sd", "abar[2]", "abar[4]", "a[0,2]",
                "width of category 2", "width of category 4");
    }

    /**
     * The chain's attraction update holds the attractions for the first quarter of warm-up
     * ({@link AttractionUpdate#held}): unchanged through 25 sweeps of a 100-sweep warm-up (bit for
     * bit), moved within the 25 after. With the hold left out of the update the first check fails.
     */
    @Test
    void theChainsUpdateHoldsTheAttractionsForTheFirstQuarterOfWarmUp() {
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(43L);
        Priors priors = Priors.defaults();
        ChainState s = refreshed(priors, rng);
        AttractionUpdate update = AttractionUpdate.held(s, priors, rng, 100);
        double[] start = s.attraction.clone();
        double sd = s.attractionSd;
        for (int sweep = 0; sweep < 25; sweep++) {
            update.update(true);
        }
        assertTrue(java.util.Arrays.equals(start, s.attraction) && sd == s.attractionSd, "moved during the hold");
        for (int sweep = 0; sweep < 25; sweep++) {
            update.update(true);
        }
        assertTrue(!java.util.Arrays.equals(start, s.attraction) && sd != s.attractionSd, "held after the first quarter");
    }

    /**
     * After each sweep of the update every respondent's N_i (MODEL.md 4b), which the later steps
     * read, is the one recomputed from the state it leaves, coarse-class respondents included.
     * Tolerance 1e-12 relative: the moves of a[g,j] alone update N_i by increments, the
     * recomputation sums it afresh. When the spread moves kept the N_i their pass computed
     * without storing them, or left the coarse respondents' (which that pass skips) as they were,
     * the test failed (SAMPLER-RESEARCH.md, eighteenth session).
     */
    @Test
    void theNormalisersItLeavesAreThoseOfTheStateItKeeps() {
        ChainState s = CollapsedPosteriorTest.state(true, true, true, 0.5);
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(41L);
        Priors priors = Priors.defaults();
        ThresholdUpdate thresholds = ThresholdUpdate.of(s, s.start, priors, rng);
        thresholds.refresh();
        for (int i = 0; i < s.size; i++) {
            s.coarse[i] = (byte) (s.channel.isPoint(s.category[i]) && i % 3 == 0 ? 1 : 0);
        }
        AttractionUpdate update = AttractionUpdate.of(s, priors, rng);
        double[] kept = new double[s.size];
        int m = s.categories;
        for (int sweep = 0; sweep < 30; sweep++) {
            update.update(sweep < 15);
            System.arraycopy(s.normaliser, 0, kept, 0, s.size);
            for (int g = 0; g < s.groups; g++) {
                s.refreshNormalisers(g, s.start[g * m], s.start[(g + 1) * m]);
            }
            for (int i = 0; i < s.size; i++) {
                assertEquals(s.normaliser[i], kept[i], 1e-12 * s.normaliser[i], "sweep " + sweep + ", respondent " + i);
            }
        }
    }

    /** The block moves must do what they are for: log tau_a's lag-1 autocorrelation falls. */
    @Test
    void blockMovesMixTheSpread() {
        double with = lagOne(run(AttractionUpdate.BLOCK_STEPS, 23L)[0]);
        double without = lagOne(run(0, 24L)[0]);
        assertTrue(with < without - 0.1, "lag-1 autocorrelation of log tau_a " + with + " with, " + without + " without");
    }

    /**
     * The block moves' normal approximations read the likelihood's gradient and curvature from a
     * grid of latent levels: both within 1e-6 (relative to the largest entry) of central
     * differences of the full-scale respondents' log-likelihood sum of a[r] - log sum_k pi_k
     * exp(a_k) (MODEL.md 4b, the levels integrated out, the classes given) written here with
     * Commons Math's normal cdf. Tolerance: the differences' truncation and rounding error (steps
     * 1e-4, about 1e-8 relative) plus the grid's interpolation error (about 1e-7).
     */
    @Test
    void blockMovesReadTheLikelihoodFromTheGridToInterpolationError() {
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(3L);
        Priors priors = Priors.defaults();
        ChainState s = refreshed(priors, rng);
        AttractionUpdate update = AttractionUpdate.of(s, priors, rng);
        double[] point = {0.4, -0.7};
        for (int g = 0; g < s.groups; g++) {
            double[] terms = update.blockTerms(g, point);
            double largest = 0;
            for (double v : terms) {
                largest = Math.max(largest, Math.abs(v));
            }
            double h = 1e-4;
            for (int j = 0; j < 2; j++) {
                double[] up = point.clone();
                double[] down = point.clone();
                up[j] += h;
                down[j] -= h;
                double gradient = (fullScaleLogLikelihood(s, g, up) - fullScaleLogLikelihood(s, g, down)) / (2 * h);
                assertEquals(gradient, terms[j], 1e-6 * largest, "gradient " + j + ", group " + g);
                for (int l = 0; l <= j; l++) {
                    double curvature = -mixedDifference(s, g, point, j, l, h);
                    assertEquals(curvature, terms[2 + j * 2 + l], 1e-6 * largest, "curvature " + j + "," + l + ", group " + g);
                }
            }
        }
    }

    /** d^2 f / da_j da_l by central differences. */
    private static double mixedDifference(ChainState s, int g, double[] point, int j, int l, double h) {
        double sum = 0;
        for (int sj = -1; sj <= 1; sj += 2) {
            for (int sl = -1; sl <= 1; sl += 2) {
                double[] p = point.clone();
                p[j] += sj * h;
                p[l] += sl * h;
                sum += sj * sl * fullScaleLogLikelihood(s, g, p);
            }
        }
        return sum / (4 * h * h);
    }

    /** Sum over group g's full-scale respondents of a[r] - log sum_k pi_k(eta_i) exp(a_k), a = 0 outside {2, 4}. */
    private static double fullScaleLogLikelihood(ChainState s, int g, double[] a) {
        NormalDistribution normal = new NormalDistribution(0, 1);
        int m = s.categories;
        double[] attraction = new double[m];
        attraction[2] = a[0];
        attraction[4] = a[1];
        double total = 0;
        for (int i = 0; i < s.size; i++) {
            if (s.group[i] != g || s.coarse[i] == 1) {
                continue;
            }
            double eta = s.eta(i);
            double n = 0;
            for (int k = 0; k < m; k++) {
                double upper = k == m - 1 ? 1 : normal.cumulativeProbability(s.thresholds[g * (m + 1) + k + 1] - eta);
                double lower = k == 0 ? 0 : normal.cumulativeProbability(s.thresholds[g * (m + 1) + k] - eta);
                n += (upper - lower) * Math.exp(attraction[k]);
            }
            total += attraction[s.category[i]] - Math.log(n);
        }
        return total;
    }

    private static double[][] run(int blockSteps, long seed) {
        return run(blockSteps, seed, true);
    }

    private static double[][] run(int blockSteps, long seed, boolean ridgeFirstStage) {
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(seed);
        Priors priors = Priors.defaults();
        ChainState s = refreshed(priors, rng);
        AttractionUpdate update = ridgeFirstStage ? AttractionUpdate.of(s, priors, rng, blockSteps)
                : AttractionUpdate.withoutRidgeFirstStage(s, priors, rng);
        for (int t = 0; t < WARMUP; t++) {
            update.update(true);
        }
        int m = s.categories;
        double[][] out = new double[6][SWEEPS];
        for (int t = 0; t < SWEEPS; t++) {
            update.update(false);
            out[0][t] = Math.log(s.attractionSd);
            out[1][t] = s.attractionMean[2];
            out[2][t] = s.attractionMean[4];
            out[3][t] = s.attraction[2];
            out[4][t] = s.common[3] - s.common[2];
            out[5][t] = s.common[5] - s.common[4];
        }
        assertTrue(m == 7);
        return out;
    }

    /**
     * The means of each named series of two chains, {@code with[q]} and {@code without[q]}, differ
     * by less than 4.5 standard errors of the difference, each from {@link #batchMeanAndError}.
     */
    static void assertSameMeans(double[][] with, double[][] without, String withLabel, String... names) {
        for (int q = 0; q < names.length; q++) {
            double[] a = batchMeanAndError(with[q]);
            double[] b = batchMeanAndError(without[q]);
            double z = (a[0] - b[0]) / Math.sqrt(a[1] * a[1] + b[1] * b[1]);
            assertTrue(Math.abs(z) < 4.5, names[q] + ": " + a[0] + " +- " + a[1] + " " + withLabel + ", "
                    + b[0] + " +- " + b[1] + " without (z = " + z + ")");
        }
    }

    static double[] batchMeanAndError(double[] x) {
        int size = x.length / BATCHES;
        double sum = 0;
        double squares = 0;
        for (int b = 0; b < BATCHES; b++) {
            double mean = 0;
            for (int i = b * size; i < (b + 1) * size; i++) {
                mean += x[i];
            }
            mean /= size;
            sum += mean;
            squares += mean * mean;
        }
        double mean = sum / BATCHES;
        double variance = (squares - BATCHES * mean * mean) / (BATCHES - 1);
        return new double[] {mean, Math.sqrt(variance / BATCHES)};
    }

    private static double lagOne(double[] x) {
        double mean = 0;
        for (double v : x) {
            mean += v;
        }
        mean /= x.length;
        double cross = 0;
        double squares = 0;
        for (int i = 0; i < x.length; i++) {
            squares += (x[i] - mean) * (x[i] - mean);
            if (i > 0) {
                cross += (x[i] - mean) * (x[i - 1] - mean);
            }
        }
        return cross / squares;
    }

    /** The three-group survey of {@link CollapsedPosteriorTest#state} with attraction, its cdfs and N_i filled by the threshold update's refresh. */
    private static ChainState refreshed(Priors priors, UniformRandomProvider rng) {
        ChainState s = CollapsedPosteriorTest.state(true, true, true, 0.5);
        ThresholdUpdate.of(s, s.start, priors, rng).refresh();
        return s;
    }
}
