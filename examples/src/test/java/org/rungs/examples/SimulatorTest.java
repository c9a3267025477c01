package org.rungs.examples;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import org.apache.commons.math3.distribution.ChiSquaredDistribution;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.stat.StatUtils;
import org.apache.commons.math3.stat.descriptive.moment.StandardDeviation;
import org.apache.commons.math3.stat.inference.ChiSquareTest;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class SimulatorTest {

    private static final NormalDistribution STANDARD_NORMAL = new NormalDistribution(0, 1);

    /** Three groups, stated intercepts and deviations, covariates far from mean 0 and sd 1. */
    private static Scenario small(int respondentsPerGroup) {
        return new Scenario(new Scenario.Scale(1, 5),
                List.of(new Scenario.Group("A", respondentsPerGroup), new Scenario.Group("B", respondentsPerGroup),
                        new Scenario.Group("C", respondentsPerGroup)),
                List.of(new Scenario.LevelCovariate("hours", new CovariateDistribution.Uniform(20, 60), 0.03, 3),
                        new Scenario.LevelCovariate("rent", new CovariateDistribution.LogNormal(900, 0.4), -0.001, 1)),
                new Scenario.GroupLevels.Fixed(new double[] {-0.4, 0.1, 0.6}),
                Scenario.centred(-1.5, -0.5, 0.4, 1.2),
                new Scenario.ThresholdDeviations.Fixed(new double[][] {
                    {0.1, 0.0, 0.0, -0.1}, {-0.2, 0.05, 0.05, 0.1}, {0.1, -0.05, -0.05, 0.0}}),
                11L);
    }

    @Test
    void sameSeedGivesSameSurvey() {
        SimulatedSurvey first = Simulator.simulate(DemoScenario.scenario(), 5);
        SimulatedSurvey again = Simulator.simulate(DemoScenario.scenario(), 5);
        assertArrayEquals(first.group(), again.group());
        assertArrayEquals(first.rating(), again.rating());
        assertArrayEquals(first.covariate("income"), again.covariate("income"));
        assertArrayEquals(first.covariate("age"), again.covariate("age"));
        assertArrayEquals(first.category("education"), again.category("education"));
        assertArrayEquals(first.coarse(), again.coarse());
        assertEquals(first.truth(), again.truth());
    }

    @Test
    void dataSeedChangesRespondentsButNotDrawnParameters() {
        SimulatedSurvey one = Simulator.simulate(DemoScenario.scenario(), 1);
        SimulatedSurvey two = Simulator.simulate(DemoScenario.scenario(), 2);
        assertFalse(Arrays.equals(one.coarse(), two.coarse()));
        assertFalse(Arrays.equals(one.rating(), two.rating()));
        assertFalse(Arrays.equals(one.covariate("income"), two.covariate("income")));
        for (String label : one.groupLabels()) {
            for (int k = 1; k <= 10; k++) {
                String name = "threshold." + label + "." + k;
                assertEquals(one.truth().get(name), two.truth().get(name), name);
            }
            assertEquals(one.truth().get("style_group." + label), two.truth().get("style_group." + label));
        }
    }

    @Test
    void reportedRatingsFollowTheModelsCategoryProbabilities() {
        SimulatedSurvey survey = Simulator.simulate(DemoScenario.orderedProbit());
        // With a correct simulator the p-value is uniform, or larger: for a sum of categorical
        // draws with unequal probabilities the Pearson statistic is at most multinomially
        // spread. The seed is fixed, so at alpha = 0.001 a correct simulator fails with
        // probability 0.001 once, never intermittently.
        assertTrue(chiSquarePValue(survey, true) > 0.001);
    }

    @Test
    void theCategoryCheckDetectsIgnoredThresholdDeviations() {
        // Negative control for the check above: the demo's deviations (tau_d = 0.15 over
        // 1,500 respondents per region) must be visible when the expected counts leave them out.
        SimulatedSurvey survey = Simulator.simulate(DemoScenario.orderedProbit());
        assertTrue(chiSquarePValue(survey, false) < 1e-6);
    }

    @Test
    void theSmallScenarioAlsoFollowsItsCategoryProbabilities() {
        // Same check and tolerance as above, on stated deviations and a shorter scale.
        assertTrue(chiSquarePValue(Simulator.simulate(small(3000), 3), true) > 0.001);
    }

    @Test
    void truthUsesTheEngineNames() {
        SimulatedSurvey survey = Simulator.simulate(DemoScenario.orderedProbit());
        Set<String> expected = new HashSet<>(List.of("level.income", "level.income.per_unit", "level.age",
                "level.age.per_unit", "group_mean", "group_sd", "threshold_sd"));
        for (String region : DemoScenario.REGIONS) {
            expected.add("group." + region);
            expected.addAll(derivedNames(region, false));
            for (int k = 1; k <= 10; k++) {
                expected.add("threshold." + region + "." + k);
            }
        }
        for (int k = 1; k <= 10; k++) {
            expected.add("threshold." + k);
        }
        assertEquals(expected, survey.truth().keySet());
        assertEquals(0.15, survey.truth().get("threshold_sd"));
        assertEquals(0.12, survey.truth().get("level.income.per_unit"));
    }

    @Test
    void centringShiftsTheInterceptsAndScalingMultipliesTheCoefficients() {
        Scenario scenario = small(400);
        SimulatedSurvey survey = Simulator.simulate(scenario, 4);
        Map<String, Double> truth = survey.truth();
        double[] hours = survey.covariate("hours");
        double[] rent = survey.covariate("rent");
        double shift = 0.03 * StatUtils.mean(hours) - 0.001 * StatUtils.mean(rent);
        assertEquals(0.03 * new StandardDeviation().evaluate(hours), truth.get("level.hours"), 1e-12);
        assertEquals(-0.001 * new StandardDeviation().evaluate(rent), truth.get("level.rent"), 1e-12);
        assertEquals(-0.001, truth.get("level.rent.per_unit"));
        double[] alpha = {-0.4, 0.1, 0.6};
        String[] labels = {"A", "B", "C"};
        for (int g = 0; g < 3; g++) {
            assertEquals(alpha[g] + shift, truth.get("group." + labels[g]), 1e-12);
        }
        assertEquals(StatUtils.mean(alpha) + shift, truth.get("group_mean"), 1e-12);
        assertEquals(new StandardDeviation().evaluate(alpha), truth.get("group_sd"), 1e-12);
        assertTrue(Math.abs(shift) > 0.2, "the scenario must make the shift visible");
    }

    @Test
    void statedDeviationsGiveTheStatedGroupThresholds() {
        Map<String, Double> truth = Simulator.simulate(small(10), 1).truth();
        double[] common = Scenario.centred(-1.5, -0.5, 0.4, 1.2);
        double[] deviationsOfB = {-0.2, 0.05, 0.05, 0.1};
        for (int k = 2; k <= 5; k++) {
            assertEquals(common[k - 2], truth.get("threshold." + k), 1e-15);
            assertEquals(common[k - 2] + deviationsOfB[k - 2], truth.get("threshold.B." + k), 1e-15);
        }
        // Moment estimate sqrt(sum d^2 / (G (K - 1))) with G = 3 groups, K = 4 thresholds.
        double sumOfSquares = 0.01 + 0.01 + 0.04 + 0.0025 + 0.0025 + 0.01 + 0.01 + 0.0025 + 0.0025;
        assertEquals(Math.sqrt(sumOfSquares / 9), truth.get("threshold_sd"), 1e-12);
    }

    @Test
    void thresholdsAndDeviationsSumToZeroAndIncrease() {
        SimulatedSurvey survey = Simulator.simulate(DemoScenario.scenario());
        Map<String, Double> truth = survey.truth();
        double commonSum = 0;
        for (int k = 1; k <= 10; k++) {
            commonSum += truth.get("threshold." + k);
            if (k > 1) {
                assertTrue(truth.get("threshold." + k) > truth.get("threshold." + (k - 1)));
            }
        }
        assertEquals(0, commonSum, 1e-12);
        double largestDeviation = 0;
        for (String region : DemoScenario.REGIONS) {
            double deviationSum = 0;
            for (int k = 1; k <= 10; k++) {
                double own = truth.get("threshold." + region + "." + k);
                deviationSum += own - truth.get("threshold." + k);
                largestDeviation = Math.max(largestDeviation, Math.abs(own - truth.get("threshold." + k)));
                if (k > 1) {
                    assertTrue(own > truth.get("threshold." + region + "." + (k - 1)), region);
                }
            }
            assertEquals(0, deviationSum, 1e-12, region);
        }
        assertTrue(largestDeviation > 0.1, "drawn deviations must not be zero");
    }

    @Test
    void sharedThresholdsHaveNoGroupTerms() {
        Scenario shared = new Scenario(new Scenario.Scale(1, 4),
                List.of(new Scenario.Group("A", 50), new Scenario.Group("B", 50)), List.of(),
                new Scenario.GroupLevels.Fixed(new double[] {0, 1}), Scenario.centred(-1, 0, 1),
                Scenario.ThresholdDeviations.shared(), 3L);
        Map<String, Double> truth = Simulator.simulate(shared, 1).truth();
        Set<String> expected = new HashSet<>(Set.of("group_mean", "group_sd", "group.A", "group.B", "threshold.2",
                "threshold.3", "threshold.4"));
        expected.addAll(derivedNames("A", false));
        expected.addAll(derivedNames("B", false));
        assertEquals(expected, truth.keySet());
        assertEquals(1.0, truth.get("group.B"));
    }

    @Test
    void oneGroupReportsOnlyTheGlobalTerms() {
        Scenario single = new Scenario(new Scenario.Scale(0, 2), List.of(new Scenario.Group("all", 20)),
                List.of(new Scenario.LevelCovariate("x", new CovariateDistribution.Uniform(0, 1), 1.0, 6)),
                new Scenario.GroupLevels.Fixed(new double[] {0.5}), Scenario.centred(-1, 1),
                Scenario.ThresholdDeviations.shared(), 3L);
        SimulatedSurvey survey = Simulator.simulate(single, 2);
        Set<String> expected = new HashSet<>(Set.of("level.x", "level.x.per_unit", "group_mean", "threshold.1", "threshold.2"));
        expected.addAll(derivedNames("all", false));
        assertEquals(expected, survey.truth().keySet());
        assertEquals(0.5 + StatUtils.mean(survey.covariate("x")), survey.truth().get("group_mean"), 1e-12);
    }

    @Test
    void drawnGroupLevelsAreNormalAroundTheStatedMean() {
        // 4,000 groups of one respondent: u[g] = (alpha[g] - mu) / tau should be standard normal.
        int groups = 4000;
        List<Scenario.Group> list = new ArrayList<>();
        for (int g = 0; g < groups; g++) {
            list.add(new Scenario.Group("g" + g, 1));
        }
        Scenario drawn = new Scenario(new Scenario.Scale(1, 5), list, List.of(),
                new Scenario.GroupLevels.Drawn(0.7, 0.4), Scenario.centred(-3, -1, 1, 3),
                new Scenario.ThresholdDeviations.Drawn(0.1), 17L);
        Map<String, Double> truth = Simulator.simulate(drawn, 1).truth();
        assertEquals(0.7, truth.get("group_mean"));
        assertEquals(0.4, truth.get("group_sd"));
        double[] u = new double[groups];
        double sumOfSquaredDeviations = 0;
        for (int g = 0; g < groups; g++) {
            u[g] = (truth.get("group.g" + g) - 0.7) / 0.4;
            for (int k = 2; k <= 5; k++) {
                double d = truth.get("threshold.g" + g + "." + k) - truth.get("threshold." + k);
                sumOfSquaredDeviations += d * d;
            }
        }
        // Monte Carlo standard errors: mean 1/sqrt(4000) = 0.016, sd about 0.011; tolerance 4.5 of them.
        assertEquals(0, StatUtils.mean(u), 0.072);
        assertEquals(1, new StandardDeviation().evaluate(u), 0.05);
        // E sum_k d^2 = tau_d^2 (K - 1); 12,000 degrees of freedom give the sd estimate a relative
        // standard error of about 0.65%; tolerance 3% (4.6 of them). Gaps of 2 make the
        // increasing-order restriction negligible at tau_d = 0.1.
        assertEquals(0.1, Math.sqrt(sumOfSquaredDeviations / (groups * 3)), 0.003);
    }

    @Test
    void writtenFilesReadBackToTheSameValues(@TempDir Path dir) throws IOException {
        SimulatedSurvey survey = Simulator.simulate(small(30), 9);
        Path data = dir.resolve("survey.csv");
        survey.writeCsv(data);
        List<String> lines = Files.readAllLines(data);
        assertEquals("region,rating,hours,rent", lines.get(0));
        assertEquals(survey.size() + 1, lines.size());
        int[] rating = survey.rating();
        double[] hours = survey.covariate("hours");
        double[] rent = survey.covariate("rent");
        for (int row = 0; row < survey.size(); row++) {
            String[] fields = lines.get(row + 1).split(",");
            assertEquals(survey.groupLabel(row), fields[0]);
            assertEquals(rating[row], Integer.parseInt(fields[1]));
            assertEquals(hours[row], Double.parseDouble(fields[2]));
            assertEquals(rent[row], Double.parseDouble(fields[3]));
            assertTrue(rating[row] >= 1 && rating[row] <= 5);
        }
        Path truthFile = dir.resolve("truth.csv");
        survey.writeTruth(truthFile);
        List<String> truthLines = Files.readAllLines(truthFile);
        assertEquals("parameter,value", truthLines.get(0));
        Map<String, Double> read = new LinkedHashMap<>();
        for (String line : truthLines.subList(1, truthLines.size())) {
            String[] fields = line.split(",");
            read.put(fields[0], Double.parseDouble(fields[1]));
        }
        assertEquals(survey.truth(), read);
    }

    /** The derived truths of MODEL.md section 6 for one group. */
    static List<String> derivedNames(String label, boolean styleClasses) {
        List<String> names = new ArrayList<>(List.of("intended_mean." + label, "harmonised_mean." + label, "reported_mean." + label));
        if (styleClasses) {
            names.add("coarse_share." + label);
        }
        return names;
    }

    /**
     * Pearson chi-square of the observed rating counts per group against the expected counts
     * {@code sum_i Phi(c[g,k] - eta_i) - Phi(c[g,k-1] - eta_i)} (MODEL.md section 3), summed over
     * groups, with eta_i rebuilt from the truth on the internal scale (centred covariates).
     * Cells are pooled until each expects at least 5 (common practice, no source).
     */
    private static double chiSquarePValue(SimulatedSurvey survey, boolean groupThresholds) {
        Map<String, Double> truth = survey.truth();
        Scenario.Scale scale = survey.scenario().scale();
        int categories = scale.categories();
        List<String> names = survey.covariateNames();
        double[][] centred = new double[names.size()][];
        double[] beta = new double[names.size()];
        for (int j = 0; j < names.size(); j++) {
            double[] x = survey.covariate(names.get(j));
            double mean = StatUtils.mean(x);
            centred[j] = Arrays.stream(x).map(v -> v - mean).toArray();
            beta[j] = truth.get("level." + names.get(j) + ".per_unit");
        }
        List<String> labels = survey.groupLabels();
        double[][] expected = new double[labels.size()][categories];
        long[][] observed = new long[labels.size()][categories];
        int[] group = survey.group();
        int[] rating = survey.rating();
        for (int row = 0; row < survey.size(); row++) {
            String label = labels.get(group[row]);
            double eta = truth.get("group." + label);
            for (int j = 0; j < beta.length; j++) {
                eta += beta[j] * centred[j][row];
            }
            double below = 0;
            for (int position = 0; position < categories; position++) {
                double upTo = 1;
                if (position < categories - 1) {
                    int k = scale.lowest() + position + 1;
                    String name = groupThresholds ? "threshold." + label + "." + k : "threshold." + k;
                    upTo = STANDARD_NORMAL.cumulativeProbability(truth.get(name) - eta);
                }
                expected[group[row]][position] += upTo - below;
                below = upTo;
            }
            observed[group[row]][rating[row] - scale.lowest()]++;
        }
        double statistic = 0;
        int degreesOfFreedom = 0;
        ChiSquareTest test = new ChiSquareTest();
        for (int g = 0; g < labels.size(); g++) {
            List<double[]> cells = pooled(expected[g], observed[g]);
            double[] e = cells.stream().mapToDouble(cell -> cell[0]).toArray();
            long[] o = cells.stream().mapToLong(cell -> (long) cell[1]).toArray();
            statistic += test.chiSquare(e, o);
            degreesOfFreedom += e.length - 1;
        }
        return 1 - new ChiSquaredDistribution(degreesOfFreedom).cumulativeProbability(statistic);
    }

    /** Adjacent cells merged until each expects at least 5; a short remainder joins the last cell. */
    static List<double[]> pooled(double[] expected, long[] observed) {
        List<double[]> cells = new ArrayList<>();
        double e = 0;
        long o = 0;
        for (int k = 0; k < expected.length; k++) {
            e += expected[k];
            o += observed[k];
            if (e >= 5) {
                cells.add(new double[] {e, o});
                e = 0;
                o = 0;
            }
        }
        if (e > 0 || o > 0) {
            double[] last = cells.get(cells.size() - 1);
            last[0] += e;
            last[1] += o;
        }
        return cells;
    }
}
