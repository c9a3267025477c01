package org.rungs.sampler.derived;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.stat.descriptive.moment.StandardDeviation;
import org.junit.jupiter.api.Test;
import org.rungs.models.ModelSpec;
import org.rungs.models.NumberAttraction;
import org.rungs.models.ParameterLayout;
import org.rungs.models.StyleClasses;
import org.rungs.models.ThresholdMode;
import org.rungs.models.survey.Covariates;
import org.rungs.models.survey.Scale;
import org.rungs.models.survey.Survey;
import org.rungs.posteriors.Draws;
import org.rungs.priors.Priors;

/**
 * The derived quantities under number attraction against MODEL.md 4b and 6 written out here, with
 * Commons Math 3.6.1's NormalDistribution as the reference for Phi: the attracted distribution
 * (coarse rounding removed, attraction kept), the split of the mean bias, and the posterior
 * predictive counts, whose full-scale answers are drawn with attraction.
 */
class AttractedDistributionTest {
    private static final NormalDistribution N = new NormalDistribution(0, 1);
    /** A handful of terms of Phi accurate to ~1e-16 on both sides: 1e-12 leaves room only for rounding. */
    private static final double EXACT = 1e-12;
    /** 0..4 with the default coarse points {0, 2, 4}: the default attraction set is {1, 3}. */
    private static final Scale SCALE = new Scale(0, 4);
    private static final int[] SET = {1, 3};
    private static final double[] AGE = {23, 61, 35, 52};
    private static final double[] WEIGHT = {1.5, 0.5, 2, 1};
    private static final byte[] RATING = {1, 4, 2, 3};
    private static final double[] ALPHA = {0.3, -0.4};
    private static final double BETA = 0.7;
    private static final double[] CUTS = {-1.2, -0.3, 0.4, 1.1};
    private static final double[][] GROUP_CUTS = {{-1.0, -0.4, 0.5, 0.9}, {-1.4, -0.2, 0.3, 1.3}};
    private static final double[] GAMMA = {-0.8, -0.5};
    /** a[g,j] for j in {1, 3}; abar is set far from them, so reading the wrong column shows. */
    private static final double[][] ATTRACTION = {{0.9, -0.6}, {-0.3, 1.2}};
    private static final double[] ABAR = {5, -5};

    private static ModelSpec spec(NumberAttraction attraction) {
        return new ModelSpec(ThresholdMode.BY_GROUP, Priors.defaults(), StyleClasses.coarse(null), attraction);
    }

    private static void set(Draws draws, String name, double value) {
        int p = draws.indexOf(name);
        assertTrue(p >= 0, "no column " + name);
        for (int c = 0; c < draws.chains(); c++) {
            for (int t = 0; t < draws.iterations(); t++) {
                draws.set(p, c, t, value);
            }
        }
    }

    /** The same parameters in every iteration; the attraction columns only when the layout has them. */
    private static Draws draws(ParameterLayout layout, List<String> labels, int iterations) {
        Draws draws = new Draws(layout.names(), 1, iterations);
        set(draws, "level.age", BETA);
        set(draws, "group_mean", ALPHA[0]);
        set(draws, "style_mean", GAMMA[0]);
        for (int k = 1; k < 5; k++) {
            set(draws, "threshold." + k, CUTS[k - 1]);
        }
        boolean attraction = layout.attractionSet().length > 0;
        if (labels.size() > 1) {
            set(draws, "group_sd", 0.5);
            set(draws, "threshold_sd", 0.2);
            set(draws, "style_sd", 0.3);
            for (int g = 0; g < labels.size(); g++) {
                set(draws, "group." + labels.get(g), ALPHA[g]);
                set(draws, "style_group." + labels.get(g), GAMMA[g]);
                for (int k = 1; k < 5; k++) {
                    set(draws, "threshold." + labels.get(g) + "." + k, GROUP_CUTS[g][k - 1]);
                }
            }
        }
        if (attraction) {
            for (int j = 0; j < SET.length; j++) {
                set(draws, "attraction." + SET[j], labels.size() > 1 ? ABAR[j] : ATTRACTION[0][j]);
                if (labels.size() > 1) {
                    set(draws, "attraction_sd", 0.4);
                    for (int g = 0; g < labels.size(); g++) {
                        set(draws, "attraction." + labels.get(g) + "." + SET[j], ATTRACTION[g][j]);
                    }
                }
            }
        }
        return draws;
    }

    /** pi[k](eta) = Phi(c_k - eta) - Phi(c_{k-1} - eta) (MODEL.md 3). */
    private static double[] pi(double[] cuts, double eta) {
        double[] p = new double[5];
        for (int k = 0; k < 5; k++) {
            double upper = k == 4 ? 1 : N.cumulativeProbability(cuts[k] - eta);
            double lower = k == 0 ? 0 : N.cumulativeProbability(cuts[k - 1] - eta);
            p[k] = upper - lower;
        }
        return p;
    }

    /** MODEL.md 4b: pi[k] exp(a[k]) / sum_k pi[k] exp(a[k]), a = 0 outside the set. */
    private static double[] attracted(double[] pi, double[] a) {
        double[] tilted = new double[5];
        double sum = 0;
        for (int k = 0; k < 5; k++) {
            double ak = 0;
            for (int j = 0; j < SET.length; j++) {
                if (SET[j] == k) {
                    ak = a[j];
                }
            }
            tilted[k] = pi[k] * Math.exp(ak);
            sum += tilted[k];
        }
        for (int k = 0; k < 5; k++) {
            tilted[k] /= sum;
        }
        return tilted;
    }

    private static double value(Draws draws, String name) {
        int p = draws.indexOf(name);
        assertTrue(p >= 0, "missing derived column " + name);
        return draws.get(p, 0, 0);
    }

    @Test
    void attractedDistributionAndBiasSplitFollowModel4bForTwoRespondentsPerGroup() {
        List<String> labels = List.of("North", "South");
        int[] group = {0, 0, 1, 1};
        Covariates level = Covariates.builder().numeric("age", AGE).build();
        Survey survey = Survey.of(SCALE, RATING.clone(), group, labels, level, Covariates.none(), WEIGHT);
        ModelSpec spec = spec(NumberAttraction.besidesCoarsePoints());
        ParameterLayout layout = ParameterLayout.of(survey, spec);
        Draws d = DerivedQuantities.compute(survey, draws(layout, labels, 1), layout, spec, 1, 1, 1).draws();
        double ageMean = (23 + 61 + 35 + 52) / 4.0;
        double ageSd = new StandardDeviation(true).evaluate(AGE);
        for (int g = 0; g < 2; g++) {
            double total = 0;
            double reported = 0;
            double[] intended = new double[5];
            double[] attracted = new double[5];
            for (int i = 0; i < 4; i++) {
                if (group[i] != g) {
                    continue;
                }
                double eta = ALPHA[g] + BETA * (AGE[i] - ageMean) / ageSd;
                double[] p = pi(GROUP_CUTS[g], eta);
                double[] tilted = attracted(p, ATTRACTION[g]);
                total += WEIGHT[i];
                reported += WEIGHT[i] * RATING[i];
                for (int k = 0; k < 5; k++) {
                    intended[k] += WEIGHT[i] * p[k];
                    attracted[k] += WEIGHT[i] * tilted[k];
                }
            }
            String label = labels.get(g);
            double intendedMean = 0;
            double attractedMean = 0;
            for (int k = 0; k < 5; k++) {
                assertEquals(attracted[k] / total, value(d, "attracted_share." + label + "." + k), EXACT, label + " " + k);
                assertEquals(intended[k] / total, value(d, "intended_share." + label + "." + k), EXACT, label + " " + k);
                intendedMean += k * intended[k] / total;
                attractedMean += k * attracted[k] / total;
            }
            assertEquals(attractedMean, value(d, "attracted_mean." + label), EXACT);
            assertEquals(attractedMean - intendedMean, value(d, "mean_bias_attraction." + label), EXACT);
            assertEquals(reported / total - attractedMean, value(d, "mean_bias_rounding." + label), EXACT);
            assertEquals(value(d, "mean_bias." + label),
                    value(d, "mean_bias_attraction." + label) + value(d, "mean_bias_rounding." + label), EXACT);
        }

        // attraction off: the same intended quantities and none of the attraction columns
        ModelSpec off = spec(NumberAttraction.none());
        ParameterLayout offLayout = ParameterLayout.of(survey, off);
        Draws plain = DerivedQuantities.compute(survey, draws(offLayout, labels, 1), offLayout, off, 1, 1, 1).draws();
        assertTrue(plain.names().stream().noneMatch(n -> n.startsWith("attracted_") || n.startsWith("mean_bias_")));
        for (String name : plain.names()) {
            if (!name.startsWith("replicated.")) {
                assertEquals(value(plain, name), value(d, name), 0, name);
            }
        }
    }

    @Test
    void withOneGroupTheCommonTermsAreItsAttraction() {
        List<String> labels = List.of("all");
        int[] group = new int[4];
        Covariates level = Covariates.builder().numeric("age", AGE).build();
        Survey survey = Survey.of(SCALE, RATING.clone(), group, labels, level, Covariates.none(), null);
        ModelSpec spec = spec(NumberAttraction.of(1, 3));
        ParameterLayout layout = ParameterLayout.of(survey, spec);
        Draws d = DerivedQuantities.compute(survey, draws(layout, labels, 1), layout, spec, 1, 1, 1).draws();
        double ageMean = (23 + 61 + 35 + 52) / 4.0;
        double ageSd = new StandardDeviation(true).evaluate(AGE);
        double[] attracted = new double[5];
        for (int i = 0; i < 4; i++) {
            double[] tilted = attracted(pi(CUTS, ALPHA[0] + BETA * (AGE[i] - ageMean) / ageSd), ATTRACTION[0]);
            for (int k = 0; k < 5; k++) {
                attracted[k] += tilted[k] / 4;
            }
        }
        for (int k = 0; k < 5; k++) {
            assertEquals(attracted[k], value(d, "attracted_share.all." + k), EXACT);
        }
    }

    /**
     * A strong planted attraction (a = 2 on 3 in North, -1.5 on 1 in South): the replicated count
     * of rating k averages to sum_i P(r_i = k) of MODEL.md 4c, full-scale answers attracted (4b),
     * coarse ones rounded to the nearest of {0, 2, 4} without attraction (1 and 3 half and half).
     * Each count is a sum of independent Bernoulli variables, so its mean over D draws has standard
     * error sqrt(sum_i p(1-p) / D); the check allows 5 of them (false-alarm rate ~6e-7 per cell;
     * fixed seed, so the outcome is reproducible). Without attraction North's share of 3 would be
     * well outside that band, so the check sees whether attraction is applied.
     */
    @Test
    void replicatedCountsDrawFullScaleAnswersWithAttraction() {
        int perGroup = 40;
        int n = 2 * perGroup;
        Random random = new Random(23);
        double[] age = new double[n];
        int[] group = new int[n];
        for (int i = 0; i < n; i++) {
            age[i] = 20 + 50 * random.nextDouble();
            group[i] = i < perGroup ? 0 : 1;
        }
        Covariates level = Covariates.builder().numeric("age", age).build();
        List<String> labels = List.of("North", "South");
        Survey survey = Survey.of(SCALE, new byte[n], group, labels, level, Covariates.none(), null);
        ModelSpec spec = spec(NumberAttraction.besidesCoarsePoints());
        ParameterLayout layout = ParameterLayout.of(survey, spec);
        int iterations = 3000;
        Draws fit = draws(layout, labels, iterations);
        double[][] planted = {{0, 2}, {-1.5, 0}};
        for (int g = 0; g < 2; g++) {
            for (int j = 0; j < SET.length; j++) {
                set(fit, "attraction." + labels.get(g) + "." + SET[j], planted[g][j]);
            }
        }
        Draws d = DerivedQuantities.compute(survey, fit, layout, spec, iterations, 20240612L, 2).draws();
        assertEquals(iterations, d.iterations());

        double ageMean = 0;
        for (double a : age) {
            ageMean += a / n;
        }
        double ageSd = new StandardDeviation(true).evaluate(age);
        int[][] nearest = {{0}, {0, 2}, {2}, {2, 4}, {4}};
        List<String> checked = new ArrayList<>();
        for (int g = 0; g < 2; g++) {
            double q = N.cumulativeProbability(GAMMA[g]);
            double[] mean = new double[5];
            double[] variance = new double[5];
            double[] unattracted = new double[5];
            for (int i = 0; i < n; i++) {
                if (group[i] != g) {
                    continue;
                }
                double[] p = pi(GROUP_CUTS[g], ALPHA[g] + BETA * (age[i] - ageMean) / ageSd);
                double[] full = attracted(p, planted[g]);
                double[] reported = new double[5];
                for (int k = 0; k < 5; k++) {
                    reported[k] += (1 - q) * full[k];
                    unattracted[k] += (1 - q) * p[k];
                    for (int j : nearest[k]) {
                        reported[j] += q * p[k] / nearest[k].length;
                        unattracted[j] += q * p[k] / nearest[k].length;
                    }
                }
                for (int k = 0; k < 5; k++) {
                    mean[k] += reported[k];
                    variance[k] += reported[k] * (1 - reported[k]);
                }
            }
            double[] standardError = ReplicatedCounts.assertMeans(d, labels.get(g), mean, variance, iterations);
            for (int k = 0; k < 5; k++) {
                if (Math.abs(unattracted[k] - mean[k]) > 20 * standardError[k]) {
                    checked.add(labels.get(g) + " " + k);
                }
            }
        }
        assertTrue(checked.contains("North 3") && checked.contains("South 1"),
                "the planted attraction should move the expected counts far beyond the tolerance, got " + checked);
    }
}
