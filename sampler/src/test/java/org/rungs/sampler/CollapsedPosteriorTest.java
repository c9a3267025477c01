package org.rungs.sampler;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.apache.commons.rng.simple.RandomSource;
import org.junit.jupiter.api.Test;
import org.rungs.models.ResponseLikelihood;
import org.rungs.models.RoundingChannel;
import org.rungs.models.survey.Covariates;
import org.rungs.models.survey.Scale;
import org.rungs.models.survey.Survey;
import org.rungs.priors.Normal;
import org.rungs.priors.Priors;
import org.rungs.priors.StandardNormal;

class CollapsedPosteriorTest {
    private static final Priors PRIORS = Priors.defaults();

    /** Three groups on 0..6 with one level and one style covariate; group 2 sits far above the scale. */
    private static Survey survey() {
        return survey(150, true);
    }

    /** n respondents in three groups on 0..6 with one level covariate and, if asked, one 0/1 style covariate. */
    static Survey survey(int n, boolean style) {
        return survey(n, style ? 2 : 0);
    }

    /** As {@link #survey(int, boolean)} with a style covariate of {@code styleValues} values 0, 1, ... (none if 0). */
    static Survey survey(int n, int styleValues) {
        boolean style = styleValues > 0;
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(11L);
        ZigguratSampler.NormalizedGaussian normal = ZigguratSampler.NormalizedGaussian.of(rng);
        int[] group = new int[n];
        double[] x = new double[n];
        double[] w = new double[n];
        byte[] category = new byte[n];
        for (int i = 0; i < n; i++) {
            group[i] = i % 3;
            x[i] = normal.sample();
            w[i] = rng.nextInt(Math.max(styleValues, 1));
            category[i] = (byte) rng.nextInt(7);
        }
        return Survey.of(new Scale(0, 6), category, group, List.of("a", "b", "c"),
                Covariates.fromNumeric(List.of("x"), List.of(x)),
                style ? Covariates.fromNumeric(List.of("w"), List.of(w)) : Covariates.none(), null);
    }

    static ChainState state(boolean byGroup, boolean coarse, boolean attraction, double far) {
        return state(survey(), byGroup, coarse, attraction, far);
    }

    private static ChainState state(Survey survey, boolean byGroup, boolean coarse, boolean attraction, double far) {
        RoundingChannel channel = coarse ? RoundingChannel.of(survey.scale(), new int[] {0, 3, 6}) : null;
        ChainState s = new ChainState(SurveyOrder.of(survey), byGroup, channel, attraction ? new int[] {2, 4} : new int[0]);
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(5L);
        InitialValues.apply(s, -1, rng);
        int stride = s.categories + 1;
        for (int g = 0; g < s.groups && byGroup; g++) {
            double shift = 0;
            for (int k = 1; k < s.categories; k++) {
                s.thresholds[g * stride + k] += 0.04 * (g - 1) * (k - 3.5);
                shift += 0.04 * (g - 1) * (k - 3.5);
            }
            assertEquals(0, shift, 1e-12);
        }
        s.level.intercept[2] = far; // 6: log-likelihoods near -20; 40: probabilities below 1e-300, the log-space path
        s.level.coefficient[0] = 0.4;
        if (coarse) {
            if (s.style.count > 0) {
                s.style.coefficient[0] = -0.3;
            }
            s.style.intercept[1] = 0.2;
        }
        if (attraction) {
            s.attractionSd = 0.3;
            for (int g = 0; g < s.groups; g++) {
                s.attraction[g * s.categories + 2] = 0.3 - 0.2 * g;
                s.attraction[g * s.categories + 4] = -0.4 + 0.1 * g;
            }
            s.attractionMean[2] = 0.1;
            s.attractionMean[4] = -0.2;
        }
        return s;
    }

    /**
     * The 16 states the tests run through: bit 0 shared thresholds, bit 1 no coarse class, bit 2 no
     * attraction, bit 3 group 2 at 40 instead of 6 (its respondents then take the log-space path).
     */
    /** Variants 0..15 with a style covariate, 16..31 the same without one (the exact pass cell by cell). */
    private static ChainState variant(int variant) {
        int v = variant % 16;
        return state(variant < 16 ? survey() : survey(150, false), byGroup(v), coarse(v), (v / 4) % 2 == 0, v < 8 ? 6 : 40);
    }

    private static boolean byGroup(int variant) {
        return variant % 2 == 0;
    }

    private static boolean coarse(int variant) {
        return (variant / 2) % 2 == 0;
    }

    /** MODEL.md 4c summed over respondents, through ResponseLikelihood, plus MODEL.md 3 and 5 priors, from the state. */
    private static double directLogPosterior(ChainState s) {
        return directLogPosterior(s, 1);
    }

    /** As above, the likelihood summed over every {@code every}-th respondent and counted that many times. */
    private static double directLogPosterior(ChainState s, int every) {
        int m = s.categories;
        int stride = m + 1;
        double total = 0;
        double[] a = new double[m];
        for (int i = 0; i < s.size; i += every) {
            int g = s.group[i];
            System.arraycopy(s.attraction, g * m, a, 0, m);
            double q = s.style == null ? 0 : StandardNormal.cdf(s.style.linear(i, g));
            total += every * ResponseLikelihood.logRespondentAttracted(s.channel, s.thresholds, g * stride, s.category[i], s.eta(i), q, a);
        }
        total += pooled(s.level, PRIORS.groupMean());
        for (double b : s.level.coefficient) {
            total += PRIORS.level().logDensity(b);
        }
        for (int k = 2; k < m; k++) {
            total += Math.log(s.common[k] - s.common[k - 1]); // the vector holds the gaps' logs: their Jacobian
            for (int g = 0; g < s.groups && s.byGroup && s.attractionOn(); g++) {
                // under attraction a group's gap is G exp(tau_d u / G), G the common gap: the Jacobian of u, up to a constant
                double gap = s.thresholds[g * stride + k] - s.thresholds[g * stride + k - 1];
                total += Math.log(gap / (s.common[k] - s.common[k - 1]));
            }
        }
        for (int k = 1; k < m; k++) {
            total += -0.5 * s.common[k] * s.common[k] / 9;
            for (int g = 0; g < s.groups && s.byGroup; g++) {
                double d = s.thresholds[g * stride + k] - s.common[k];
                total += -0.5 * d * d / (s.thresholdSd * s.thresholdSd);
            }
        }
        if (s.style != null) {
            total += pooled(s.style, PRIORS.styleMean());
            for (double b : s.style.coefficient) {
                total += PRIORS.style().logDensity(b);
            }
        }
        if (s.attracted.length > 0) {
            // The vector holds z = (a - abar) / tau_a and log tau_a: their Jacobian, and tau_a's prior.
            total += PRIORS.attractionSd().logDensity(s.attractionSd)
                    + (s.groups * s.attracted.length + 1) * Math.log(s.attractionSd);
        }
        for (int k : s.attracted) {
            total += PRIORS.attractionMean().logDensity(s.attractionMean[k]);
            for (int g = 0; g < s.groups; g++) {
                double d = s.attraction[g * m + k] - s.attractionMean[k];
                total += -0.5 * d * d / (s.attractionSd * s.attractionSd) - Math.log(s.attractionSd);
            }
        }
        return total;
    }

    private static double pooled(RegressionBlock b, Normal meanPrior) {
        double lp = meanPrior.logDensity(b.mean);
        for (double alpha : b.intercept) {
            lp += -0.5 * (alpha - b.mean) * (alpha - b.mean) / (b.sd * b.sd);
        }
        return lp;
    }

    /**
     * Changes of the collapsed log posterior between two points equal changes of the direct sum,
     * and read undoes write, in each combination of threshold mode, coarse class, attraction and
     * style covariate.
     */
    @Test
    void densityMatchesRespondentByRespondentSum() {
        for (int variant = 0; variant < 32; variant++) {
            ChainState s = variant(variant);
            CollapsedPosterior posterior = new CollapsedPosterior(s, PRIORS);
            double[] theta = new double[posterior.dimension()];
            posterior.read(theta);
            double before = posterior.logDensity(theta);
            double directBefore = directLogPosterior(s);
            double[] moved = theta.clone();
            for (int j = 0; j < moved.length; j++) {
                moved[j] += 0.01 * Math.sin(3.0 * j + variant);
            }
            posterior.write(moved);
            double[] back = new double[moved.length];
            posterior.read(back);
            for (int j = 0; j < moved.length; j++) {
                assertEquals(moved[j], back[j], 1e-12, "coordinate " + j + " of variant " + variant);
            }
            double after = posterior.logDensity(moved);
            // Both sums hold a few hundred terms exact to ~1e-14 each.
            assertEquals(directLogPosterior(s) - directBefore, after - before, 1e-9, "variant " + variant);
        }
    }

    /**
     * By group under attraction, any moderate vector keeps every group's thresholds increasing:
     * the gap coordinates move a gap on a log scale, so the joint step meets no wall where
     * thresholds cross (with the deviations as plain differences, as without attraction, moves of
     * +-3 crossed them: checked on those variants, which must cross).
     */
    @Test
    void groupGapCoordinatesNeverCrossTheThresholds() {
        for (int variant = 0; variant < 32; variant += 2) {
            ChainState s = variant(variant);
            if (!s.attractionOn()) {
                CollapsedPosterior plain = new CollapsedPosterior(s, PRIORS);
                double[] theta = new double[plain.dimension()];
                plain.read(theta);
                for (int j = 0; j < s.groups * (s.categories - 2); j++) {
                    theta[plain.deviationAt + j] += 3 * Math.sin(7.0 * j + variant);
                }
                assertEquals(Double.NEGATIVE_INFINITY, plain.logDensity(theta), "variant " + variant);
                continue;
            }
            CollapsedPosterior posterior = new CollapsedPosterior(s, PRIORS);
            double[] theta = new double[posterior.dimension()];
            posterior.read(theta);
            int perGroup = s.categories - 2;
            for (int j = 0; j < s.groups * perGroup; j++) {
                theta[posterior.deviationAt + j] += 3 * Math.sin(7.0 * j + variant);
            }
            assertTrue(Double.isFinite(posterior.logDensity(theta)), "variant " + variant);
            posterior.write(theta);
            for (int g = 0; g < s.groups; g++) {
                for (int k = 2; k < s.categories; k++) {
                    assertTrue(s.thresholds[g * (s.categories + 1) + k] > s.thresholds[g * (s.categories + 1) + k - 1],
                            "group " + g + ", threshold " + k + ", variant " + variant);
                }
            }
        }
    }

    /** On a sample (every third respondent, counted three times), changes match the direct sum over that sample. */
    @Test
    void sampledDensityCountsEachSampledRespondentAsMany() {
        ChainState s = state(true, true, false, 6);
        CollapsedPosterior posterior = new CollapsedPosterior(s, PRIORS);
        posterior.sampleEvery(3);
        double[] theta = new double[posterior.dimension()];
        posterior.read(theta);
        double before = posterior.logDensity(theta);
        double directBefore = directLogPosterior(s, 3);
        for (int j = 0; j < theta.length; j++) {
            theta[j] += 0.02 * Math.cos(j);
        }
        posterior.write(theta);
        assertEquals(directLogPosterior(s, 3) - directBefore, posterior.logDensity(theta) - before, 1e-9);
    }

    /**
     * The analytic gradient equals central differences of the density (step 1e-6: truncation
     * ~1e-12 and rounding ~1e-16 * |log density| / 1e-6, below 1e-6 relative).
     */
    @Test
    void gradientMatchesFiniteDifferences() {
        for (int variant = 0; variant < 32; variant++) {
            ChainState s = variant(variant);
            CollapsedPosterior posterior = new CollapsedPosterior(s, PRIORS);
            double[] theta = new double[posterior.dimension()];
            posterior.read(theta);
            double[] gradient = new double[theta.length];
            double value = posterior.gradient(theta, gradient);
            assertTrue(Double.isFinite(value), "finite at the state, variant " + variant);
            for (int j = 0; j < theta.length; j++) {
                double h = 1e-6;
                double[] up = theta.clone();
                double[] down = theta.clone();
                up[j] += h;
                down[j] -= h;
                double numeric = (posterior.logDensity(up) - posterior.logDensity(down)) / (2 * h);
                assertEquals(numeric, gradient[j], 1e-5 * Math.max(1, Math.abs(numeric)), "coordinate " + j + " of variant " + variant);
            }
        }
    }

    /**
     * The leapfrog's gradient without the density, {@code gradientOnly}: the same doubles as the
     * full evaluation (on the probability paths and, with respondents 40 sd out, the log-space
     * one), minus infinity where a group's thresholds cross, and the density path back afterwards.
     * The leapfrog's inner force, {@code force}: with style covariates and without attraction that
     * gradient itself; without style covariates it sums the coefficients' gradient cell by cell (so
     * in another order; these cells are too small for AnswerGrid, see the test after next); under
     * attraction it reads the normaliser from a grid (NormaliserGrid), within 1e-7 of the gradient
     * in every coordinate relative to the largest entry (cubic Hermite on nodes 1/8 apart: error
     * near h^4/384 = 6e-7 times a fourth derivative; measured 3e-8 at most here, and 16 times
     * less with nodes 1/16 apart, as h^4 predicts), the same doubles when asked twice (a fixed
     * function of the position), minus infinity on a wall.
     */
    @Test
    void gradientOnlyAndForceGiveTheGradientAndWalls() {
        for (int variant = 0; variant < 16; variant++) {
            boolean byGroup = byGroup(variant);
            boolean attraction = (variant / 4) % 2 == 0;
            ChainState s = variant(variant);
            CollapsedPosterior posterior = new CollapsedPosterior(s, PRIORS);
            assertEquals(attraction || !coarse(variant), posterior.approximatesForce(), "variant " + variant);
            double[] theta = new double[posterior.dimension()];
            posterior.read(theta);
            double[] full = new double[theta.length];
            double[] only = new double[theta.length];
            double[] force = new double[theta.length];
            double value = posterior.gradient(theta, full);
            assertTrue(Double.isFinite(posterior.gradientOnly(theta, only)), "variant " + variant);
            assertArrayEquals(full, only, 0.0, "variant " + variant);
            assertEquals(value, posterior.gradient(theta, full), 0.0, "the density again after, variant " + variant);
            assertTrue(Double.isFinite(posterior.force(theta, force)), "variant " + variant);
            double largest = 0;
            for (double v : full) {
                largest = Math.max(largest, Math.abs(v));
            }
            for (int j = 0; j < theta.length; j++) {
                assertEquals(full[j], force[j], posterior.approximatesForce() ? 1e-7 * largest : 0.0, "coordinate " + j + " of variant " + variant);
            }
            double[] again = new double[theta.length];
            posterior.force(theta, again);
            assertArrayEquals(force, again, 0.0, "variant " + variant);
            assertEquals(value, posterior.gradient(theta, full), 0.0, "the exact path back after, variant " + variant);
            if (byGroup && attraction) {
                // group 0's first gap underflows to 0 (its coordinates keep every gap positive otherwise)
                theta[posterior.deviationAt] -= 1e6;
                assertEquals(Double.NEGATIVE_INFINITY, posterior.gradientOnly(theta, only), "variant " + variant);
                assertEquals(Double.NEGATIVE_INFINITY, posterior.force(theta, force), "variant " + variant);
            } else if (byGroup) {
                theta[posterior.deviationAt] += 50; // group 0's first threshold above its second
                assertEquals(Double.NEGATIVE_INFINITY, posterior.gradientOnly(theta, only), "variant " + variant);
                assertEquals(Double.NEGATIVE_INFINITY, posterior.force(theta, force), "variant " + variant);
            }
        }
    }

    /**
     * With cells of a few hundred respondents, the force reads each (group, answer) cell's
     * gradient from a grid in eta (AnswerGrid); under attraction with a 0/1 style covariate one
     * grid per value, the respondents' values mixed within cells (SurveyOrder.of keeps the file's
     * order there), while the coarse class with that covariate and without attraction takes the
     * exact gradient:
     * within 1e-6 of the exact
     * gradient in every coordinate relative to the largest entry (four-point Lagrange on nodes
     * 1/16 apart: error at most (9/16) h^4 / 24 = 3.6e-7 times a fourth derivative; measured
     * below 3e-8 here), not the exact gradient bit for bit (so the grid was read), and the same
     * doubles when asked twice. Group 2 at 2.5: its high answers are the likely ones.
     */
    @Test
    void forceReadsLargeCellsFromTheAnswerGrid() {
        for (int variant = 0; variant < 16; variant++) {
            Survey survey = survey(8000, variant >= 8);
            boolean byGroup = byGroup(variant);
            boolean coarse = coarse(variant);
            boolean attraction = (variant / 4) % 2 == 0;
            CollapsedPosterior posterior = new CollapsedPosterior(state(survey, byGroup, coarse, attraction, 2.5), PRIORS);
            double[] theta = new double[posterior.dimension()];
            posterior.read(theta);
            double[] exact = new double[theta.length];
            double[] force = new double[theta.length];
            posterior.gradient(theta, exact);
            assertTrue(Double.isFinite(posterior.force(theta, force)), "variant " + variant);
            double largest = 0;
            double difference = 0;
            for (int j = 0; j < theta.length; j++) {
                largest = Math.max(largest, Math.abs(exact[j]));
                difference = Math.max(difference, Math.abs(exact[j] - force[j]));
            }
            for (int j = 0; j < theta.length; j++) {
                assertEquals(exact[j], force[j], 1e-6 * largest, "coordinate " + j + " of variant " + variant);
            }
            if (variant < 8 || attraction || !coarse) {
                assertTrue(difference > 0, "variant " + variant + " read the grid");
            } else {
                assertArrayEquals(exact, force, 0.0, "variant " + variant + ": style covariates without attraction, the gradient itself");
            }
            double[] again = new double[theta.length];
            posterior.force(theta, again);
            assertArrayEquals(force, again, 0.0, "variant " + variant);
        }
    }

    /**
     * Under attraction, answer tables per row of style covariates up to
     * ChainState.STYLE_ROW_LIMIT distinct rows, none beyond; either way the force stays
     * within 1e-6 of the exact gradient relative to its largest entry (as in the test before).
     */
    @Test
    void forceTakesNoAnswerTablesBeyondItsRowsOfStyleCovariates() {
        for (int values : new int[] {ChainState.STYLE_ROW_LIMIT, ChainState.STYLE_ROW_LIMIT + 1}) {
            CollapsedPosterior posterior = new CollapsedPosterior(state(survey(20_000, values), true, true, true, 2.5), PRIORS);
            assertEquals(values <= ChainState.STYLE_ROW_LIMIT, posterior.readsAnswerTables(), values + " rows");
            assertForceNearTheGradient(posterior, " with " + values + " rows");
        }
    }

    /** The force at the posterior's state within 1e-6 of the exact gradient in every coordinate, relative to its largest entry. */
    private static void assertForceNearTheGradient(CollapsedPosterior posterior, String what) {
        double[] theta = new double[posterior.dimension()];
        posterior.read(theta);
        double[] exact = new double[theta.length];
        double[] force = new double[theta.length];
        posterior.gradient(theta, exact);
        posterior.force(theta, force);
        double largest = 0;
        for (double v : exact) {
            largest = Math.max(largest, Math.abs(v));
        }
        for (int j = 0; j < theta.length; j++) {
            assertEquals(exact[j], force[j], 1e-6 * largest, "coordinate " + j + what);
        }
    }

    /**
     * Under attraction with eight rows of style covariates and about 70 respondents per (group,
     * row, answer), fewer than the 2 per node a row's own table needs, the answers that are not
     * coarse points are read from one table for all rows (their gradient depends on the class
     * probit only through d log P / d zeta = -phi / (1 - Phi), a constant per row): every one of
     * their respondents is read from a table, none of the coarse points', and the force stays
     * within 1e-6 of the exact gradient relative to its largest entry (as above), the class
     * coordinates included.
     */
    @Test
    void forceReadsTheAnswersBesideTheCoarsePointsFromOneTableForAllRows() {
        Survey survey = survey(12_000, 8);
        ChainState s = state(survey, true, true, true, 2.5);
        CollapsedPosterior posterior = new CollapsedPosterior(s, PRIORS);
        int besides = 0;
        for (int i = 0; i < s.size; i++) {
            int r = s.category[i];
            besides += r == 0 || r == 3 || r == 6 ? 0 : 1;
        }
        assertForceNearTheGradient(posterior, "");
        assertEquals(besides, posterior.lastForceTableReads());
    }

    /**
     * Wide ranges of latent levels: from about 128 units on the grid's nodes widen (the calibration
     * of the complete model once asked for one node more than the grid holds, an index out of
     * bounds, for a range that rounding put just past a whole number of nodes); from about 511
     * units none is built and the force is the exact gradient, bit for bit.
     */
    @Test
    void forceCopesWithWideRangesOfLatentLevels() {
        ChainState s = state(true, true, true, 6);
        CollapsedPosterior posterior = new CollapsedPosterior(s, PRIORS);
        double[] theta = new double[posterior.dimension()];
        posterior.read(theta);
        double[] force = new double[theta.length];
        double[] exact = new double[theta.length];
        for (int step = 0; step < 3000; step++) {
            theta[posterior.betaAt] = 20 + step * 0.03; // ranges of about 120 to 560 latent units
            assertTrue(Double.isFinite(posterior.force(theta, force)), "coefficient " + theta[posterior.betaAt]);
        }
        theta[posterior.betaAt] = 1000;
        posterior.force(theta, force);
        posterior.gradient(theta, exact);
        assertArrayEquals(exact, force, 0.0, "no grid beyond the widest spacing");
    }

    /**
     * The structured Hessian (one gradient per survey-wide coordinate and per coordinate of a
     * group) equals a dense one from central differences of the gradient in every coordinate,
     * including the zeros between two groups' own coordinates. Tolerance: the forward differences'
     * truncation error, half the step (1e-6) times a third derivative of at most a few hundred
     * here, stays below 1e-4 (with a step of 1e-5 it reached 2e-4 on one diagonal entry).
     */
    @Test
    void structuredHessianMatchesDenseDifferences() {
        for (int variant = 0; variant < 8; variant++) {
            ChainState s = variant(variant);
            CollapsedPosterior posterior = new CollapsedPosterior(s, PRIORS);
            int d = posterior.dimension();
            double[] theta = new double[d];
            posterior.read(theta);
            double[] structured = posterior.negativeHessian(theta);
            double[] up = new double[d];
            double[] down = new double[d];
            for (int j = 0; j < d; j++) {
                double h = 1e-5;
                double[] point = theta.clone();
                point[j] += h;
                posterior.gradient(point, up);
                point[j] -= 2 * h;
                posterior.gradient(point, down);
                for (int i = 0; i < d; i++) {
                    double dense = -(up[i] - down[i]) / (2 * h);
                    assertEquals(dense, structured[i * d + j], 1e-4 * Math.max(1, Math.abs(dense)),
                            "entry " + i + "," + j + " of variant " + variant);
                }
            }
        }
    }
}
