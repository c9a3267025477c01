package org.rungs.examples;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashSet;
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

/** The coarse class and number attraction of MODEL.md 4, 4a, 4b, checked against 4c recomputed here. */
class ResponseStyleTest {

    private static final NormalDistribution STANDARD_NORMAL = new NormalDistribution(0, 1);

    private static final Scenario.LevelCovariate HOURS =
            new Scenario.LevelCovariate("hours", new CovariateDistribution.Uniform(20, 60), 0.03, 3);

    /** Default coarse points of the scale 1..10: {L, floor((L+U)/2), U} (MODEL.md 4a). */
    private static final int[] COARSE_POINTS = {1, 5, 10};

    /**
     * Scale 1..10 (so intended 3 is a tie between 1 and 5), three groups, a numeric style
     * covariate that is also the level covariate (so its centring moves both intercepts), a
     * categorical one with a stated reference, drawn style intercepts and drawn attraction
     * deviations on A = {4, 8}.
     */
    private static Scenario styled(int respondentsPerGroup) {
        Scenario.StyleCovariate schooling = new Scenario.StyleCovariate.Categorical("schooling", List.of(
                new Scenario.StyleCovariate.Category("short", 0.40, 0.3),
                new Scenario.StyleCovariate.Category("medium", 0.35, 0.1),
                new Scenario.StyleCovariate.Category("long", 0.25, -0.4)), "medium");
        return new Scenario(new Scenario.Scale(1, 10),
                List.of(new Scenario.Group("A", respondentsPerGroup), new Scenario.Group("B", respondentsPerGroup),
                        new Scenario.Group("C", respondentsPerGroup)),
                List.of(HOURS), new Scenario.GroupLevels.Fixed(new double[] {-2.0, -1.5, -1.0}),
                Scenario.centred(-2.0, -1.5, -1.0, -0.5, 0, 0.5, 1.0, 1.6, 2.2),
                new Scenario.ThresholdDeviations.Drawn(0.1),
                new Scenario.StyleClasses.Coarse(List.of(Scenario.StyleCovariate.Numeric.sharing(HOURS, -0.02), schooling),
                        new Scenario.GroupLevels.Drawn(0.4, 0.3)),
                new Scenario.NumberAttraction.Active(new int[] {8, 4}, new double[] {-0.4, 0.5},
                        new Scenario.AttractionDeviations.Drawn(0.2)),
                17L);
    }

    @Test
    void reportedRatingsFollowTheMixtureOfSection4c() {
        SimulatedSurvey survey = Simulator.simulate(styled(4000), 23);
        // As in SimulatorTest: seed fixed, alpha = 0.001, the p-value of a correct simulator is
        // uniform or larger, so this fails with probability at most 0.001, and never intermittently.
        assertTrue(chiSquarePValue(survey, expected(survey, true, true)) > 0.001);
    }

    @Test
    void theMixtureCheckSeesAttractionAndTheTieRule() {
        // Negative controls for the check above, on the same data: leaving out the attraction
        // (a = -0.4 on 4 and 0.5 on 8), or sending every tie to the lower coarse point, must be
        // rejected at p < 1e-6.
        SimulatedSurvey survey = Simulator.simulate(styled(4000), 23);
        assertTrue(chiSquarePValue(survey, expected(survey, false, true)) < 1e-6);
        assertTrue(chiSquarePValue(survey, expected(survey, true, false)) < 1e-6);
    }

    @Test
    void aTieGoesToEachNearestCoarsePointWithProbabilityOneHalf() {
        // Scale 1..10, coarse points {1, 5, 10}, everyone coarse (q = Phi(8)). Group "three" has
        // its latent level in the middle of a category 3 about 11.9 wide, group "eight" in the
        // middle of category 8: intended 3 and 8 with probability 1 - 1e-8. Then 3 is 2 away
        // from 1 and from 5 (a tie), 8 is 2 from 10 and 3 from 5.
        double[] thresholds = Scenario.centred(-20.0, -19.9, -8.0, -7.9, -7.8, -7.7, -7.6, 4.0, 4.1);
        double middleOf3 = (thresholds[1] + thresholds[2]) / 2;
        double middleOf8 = (thresholds[6] + thresholds[7]) / 2;
        int n = 20_000;
        Scenario scenario = new Scenario(new Scenario.Scale(1, 10),
                List.of(new Scenario.Group("three", n), new Scenario.Group("eight", 1000)), List.of(),
                new Scenario.GroupLevels.Fixed(new double[] {middleOf3, middleOf8}), thresholds,
                Scenario.ThresholdDeviations.shared(),
                new Scenario.StyleClasses.Coarse(List.of(), new Scenario.GroupLevels.Fixed(new double[] {8, 8})),
                Scenario.NumberAttraction.none(), 5L);
        SimulatedSurvey survey = Simulator.simulate(scenario, 6);
        int[] rating = survey.rating();
        int[] group = survey.group();
        int atOne = 0;
        for (int i = 0; i < rating.length; i++) {
            if (group[i] == 0) {
                assertTrue(rating[i] == 1 || rating[i] == 5, "a tie at 3 reports 1 or 5, got " + rating[i]);
                atOne += rating[i] == 1 ? 1 : 0;
            } else {
                assertEquals(10, rating[i], "8 is nearer to 10 than to 5");
            }
        }
        // Binomial(20,000, 1/2): sd 70.7; tolerance 4.5 sd (two-sided p 7e-6 for a correct
        // simulator; the seed is fixed). Sending ties one way would put all 20,000 on one side.
        assertEquals(n / 2.0, atOne, 4.5 * Math.sqrt(n * 0.25));
    }

    @Test
    void coarseShareIsTheMeanOfTheClassProbabilities() {
        SimulatedSurvey survey = Simulator.simulate(styled(2000), 31);
        Map<String, Double> truth = survey.truth();
        double[] q = coarseProbabilities(survey);
        assertArrayEquals(q, survey.coarseProbability(), 1e-12);
        boolean[] coarse = survey.coarse();
        int[] group = survey.group();
        List<String> labels = survey.groupLabels();
        for (int g = 0; g < labels.size(); g++) {
            double sum = 0;
            int count = 0;
            int coarseCount = 0;
            for (int i = 0; i < q.length; i++) {
                if (group[i] == g) {
                    sum += q[i];
                    count++;
                    coarseCount += coarse[i] ? 1 : 0;
                }
            }
            assertEquals(sum / count, truth.get("coarse_share." + labels.get(g)), 1e-12);
            // The drawn classes: a sum of 2,000 Bernoulli(q_i), sd at most 22.4; tolerance 4.5 sd.
            assertEquals(sum, coarseCount, 4.5 * Math.sqrt(count * 0.25), labels.get(g));
        }
    }

    @Test
    void intendedHarmonisedAndReportedMeansFollowSection6() {
        SimulatedSurvey survey = Simulator.simulate(styled(500), 3);
        Map<String, Double> truth = survey.truth();
        double[] eta = latentLevels(survey);
        int[] group = survey.group();
        int[] rating = survey.rating();
        List<String> labels = survey.groupLabels();
        for (int g = 0; g < labels.size(); g++) {
            String label = labels.get(g);
            double intended = 0;
            double harmonised = 0;
            double reported = 0;
            int count = 0;
            for (int i = 0; i < rating.length; i++) {
                if (group[i] == g) {
                    double[] own = categoryProbabilities(truth, "threshold." + label + ".", eta[i], 1, 10);
                    double[] common = categoryProbabilities(truth, "threshold.", eta[i], 1, 10);
                    for (int k = 0; k < 10; k++) {
                        intended += (1 + k) * own[k];
                        harmonised += (1 + k) * common[k];
                    }
                    reported += rating[i];
                    count++;
                }
            }
            assertEquals(intended / count, truth.get("intended_mean." + label), 1e-9, label);
            assertEquals(harmonised / count, truth.get("harmonised_mean." + label), 1e-9, label);
            assertEquals(reported / count, truth.get("reported_mean." + label), 1e-12, label);
        }
    }

    @Test
    void truthNamesTheStyleAndAttractionParameters() {
        SimulatedSurvey survey = Simulator.simulate(styled(300), 2);
        Map<String, Double> truth = survey.truth();
        Set<String> names = new HashSet<>(truth.keySet());
        Set<String> expected = new HashSet<>(List.of("style.hours", "style.hours.per_unit", "style.schooling=short",
                "style.schooling=long", "style_mean", "style_sd", "attraction.4", "attraction.8", "attraction_sd"));
        for (String label : List.of("A", "B", "C")) {
            expected.addAll(List.of("style_group." + label, "attraction." + label + ".4", "attraction." + label + ".8"));
            expected.addAll(SimulatorTest.derivedNames(label, true));
        }
        names.removeIf(name -> name.startsWith("level.") || name.startsWith("group") || name.startsWith("threshold"));
        assertEquals(expected, names);
        assertEquals(Map.of("schooling", "medium"), survey.referenceLevels());
        // Indicators against the stated reference "medium" (effect 0.1), not centred.
        assertEquals(0.3 - 0.1, truth.get("style.schooling=short"), 1e-15);
        assertEquals(-0.4 - 0.1, truth.get("style.schooling=long"), 1e-15);
        assertEquals(-0.4, truth.get("attraction.8"));
        assertEquals(0.5, truth.get("attraction.4"));
        assertEquals(0.2, truth.get("attraction_sd"));
        // Centring hours moves the style intercepts by delta * mean(hours), the reference level by its effect.
        double[] hours = survey.covariate("hours");
        double shift = -0.02 * StatUtils.mean(hours) + 0.1;
        assertEquals(-0.02 * new StandardDeviation().evaluate(hours), truth.get("style.hours"), 1e-12);
        assertEquals(0.4 + shift, truth.get("style_mean"), 1e-12);
    }

    @Test
    void oneGroupHasOnlyTheGlobalStyleAndAttractionTerms() {
        Scenario single = new Scenario(new Scenario.Scale(0, 4), List.of(new Scenario.Group("all", 50)), List.of(),
                new Scenario.GroupLevels.Fixed(new double[] {0}), Scenario.centred(-1, 0, 1, 2),
                Scenario.ThresholdDeviations.shared(),
                new Scenario.StyleClasses.Coarse(List.of(), new Scenario.GroupLevels.Fixed(new double[] {-0.5})),
                new Scenario.NumberAttraction.Active(new double[] {0.1, 0.2}, Scenario.AttractionDeviations.none()), 1L);
        Map<String, Double> truth = Simulator.simulate(single, 1).truth();
        Set<String> expected = new HashSet<>(List.of("group_mean", "threshold.1", "threshold.2", "threshold.3", "threshold.4",
                "style_mean", "attraction.1", "attraction.3"));
        expected.addAll(SimulatorTest.derivedNames("all", true));
        // Default coarse points of 0..4 are {0, 2, 4}; A is the rest.
        assertEquals(expected, truth.keySet());
        assertEquals(-0.5, truth.get("style_mean"));
        assertThrows(IllegalArgumentException.class, () -> new Scenario(new Scenario.Scale(0, 4),
                List.of(new Scenario.Group("all", 50)), List.of(), new Scenario.GroupLevels.Fixed(new double[] {0}),
                Scenario.centred(-1, 0, 1, 2), Scenario.ThresholdDeviations.shared(), Scenario.StyleClasses.none(),
                new Scenario.NumberAttraction.Active(new double[] {0.1, 0.2}, new Scenario.AttractionDeviations.Drawn(0.1)), 1L));
    }

    @Test
    void theFileHoldsStyleColumnsOnceAndCategoriesAsText(@TempDir Path dir) throws IOException {
        SimulatedSurvey survey = Simulator.simulate(styled(20), 8);
        Path file = dir.resolve("styled.csv");
        survey.writeCsv(file);
        List<String> lines = Files.readAllLines(file);
        assertEquals("region,rating,hours,schooling", lines.get(0));
        String[] schooling = survey.category("schooling");
        double[] hours = survey.covariate("hours");
        for (int row = 0; row < survey.size(); row++) {
            String[] fields = lines.get(row + 1).split(",");
            assertEquals(hours[row], Double.parseDouble(fields[2]));
            assertEquals(schooling[row], fields[3]);
            assertTrue(Set.of("short", "medium", "long").contains(fields[3]));
        }
    }

    @Test
    void styleSettingsAreChecked() {
        Scenario.StyleClasses outside = new Scenario.StyleClasses.Coarse(List.of(),
                new Scenario.GroupLevels.Drawn(0, 1), new int[] {1, 11});
        assertThrows(IllegalArgumentException.class, () -> withStyle(outside, Scenario.NumberAttraction.none()));
        Scenario.StyleClasses namedLikeAGroup = new Scenario.StyleClasses.Coarse(List.of(new Scenario.StyleCovariate.Numeric(
                "A", new CovariateDistribution.Uniform(0, 1), 1, 2)), new Scenario.GroupLevels.Drawn(0, 1));
        assertThrows(IllegalArgumentException.class, () -> withStyle(namedLikeAGroup, Scenario.NumberAttraction.none()));
        Scenario.StyleClasses otherHours = new Scenario.StyleClasses.Coarse(List.of(new Scenario.StyleCovariate.Numeric(
                "hours", new CovariateDistribution.Uniform(0, 1), 1, 3)), new Scenario.GroupLevels.Drawn(0, 1));
        assertThrows(IllegalArgumentException.class, () -> withStyle(otherHours, Scenario.NumberAttraction.none()));
        // Default A on 1..10 has 7 numbers (all but 1, 5, 10): two mean attractions do not fit.
        assertThrows(IllegalArgumentException.class, () -> withStyle(Scenario.StyleClasses.none(),
                new Scenario.NumberAttraction.Active(new double[] {0.1, 0.2}, Scenario.AttractionDeviations.none())));
        assertArrayEquals(new int[] {2, 3, 4, 6, 7, 8, 9}, withStyle(Scenario.StyleClasses.none(),
                new Scenario.NumberAttraction.Active(new double[7], Scenario.AttractionDeviations.none())).attractionSet());
        assertThrows(IllegalArgumentException.class, () -> new Scenario.StyleCovariate.Categorical("s", List.of(
                new Scenario.StyleCovariate.Category("a", 0.5, 0), new Scenario.StyleCovariate.Category("b", 0.4, 0)), null));
    }

    private static Scenario withStyle(Scenario.StyleClasses style, Scenario.NumberAttraction attraction) {
        return new Scenario(new Scenario.Scale(1, 10), List.of(new Scenario.Group("A", 10), new Scenario.Group("B", 10)),
                List.of(HOURS), new Scenario.GroupLevels.Fixed(new double[] {0, 1}),
                Scenario.centred(-2.0, -1.5, -1.0, -0.5, 0, 0.5, 1.0, 1.6, 2.2), Scenario.ThresholdDeviations.shared(),
                style, attraction, 1L);
    }

    /** {@code eta_i} on the internal scale: {@code group.<label>} plus per-unit effects times centred covariates. */
    private static double[] latentLevels(SimulatedSurvey survey) {
        Map<String, Double> truth = survey.truth();
        double[] eta = new double[survey.size()];
        int[] group = survey.group();
        for (int i = 0; i < eta.length; i++) {
            eta[i] = truth.get("group." + survey.groupLabels().get(group[i]));
        }
        for (String name : survey.covariateNames()) {
            double[] x = survey.covariate(name);
            double mean = StatUtils.mean(x);
            double beta = truth.get("level." + name + ".per_unit");
            for (int i = 0; i < eta.length; i++) {
                eta[i] += beta * (x[i] - mean);
            }
        }
        return eta;
    }

    /**
     * {@code q_i = Phi(style.<label> + w_i' delta)} on the internal scale (MODEL.md 1 and 4):
     * numeric w standardised with the sample sd (n-1), categorical w as indicators of every
     * level but the reference, which this test states ("medium").
     */
    private static double[] coarseProbabilities(SimulatedSurvey survey) {
        Map<String, Double> truth = survey.truth();
        int[] group = survey.group();
        double[] index = new double[survey.size()];
        for (int i = 0; i < index.length; i++) {
            index[i] = truth.get("style_group." + survey.groupLabels().get(group[i]));
        }
        double[] hours = survey.covariate("hours");
        double mean = StatUtils.mean(hours);
        double sd = new StandardDeviation().evaluate(hours);
        String[] schooling = survey.category("schooling");
        for (int i = 0; i < index.length; i++) {
            index[i] += truth.get("style.hours") * (hours[i] - mean) / sd;
            if (!schooling[i].equals("medium")) {
                index[i] += truth.get("style.schooling=" + schooling[i]);
            }
        }
        return Arrays.stream(index).map(STANDARD_NORMAL::cumulativeProbability).toArray();
    }

    /** {@code pi[k](eta)} for k = lowest..highest from the thresholds named {@code prefix + k}. */
    private static double[] categoryProbabilities(Map<String, Double> truth, String prefix, double eta, int lowest, int highest) {
        double[] pi = new double[highest - lowest + 1];
        double below = 0;
        for (int k = 0; k < pi.length; k++) {
            double upTo = k == pi.length - 1 ? 1 : STANDARD_NORMAL.cumulativeProbability(truth.get(prefix + (lowest + 1 + k)) - eta);
            pi[k] = upTo - below;
            below = upTo;
        }
        return pi;
    }

    /**
     * Expected counts per group and rating 1..10 from MODEL.md 4c:
     * {@code (1 - q_i) pi[j] e^a[j] / sum_k pi[k] e^a[k] + q_i sum_k pi[k] R(j|k)}; with
     * {@code attraction} false the attraction is left out, with {@code splitTies} false a tie
     * goes wholly to the lower coarse point (both wrong, for the negative controls).
     */
    private static double[][] expected(SimulatedSurvey survey, boolean attraction, boolean splitTies) {
        Map<String, Double> truth = survey.truth();
        double[] eta = latentLevels(survey);
        double[] q = coarseProbabilities(survey);
        double[][] channel = roundingChannel(splitTies);
        List<String> labels = survey.groupLabels();
        int[] group = survey.group();
        double[][] expected = new double[labels.size()][10];
        for (int i = 0; i < eta.length; i++) {
            String label = labels.get(group[i]);
            double[] pi = categoryProbabilities(truth, "threshold." + label + ".", eta[i], 1, 10);
            double[] weighted = new double[10];
            double total = 0;
            for (int k = 0; k < 10; k++) {
                Double a = truth.get("attraction." + label + "." + (k + 1));
                weighted[k] = pi[k] * (attraction && a != null ? Math.exp(a) : 1);
                total += weighted[k];
            }
            for (int j = 0; j < 10; j++) {
                double coarse = 0;
                for (int k = 0; k < 10; k++) {
                    coarse += pi[k] * channel[k][j];
                }
                expected[group[i]][j] += (1 - q[i]) * weighted[j] / total + q[i] * coarse;
            }
        }
        return expected;
    }

    /** R(j|k) on 1..10 with coarse points {1, 5, 10}: nearest point, a tie split in halves (or all to the lower). */
    private static double[][] roundingChannel(boolean splitTies) {
        double[][] channel = new double[10][10];
        for (int k = 1; k <= 10; k++) {
            int best = Integer.MAX_VALUE;
            for (int point : COARSE_POINTS) {
                best = Math.min(best, Math.abs(point - k));
            }
            List<Integer> nearest = new ArrayList<>();
            for (int point : COARSE_POINTS) {
                if (Math.abs(point - k) == best) {
                    nearest.add(point);
                }
            }
            for (int n = 0; n < nearest.size(); n++) {
                double share = splitTies ? 1.0 / nearest.size() : (n == 0 ? 1 : 0);
                channel[k - 1][nearest.get(n) - 1] += share;
            }
        }
        return channel;
    }

    /** Pearson chi-square over groups of the rating counts against {@code expected}, cells pooled as in SimulatorTest. */
    private static double chiSquarePValue(SimulatedSurvey survey, double[][] expected) {
        long[][] observed = new long[expected.length][10];
        int[] group = survey.group();
        int[] rating = survey.rating();
        for (int i = 0; i < rating.length; i++) {
            observed[group[i]][rating[i] - 1]++;
        }
        double statistic = 0;
        int degreesOfFreedom = 0;
        ChiSquareTest test = new ChiSquareTest();
        for (int g = 0; g < expected.length; g++) {
            List<double[]> cells = SimulatorTest.pooled(expected[g], observed[g]);
            double[] e = cells.stream().mapToDouble(cell -> cell[0]).toArray();
            long[] o = cells.stream().mapToLong(cell -> (long) cell[1]).toArray();
            statistic += test.chiSquare(e, o);
            degreesOfFreedom += e.length - 1;
        }
        return 1 - new ChiSquaredDistribution(degreesOfFreedom).cumulativeProbability(statistic);
    }
}
