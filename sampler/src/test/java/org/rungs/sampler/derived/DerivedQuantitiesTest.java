package org.rungs.sampler.derived;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Random;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.stat.descriptive.moment.StandardDeviation;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.rungs.models.ModelSpec;
import org.rungs.models.ParameterLayout;
import org.rungs.models.StyleClasses;
import org.rungs.models.ThresholdMode;
import org.rungs.models.survey.Covariates;
import org.rungs.models.survey.Scale;
import org.rungs.models.survey.Survey;
import org.rungs.posteriors.Draws;
import org.rungs.posteriors.ParameterSummary;
import org.rungs.posteriors.Summaries;
import org.rungs.priors.Priors;

/**
 * The derived quantities against direct computations of MODEL.md sections 2 to 4 and 6 written
 * out here, respondent by respondent, with Commons Math 3.6.1's NormalDistribution as the
 * reference for Phi and phi (it evaluates erf by the regularised gamma function, a different
 * algorithm from the engine's Cody approximations).
 */
class DerivedQuantitiesTest {
    private static final NormalDistribution N = new NormalDistribution(0, 1);
    /** Both sides sum a handful of terms of Phi accurate to ~1e-16: 1e-12 leaves room only for rounding. */
    private static final double EXACT = 1e-12;
    private static final Scale SCALE = new Scale(0, 4);
    private static final List<String> LABELS = List.of("North", "South", "East");
    private static final List<String> EDUCATION = List.of("primary", "secondary", "tertiary");
    private static final int[] GROUP = {0, 0, 0, 0, 1, 1, 1, 1, 2, 2, 2, 2};
    private static final byte[] RATING = {0, 2, 4, 3, 1, 2, 2, 4, 0, 4, 3, 2};
    private static final double[] AGE = {23, 35, 61, 47, 52, 29, 33, 70, 41, 38, 66, 25};
    private static final int[] SCHOOL = {0, 1, 2, 1, 1, 0, 2, 1, 2, 1, 0, 1};
    private static final double[] WEIGHT = {1.5, 0.5, 2, 1, 0.8, 1.2, 3, 0.4, 1, 1, 2.5, 0.7};

    /** Parameters of one draw in the model's symbols (MODEL.md 2-4); {@code groupCuts} null in shared mode. */
    private record Truth(double[] alpha, double age, double primary, double tertiary, double[] cuts,
            double[][] groupCuts, double[] gamma, double stylePrimary, double styleTertiary) {
        double[] cutsOf(int g) {
            return groupCuts == null ? cuts : groupCuts[g];
        }
    }

    private static final Truth FIRST = new Truth(new double[] {0.3, -0.2, 0.6}, 0.5, -0.4, 0.7,
            new double[] {-1.2, -0.3, 0.4, 1.1},
            new double[][] {{-1.0, -0.4, 0.5, 0.9}, {-1.4, -0.2, 0.3, 1.3}, {-1.1, -0.35, 0.45, 1.0}},
            new double[] {-0.8, -0.5, -1.1}, 0.6, -0.3);
    private static final Truth SECOND = new Truth(new double[] {-0.1, 0.5, 0.2}, -0.3, 0.2, 1.1,
            new double[] {-1.5, -0.5, 0.6, 1.4},
            new double[][] {{-1.6, -0.4, 0.4, 1.6}, {-1.3, -0.7, 0.8, 1.2}, {-1.6, -0.4, 0.6, 1.4}},
            new double[] {-0.2, -1.3, 0.1}, -0.5, 0.9);

    private static Survey survey(double[] weight) {
        return Survey.of(SCALE, RATING.clone(), GROUP.clone(), LABELS, covariates(), covariates(), weight);
    }

    private static Covariates covariates() {
        return Covariates.builder().numeric("age", AGE).categorical("education", SCHOOL, EDUCATION, "secondary").build();
    }

    private static ModelSpec coarseModel() {
        return new ModelSpec(ThresholdMode.BY_GROUP, Priors.defaults(), StyleClasses.coarse(null));
    }

    private static Draws draws(ParameterLayout layout, List<String> labels, Truth... truths) {
        Draws draws = new Draws(layout.names(), 1, truths.length);
        for (int t = 0; t < truths.length; t++) {
            put(draws, 0, t, labels, truths[t]);
        }
        return draws;
    }

    private static void put(Draws draws, int chain, int t, List<String> labels, Truth truth) {
        set(draws, chain, t, "level.age", truth.age);
        set(draws, chain, t, "level.education=primary", truth.primary);
        set(draws, chain, t, "level.education=tertiary", truth.tertiary);
        set(draws, chain, t, "group_mean", truth.alpha[0]);
        set(draws, chain, t, "style_mean", truth.gamma[0]);
        set(draws, chain, t, "style.education=primary", truth.stylePrimary);
        set(draws, chain, t, "style.education=tertiary", truth.styleTertiary);
        for (int k = 1; k < SCALE.categories(); k++) {
            set(draws, chain, t, "threshold." + k, truth.cuts[k - 1]);
        }
        if (labels.size() > 1) {
            for (int g = 0; g < labels.size(); g++) {
                set(draws, chain, t, "group." + labels.get(g), truth.alpha[g]);
                set(draws, chain, t, "style_group." + labels.get(g), truth.gamma[g]);
                for (int k = 1; k < SCALE.categories(); k++) {
                    set(draws, chain, t, "threshold." + labels.get(g) + "." + k, truth.cutsOf(g)[k - 1]);
                }
            }
        }
    }

    private static void set(Draws draws, int chain, int t, String name, double value) {
        int p = draws.indexOf(name);
        if (p >= 0) {
            draws.set(p, chain, t, value);
        }
    }

    // ---- the direct computations ----

    /** Latent level without the education terms: alpha[g] + beta_age * standardised age. */
    private static double etaWithoutSchool(Truth truth, int i, int g) {
        double mean = Arrays.stream(AGE).average().orElseThrow();
        double sd = new StandardDeviation(true).evaluate(AGE);
        return truth.alpha[g] + truth.age * (AGE[i] - mean) / sd;
    }

    private static double schoolEffect(Truth truth, int code) {
        return code == 0 ? truth.primary : code == 2 ? truth.tertiary : 0;
    }

    private static double eta(Truth truth, int i, int g) {
        return etaWithoutSchool(truth, i, g) + schoolEffect(truth, SCHOOL[i]);
    }

    /** pi[k](eta) = Phi(c_k - eta) - Phi(c_{k-1} - eta), c_0 = -inf, c_M = +inf (MODEL.md 3). */
    private static double[] pi(double[] cuts, double eta) {
        int m = cuts.length + 1;
        double[] p = new double[m];
        for (int k = 0; k < m; k++) {
            double upper = k == m - 1 ? 1 : N.cumulativeProbability(cuts[k] - eta);
            double lower = k == 0 ? 0 : N.cumulativeProbability(cuts[k - 1] - eta);
            p[k] = upper - lower;
        }
        return p;
    }

    private static double expected(double[] cuts, double eta) {
        double[] p = pi(cuts, eta);
        double e = 0;
        for (int k = 0; k < p.length; k++) {
            e += SCALE.rating(k) * p[k];
        }
        return e;
    }

    /** q_i = Phi(gamma[g] + w_i' delta) (MODEL.md 4). */
    private static double coarseProbability(Truth truth, int i, int g) {
        double style = SCHOOL[i] == 0 ? truth.stylePrimary : SCHOOL[i] == 2 ? truth.styleTertiary : 0;
        return N.cumulativeProbability(truth.gamma[g] + style);
    }

    private static double w(double[] weight, int i) {
        return weight == null ? 1 : weight[i];
    }

    private static double value(Draws draws, String name, int t) {
        int p = draws.indexOf(name);
        assertTrue(p >= 0, "missing derived column " + name);
        return draws.get(p, 0, t);
    }

    /** Ranks of means, 1 for the highest, by sorting. */
    private static int[] ranks(double[] means) {
        Integer[] order = new Integer[means.length];
        for (int g = 0; g < means.length; g++) {
            order[g] = g;
        }
        Arrays.sort(order, (a, b) -> Double.compare(means[b], means[a]));
        int[] rank = new int[means.length];
        for (int r = 0; r < order.length; r++) {
            rank[order[r]] = r + 1;
        }
        return rank;
    }

    // ---- (1) every derived scalar against the direct computation ----

    @Test
    void everyScalarMatchesTheDirectComputationOfModelSection6() {
        for (double[] weight : Arrays.asList(null, WEIGHT)) {
            Survey survey = survey(weight);
            ModelSpec spec = coarseModel();
            ParameterLayout layout = ParameterLayout.of(survey, spec);
            Truth[] truths = {FIRST, SECOND};
            DerivedResult result = DerivedQuantities.compute(survey, draws(layout, LABELS, truths), layout, spec, 10, 1, 1);
            Draws d = result.draws();
            assertEquals(2, d.iterations());
            int[][] rankSeen = new int[2][];
            for (int t = 0; t < 2; t++) {
                Truth truth = truths[t];
                double[] intendedMeans = new double[3];
                double[] harmonisedMeans = new double[3];
                for (int g = 0; g < 3; g++) {
                    double total = 0;
                    double reported = 0;
                    double coarse = 0;
                    double[] intended = new double[5];
                    double[] harmonised = new double[5];
                    for (int i = 0; i < GROUP.length; i++) {
                        if (GROUP[i] != g) {
                            continue;
                        }
                        double wi = w(weight, i);
                        total += wi;
                        reported += wi * RATING[i];
                        coarse += wi * coarseProbability(truth, i, g);
                        double[] own = pi(truth.cutsOf(g), eta(truth, i, g));
                        double[] common = pi(truth.cuts, eta(truth, i, g));
                        for (int k = 0; k < 5; k++) {
                            intended[k] += wi * own[k];
                            harmonised[k] += wi * common[k];
                        }
                    }
                    String label = LABELS.get(g);
                    for (int k = 0; k < 5; k++) {
                        assertEquals(intended[k] / total, value(d, "intended_share." + label + "." + k, t), EXACT);
                        assertEquals(harmonised[k] / total, value(d, "harmonised_share." + label + "." + k, t), EXACT);
                        intendedMeans[g] += k * intended[k] / total;
                        harmonisedMeans[g] += k * harmonised[k] / total;
                    }
                    assertEquals(intendedMeans[g], value(d, "intended_mean." + label, t), EXACT);
                    assertEquals(harmonisedMeans[g], value(d, "harmonised_mean." + label, t), EXACT);
                    assertEquals(reported / total, result.reportedMeans()[g], EXACT);
                    assertEquals(reported / total - intendedMeans[g], value(d, "mean_bias." + label, t), EXACT);
                    assertEquals(coarse / total, value(d, "coarse_share." + label, t), EXACT);
                }
                int[] intendedRank = ranks(intendedMeans);
                int[] harmonisedRank = ranks(harmonisedMeans);
                for (int g = 0; g < 3; g++) {
                    assertEquals(intendedRank[g], value(d, "rank_intended." + LABELS.get(g), t));
                    assertEquals(harmonisedRank[g], value(d, "rank_harmonised." + LABELS.get(g), t));
                }
                rankSeen[t] = intendedRank;

                double total = 0;
                double slope = 0;
                double primaryChange = 0;
                double tertiaryChange = 0;
                double[] byLevel = new double[3];
                double[] levelWeight = new double[3];
                for (int i = 0; i < GROUP.length; i++) {
                    int g = GROUP[i];
                    double wi = w(weight, i);
                    double[] cuts = truth.cutsOf(g);
                    total += wi;
                    for (double c : cuts) {
                        slope += wi * N.density(c - eta(truth, i, g));
                    }
                    double base = etaWithoutSchool(truth, i, g);
                    primaryChange += wi * (expected(cuts, base + truth.primary) - expected(cuts, base));
                    tertiaryChange += wi * (expected(cuts, base + truth.tertiary) - expected(cuts, base));
                    byLevel[SCHOOL[i]] += wi * coarseProbability(truth, i, g);
                    levelWeight[SCHOOL[i]] += wi;
                }
                double ameAge = truth.age * slope / total;
                assertEquals(ameAge, value(d, "ame.age", t), EXACT);
                assertEquals(ameAge / new StandardDeviation(true).evaluate(AGE), value(d, "ame.age.per_unit", t), EXACT);
                assertEquals(primaryChange / total, value(d, "ame.education=primary", t), EXACT);
                assertEquals(tertiaryChange / total, value(d, "ame.education=tertiary", t), EXACT);
                for (int level = 0; level < 3; level++) {
                    assertEquals(byLevel[level] / levelWeight[level],
                            value(d, "coarse_share_by.education=" + EDUCATION.get(level), t), EXACT);
                }

                // the marginal effect is the derivative of the average expected rating in the
                // covariate: a central difference with step 1e-5 has error O(h^2 E''') ~ 1e-10
                // plus rounding ~ 1e-16 / 1e-5, so 1e-8
                double h = 1e-5;
                double up = 0;
                double down = 0;
                for (int i = 0; i < GROUP.length; i++) {
                    int g = GROUP[i];
                    double wi = w(weight, i);
                    up += wi * expected(truth.cutsOf(g), eta(truth, i, g) + truth.age * h);
                    down += wi * expected(truth.cutsOf(g), eta(truth, i, g) - truth.age * h);
                }
                assertEquals((up - down) / (2 * h) / total, value(d, "ame.age", t), 1e-8);
            }
            assertFalse(Arrays.equals(rankSeen[0], rankSeen[1]), "the two draws should order the groups differently");
        }
    }

    @Test
    void sharedThresholdsAndOneGroupUseTheCommonTermsWithoutCoarseColumns() {
        Survey survey = Survey.of(SCALE, RATING.clone(), new int[GROUP.length], List.of("all"), covariates(),
                Covariates.none(), null);
        ModelSpec spec = new ModelSpec(ThresholdMode.BY_GROUP, Priors.defaults());
        ParameterLayout layout = ParameterLayout.of(survey, spec);
        DerivedResult result = DerivedQuantities.compute(survey, draws(layout, List.of("all"), FIRST), layout, spec,
                10, 1, 1);
        Draws d = result.draws();
        assertEquals(-1, d.indexOf("coarse_share.all"));
        assertTrue(d.names().stream().noneMatch(n -> n.startsWith("coarse_share_by.")));
        double[] share = new double[5];
        for (int i = 0; i < GROUP.length; i++) {
            double[] p = pi(FIRST.cuts, eta(FIRST, i, 0));
            for (int k = 0; k < 5; k++) {
                share[k] += p[k] / GROUP.length;
            }
        }
        for (int k = 0; k < 5; k++) {
            assertEquals(share[k], value(d, "intended_share.all." + k, 0), EXACT);
            assertEquals(share[k], value(d, "harmonised_share.all." + k, 0), EXACT);
        }
        assertEquals(1, value(d, "rank_intended.all", 0));
    }

    // ---- (2) weights ----

    /**
     * A weight of w on a respondent is the same as w copies of that respondent: every derived
     * quantity except the predictive counts is a weighted mean. Covariates are categorical with a
     * named reference so that duplication leaves the internal columns unchanged.
     */
    @Test
    void integerWeightsActAsRepeatedRespondents() {
        int[] repeat = {2, 1, 3, 1, 1, 2, 4, 1, 1, 2, 1, 3};
        List<Byte> rating = new ArrayList<>();
        List<Integer> group = new ArrayList<>();
        List<Integer> school = new ArrayList<>();
        double[] weight = new double[GROUP.length];
        for (int i = 0; i < GROUP.length; i++) {
            weight[i] = repeat[i];
            for (int r = 0; r < repeat[i]; r++) {
                rating.add(RATING[i]);
                group.add(GROUP[i]);
                school.add(SCHOOL[i]);
            }
        }
        byte[] ratings = new byte[rating.size()];
        for (int i = 0; i < ratings.length; i++) {
            ratings[i] = rating.get(i);
        }
        int[] schools = school.stream().mapToInt(Integer::intValue).toArray();
        Survey weighted = Survey.of(SCALE, RATING.clone(), GROUP.clone(), LABELS, schoolOnly(SCHOOL),
                schoolOnly(SCHOOL), weight);
        Survey repeated = Survey.of(SCALE, ratings, group.stream().mapToInt(Integer::intValue).toArray(), LABELS,
                schoolOnly(schools), schoolOnly(schools), null);
        Survey unweighted = Survey.of(SCALE, RATING.clone(), GROUP.clone(), LABELS, schoolOnly(SCHOOL),
                schoolOnly(SCHOOL), null);
        ModelSpec spec = coarseModel();
        ParameterLayout layout = ParameterLayout.of(weighted, spec);
        Draws draws = draws(layout, LABELS, FIRST, SECOND);
        DerivedResult a = DerivedQuantities.compute(weighted, draws, layout, spec, 10, 1, 1);
        DerivedResult b = DerivedQuantities.compute(repeated, draws, ParameterLayout.of(repeated, spec), spec, 10, 1, 1);
        DerivedResult c = DerivedQuantities.compute(unweighted, draws, ParameterLayout.of(unweighted, spec), spec, 10, 1, 1);
        assertEquals(a.draws().names(), b.draws().names());
        for (int p = 0; p < a.draws().parameterCount(); p++) {
            String name = a.draws().names().get(p);
            if (!name.startsWith("replicated.")) {
                for (int t = 0; t < 2; t++) {
                    assertEquals(b.draws().get(p, 0, t), a.draws().get(p, 0, t), EXACT, name);
                }
            }
        }
        assertArrayEquals(b.reportedMeans(), a.reportedMeans(), EXACT);
        assertNotEquals(c.reportedMeans()[0], a.reportedMeans()[0], 1e-3);
        assertNotEquals(value(c.draws(), "intended_mean.North", 0), value(a.draws(), "intended_mean.North", 0), 1e-3);
    }

    private static Covariates schoolOnly(int[] codes) {
        return Covariates.builder().categorical("education", codes, EDUCATION, "secondary").build();
    }

    // ---- (3) posterior predictive ----

    /**
     * With the same parameters in every draw, the replicated count of rating k in group g averages
     * to sum_i P(r_i = k) of MODEL.md 4c, the coarse class rounding to the nearest of {0, 2, 4}
     * (1 and 3 split half and half). Each count is a sum of independent Bernoulli variables, so
     * its mean over D draws has standard error sqrt(sum_i p(1-p) / D); the check allows 5 of them
     * (false-alarm rate ~6e-7 per cell; fixed seed, so the outcome is reproducible).
     */
    @Test
    void replicatedCountsAverageToTheModelProbabilities() {
        int perGroup = 40;
        int n = 2 * perGroup;
        Random random = new Random(11);
        double[] age = new double[n];
        int[] school = new int[n];
        int[] group = new int[n];
        for (int i = 0; i < n; i++) {
            age[i] = 20 + 50 * random.nextDouble();
            school[i] = random.nextInt(3);
            group[i] = i < perGroup ? 0 : 1;
        }
        school[0] = 0;
        school[1] = 1;
        school[2] = 2;
        Covariates level = Covariates.builder().numeric("age", age).build();
        Covariates style = Covariates.builder().categorical("education", school, EDUCATION, "secondary").build();
        List<String> labels = List.of("North", "South");
        Survey survey = Survey.of(SCALE, new byte[n], group, labels, level, style, null);
        ModelSpec spec = coarseModel();
        ParameterLayout layout = ParameterLayout.of(survey, spec);
        Truth truth = new Truth(new double[] {0.4, -0.3}, 0.8, 0, 0, FIRST.cuts,
                new double[][] {FIRST.groupCuts[0], FIRST.groupCuts[1]}, new double[] {-0.3, 0.2}, 0.5, -0.6);
        int draws = 4000;
        Draws fit = new Draws(layout.names(), 1, draws);
        for (int t = 0; t < draws; t++) {
            put(fit, 0, t, labels, truth);
        }
        Draws d = DerivedQuantities.compute(survey, fit, layout, spec, draws, 20240611L, 2).draws();
        assertEquals(draws, d.iterations());

        double[] internalAge = level.column(0);
        int[][] nearest = {{0}, {0, 2}, {2}, {2, 4}, {4}};
        for (int g = 0; g < 2; g++) {
            double[] mean = new double[5];
            double[] variance = new double[5];
            for (int i = 0; i < n; i++) {
                if (group[i] != g) {
                    continue;
                }
                double[] p = pi(truth.cutsOf(g), truth.alpha[g] + truth.age * internalAge[i]);
                double style0 = school[i] == 0 ? truth.stylePrimary : school[i] == 2 ? truth.styleTertiary : 0;
                double q = N.cumulativeProbability(truth.gamma[g] + style0);
                double[] reported = new double[5];
                for (int k = 0; k < 5; k++) {
                    reported[k] += (1 - q) * p[k];
                    for (int j : nearest[k]) {
                        reported[j] += q * p[k] / nearest[k].length;
                    }
                }
                for (int k = 0; k < 5; k++) {
                    mean[k] += reported[k];
                    variance[k] += reported[k] * (1 - reported[k]);
                }
            }
            ReplicatedCounts.assertMeans(d, labels.get(g), mean, variance, draws);
            for (int t = 0; t < draws; t += 97) {
                double total = 0;
                for (int k = 0; k < 5; k++) {
                    total += d.get(d.indexOf("replicated." + labels.get(g) + "." + k), 0, t);
                }
                assertEquals(perGroup, total, 0, "every respondent is replicated once");
            }
        }
    }

    // ---- (4) threads and thinning ----

    /** The draws a table of at most so many numbers allows: as many as asked, down to the least, by the columns compute writes. */
    @Test
    void theDrawsWithinABudgetFollowTheColumnsComputeWrites() {
        Survey survey = survey(WEIGHT);
        ModelSpec spec = coarseModel();
        ParameterLayout layout = ParameterLayout.of(survey, spec);
        int width = DerivedQuantities.compute(survey, varied(layout, 1, 2), layout, spec, 2, 5, 1).draws().parameterCount();
        assertEquals(4000, DerivedQuantities.drawsWithin(survey, layout, spec, 4000, 1000, 4000L * width));
        assertEquals(3999, DerivedQuantities.drawsWithin(survey, layout, spec, 4000, 1000, 4000L * width - 1));
        assertEquals(2500, DerivedQuantities.drawsWithin(survey, layout, spec, 4000, 1000, 2500L * width));
        assertEquals(1000, DerivedQuantities.drawsWithin(survey, layout, spec, 4000, 1000, 10L * width));
    }

    @Test
    void resultsDoNotDependOnThreadsAndUseTheSameIterationsInEveryChain() {
        Survey survey = survey(WEIGHT);
        ModelSpec spec = coarseModel();
        ParameterLayout layout = ParameterLayout.of(survey, spec);
        Draws fit = varied(layout, 2, 40);
        DerivedResult one = DerivedQuantities.compute(survey, fit, layout, spec, 30, 5, 1);
        DerivedResult two = DerivedQuantities.compute(survey, fit, layout, spec, 30, 5, 2);
        DerivedResult three = DerivedQuantities.compute(survey, fit, layout, spec, 30, 5, 3);
        // 30 draws over 2 chains: 15 per chain at most, so every 3rd of 40 iterations
        assertArrayEquals(new int[] {0, 3, 6, 9, 12, 15, 18, 21, 24, 27, 30, 33, 36, 39}, one.usedIterations());
        assertEquals(2, one.draws().chains());
        assertEquals(14, one.draws().iterations());
        for (int p = 0; p < one.draws().parameterCount(); p++) {
            double[][] expected = one.draws().chainsOf(p);
            for (int c = 0; c < 2; c++) {
                assertArrayEquals(expected[c], two.draws().chainsOf(p)[c], 0);
                assertArrayEquals(expected[c], three.draws().chainsOf(p)[c], 0);
            }
        }
        DerivedResult otherSeed = DerivedQuantities.compute(survey, fit, layout, spec, 30, 6, 2);
        int replicated = one.draws().indexOf("replicated.North.2");
        assertFalse(Arrays.deepEquals(one.draws().chainsOf(replicated), otherSeed.draws().chainsOf(replicated)),
                "the predictive counts follow the seed");
        // the derived value of chain 1, iteration 9 is that of the 4th used iteration
        Draws single = new Draws(layout.names(), 1, 1);
        for (int p = 0; p < layout.size(); p++) {
            single.set(p, 0, 0, fit.get(p, 1, 9));
        }
        DerivedResult alone = DerivedQuantities.compute(survey, single, layout, spec, 1, 5, 1);
        int mean = one.draws().indexOf("intended_mean.South");
        assertEquals(alone.draws().get(mean, 0, 0), one.draws().get(mean, 1, 3), 0);
    }

    /** An audit matched derived_draws.csv to draws.csv by chain and iteration: the numbers must be draws.csv's. */
    @Test
    void derivedDrawsAreNumberedByTheIterationOfTheirDraw(@TempDir Path folder) throws IOException {
        Survey survey = survey(WEIGHT);
        ModelSpec spec = coarseModel();
        ParameterLayout layout = ParameterLayout.of(survey, spec);
        DerivedResult result = DerivedQuantities.compute(survey, varied(layout, 2, 40), layout, spec, 30, 5, 1);
        Path file = folder.resolve("derived_draws.csv");
        DerivedQuantities.writeDraws(result, file);
        List<String> lines = Files.readAllLines(file);
        assertEquals(1 + 2 * 14, lines.size());
        // the 4th used draw of chain 2 is iteration 9 (0-based) of draws.csv, written 10
        assertTrue(lines.get(1 + 14 + 3).startsWith("2,10,"), lines.get(1 + 14 + 3));
        assertTrue(lines.get(14).startsWith("1,40,"), lines.get(14));
    }

    @Test
    void effectsAloneAreTheSameNumbersAsAmongEveryDerivedQuantity() {
        for (double[] weight : Arrays.asList(null, WEIGHT)) {
            Survey survey = survey(weight);
            ModelSpec spec = coarseModel();
            ParameterLayout layout = ParameterLayout.of(survey, spec);
            Draws fit = varied(layout, 2, 40);
            Draws all = DerivedQuantities.compute(survey, fit, layout, spec, 30, 5, 1).draws();
            for (int threads : new int[] {1, 2}) {
                Draws effects = DerivedQuantities.effects(survey, fit, layout, 30, threads);
                // age is numeric (per internal unit and per year), education a factor of two indicators
                assertEquals(List.of("ame.age", "ame.age.per_unit", "ame.education=primary", "ame.education=tertiary"),
                        effects.names());
                assertEquals(all.iterations(), effects.iterations());
                for (String name : effects.names()) {
                    for (int c = 0; c < 2; c++) {
                        assertArrayEquals(all.chainsOf(all.indexOf(name))[c], effects.chainsOf(effects.indexOf(name))[c], 0,
                                name + ", chain " + c + ", weights " + (weight != null));
                    }
                }
            }
        }
    }

    /** Chains of draws moving around FIRST: alpha, beta, gamma and delta shifted, thresholds shifted in order. */
    private static Draws varied(ParameterLayout layout, int chains, int iterations) {
        Random random = new Random(3);
        Draws fit = new Draws(layout.names(), chains, iterations);
        for (int c = 0; c < chains; c++) {
            for (int t = 0; t < iterations; t++) {
                double[] alpha = FIRST.alpha.clone();
                double[] gamma = FIRST.gamma.clone();
                double[][] groupCuts = new double[3][];
                for (int g = 0; g < 3; g++) {
                    alpha[g] += 0.5 * random.nextGaussian();
                    gamma[g] += 0.5 * random.nextGaussian();
                    double shift = 0.1 * random.nextGaussian();
                    groupCuts[g] = FIRST.groupCuts[g].clone();
                    for (int k = 0; k < 4; k++) {
                        groupCuts[g][k] += shift;
                    }
                }
                Truth truth = new Truth(alpha, FIRST.age + 0.3 * random.nextGaussian(), FIRST.primary + 0.3 * random.nextGaussian(),
                        FIRST.tertiary, FIRST.cuts, groupCuts, gamma, FIRST.stylePrimary + 0.3 * random.nextGaussian(),
                        FIRST.styleTertiary);
                put(fit, c, t, LABELS, truth);
            }
        }
        return fit;
    }

    // ---- the files ----

    @Test
    void tablesCarryTheSummariesAndTheObservedData(@TempDir Path folder) throws IOException {
        Survey survey = survey(WEIGHT);
        ModelSpec spec = coarseModel();
        ParameterLayout layout = ParameterLayout.of(survey, spec);
        DerivedResult result = DerivedQuantities.compute(survey, varied(layout, 2, 40), layout, spec, 80, 9, 2);
        List<ParameterSummary> summaries = Summaries.of(result.draws());
        Path groups = folder.resolve("groups.csv");
        Path distributions = folder.resolve("distributions.csv");
        Path coarse = folder.resolve("coarse_shares.csv");
        DerivedQuantities.writeGroups(result, summaries, groups);
        DerivedQuantities.writeDistributions(result, summaries, distributions);
        DerivedQuantities.writeCoarseShares(result, summaries, coarse);

        List<String> groupLines = Files.readAllLines(groups);
        assertEquals("group,respondents,reported_mean,intended_mean_mean,intended_mean_q5,intended_mean_q95,"
                + "harmonised_mean_mean,harmonised_mean_q5,harmonised_mean_q95,mean_bias_mean,mean_bias_q5,"
                + "mean_bias_q95,coarse_share_mean,coarse_share_q5,coarse_share_q95,rank_intended_mean,"
                + "rank_intended_q5,rank_intended_q95,rank_harmonised_mean,rank_harmonised_q5,rank_harmonised_q95,"
                + "p_top3_intended,p_top3_harmonised,rank_change", groupLines.get(0));
        assertEquals(4, groupLines.size());
        // South: reported mean (0.8*1 + 1.2*2 + 3*2 + 0.4*4) / 5.4 = 10.8 / 5.4 = 2, the lowest of
        // the three observed means (North 12/5 = 2.4, East 12.9/5.2 = 2.48), so rank 3
        String[] south = groupLines.get(2).split(",");
        assertEquals("South", south[0]);
        assertEquals("4", south[1]);
        assertEquals(2.0, Double.parseDouble(south[2]), EXACT);
        ParameterSummary southRank = summaries.stream().filter(s -> s.name().equals("rank_intended.South")).findFirst().orElseThrow();
        assertEquals(southRank.mean() - 3, Double.parseDouble(south[23]), EXACT);
        assertEquals(1.0, Double.parseDouble(south[21]), 0, "with three groups every rank is in the top 3");

        List<String> distributionLines = Files.readAllLines(distributions);
        assertEquals(1 + 3 * 5, distributionLines.size());
        for (String line : distributionLines.subList(1, distributionLines.size())) {
            String[] f = line.split(",");
            ParameterSummary replicated = summaries.stream()
                    .filter(s -> s.name().equals("replicated." + f[0] + "." + f[1])).findFirst().orElseThrow();
            int observed = Integer.parseInt(f[2]);
            assertEquals(observed < replicated.q05() || observed > replicated.q95(), Boolean.parseBoolean(f[13]), line);
            assertEquals(replicated.mean(), Double.parseDouble(f[10]), 0, line);
        }
        // North, rating 0: one respondent of four, weight 1.5 of 5
        assertTrue(distributionLines.get(1).startsWith("North,0,1,0.3,"), distributionLines.get(1));

        assertEquals(List.of("column,level,share_mean,share_q5,share_q95"), Files.readAllLines(coarse).subList(0, 1));
        List<String> coarseLevels = Files.readAllLines(coarse).subList(1, 4).stream()
                .map(l -> l.substring(0, l.indexOf(',', l.indexOf(',') + 1))).toList();
        assertEquals(List.of("education,secondary", "education,primary", "education,tertiary"), coarseLevels);
    }
}
