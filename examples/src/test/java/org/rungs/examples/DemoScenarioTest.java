package org.rungs.examples;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertInstanceOf;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.Map;
import java.util.Set;
import java.util.stream.Collectors;
import java.util.stream.IntStream;
import org.junit.jupiter.api.Test;

class DemoScenarioTest {

    @Test
    void twelveRegionsOf1500OnAnElevenPointScale() {
        for (Scenario demo : new Scenario[] {DemoScenario.scenario(), DemoScenario.orderedProbit()}) {
            assertEquals(new Scenario.Scale(0, 10), demo.scale());
            assertEquals(12, demo.groupCount());
            assertEquals(12, demo.groups().stream().map(Scenario.Group::label).collect(Collectors.toSet()).size());
            assertTrue(demo.groups().stream().allMatch(group -> group.respondents() == 1500));
            assertEquals(20261202L, demo.seed());
            assertEquals(Set.of("income", "age"),
                    demo.levelCovariates().stream().map(Scenario.LevelCovariate::name).collect(Collectors.toSet()));
        }
        assertInstanceOf(Scenario.StyleClasses.None.class, DemoScenario.orderedProbit().styleClasses());
        assertInstanceOf(Scenario.NumberAttraction.None.class, DemoScenario.orderedProbit().attraction());
    }

    @Test
    void looksLikeALifeSatisfactionSurvey() {
        SimulatedSurvey survey = Simulator.simulate(DemoScenario.scenario());
        double mean = Arrays.stream(survey.rating()).average().orElseThrow();
        assertTrue(mean > 6.5 && mean < 7, "mean rating " + mean);
        double groupSd = survey.truth().get("group_sd");
        assertTrue(groupSd > 0.3 && groupSd < 0.5, "spread of region levels " + groupSd);
        double[] income = survey.covariate("income");
        assertTrue(Arrays.stream(income).allMatch(v -> v > 0));
        double[] age = survey.covariate("age");
        assertTrue(Arrays.stream(age).allMatch(v -> v >= 18 && v <= 90 && v == Math.rint(v)));
        assertEquals(Set.of("basic", "secondary", "tertiary"), Set.copyOf(Arrays.asList(survey.category("education"))));
    }

    @Test
    void aboutAThirdOfTheLessEducatedAreCoarseAndEducationLowersTheShare() {
        SimulatedSurvey survey = Simulator.simulate(DemoScenario.scenario());
        Map<String, Double> share = coarseShareByEducation(survey);
        assertEquals(1.0 / 3, share.get("basic"), 0.05, "the issue's story: a third of the less educated");
        assertTrue(share.get("basic") > share.get("secondary") && share.get("secondary") > share.get("tertiary"), share.toString());
        // The engine's default reference: the most frequent level.
        assertEquals(Map.of("education", "secondary"), survey.referenceLevels());
        Map<String, Double> truth = survey.truth();
        assertTrue(truth.get("style.education=basic") > 0 && truth.get("style.education=tertiary") < 0);
        for (String region : DemoScenario.REGIONS) {
            for (int j : new int[] {1, 2, 3, 4, 6, 7, 8, 9}) {
                assertTrue(truth.containsKey("attraction." + region + "." + j), region + " " + j);
            }
            assertFalse(truth.containsKey("attraction." + region + ".5"), "coarse points are the reference");
            assertTrue(truth.containsKey("coarse_share." + region) && truth.containsKey("style_group." + region));
        }
        // Eastmarch likes 7 and avoids 4 (invented).
        assertTrue(truth.get("attraction.Eastmarch.7") > 0.5 && truth.get("attraction.Eastmarch.4") < -0.3);
    }

    @Test
    void excessAnswersAtZeroFiveAndTenConcentrateAmongTheLessEducated() {
        // The fact of the trade (common practice, no source): heaping on round numbers is
        // heavier among respondents with less schooling. Share of answers at 0, 5 or 10 with basic
        // against tertiary education, two-proportion z statistic with pooled variance; z > 4
        // (one-sided p 3e-5 were education without effect; the seed is fixed). Education does
        // not enter the latent level here, so the difference is the coarse class's.
        SimulatedSurvey survey = Simulator.simulate(DemoScenario.scenario());
        String[] education = survey.category("education");
        int[] rating = survey.rating();
        double[] atRound = new double[2];
        double[] count = new double[2];
        for (int i = 0; i < rating.length; i++) {
            int level = education[i].equals("basic") ? 0 : education[i].equals("tertiary") ? 1 : -1;
            if (level >= 0) {
                count[level]++;
                atRound[level] += rating[i] == 0 || rating[i] == 5 || rating[i] == 10 ? 1 : 0;
            }
        }
        double basic = atRound[0] / count[0];
        double tertiary = atRound[1] / count[1];
        double pooled = (atRound[0] + atRound[1]) / (count[0] + count[1]);
        double z = (basic - tertiary) / Math.sqrt(pooled * (1 - pooled) * (1 / count[0] + 1 / count[1]));
        assertTrue(z > 4, "basic " + basic + ", tertiary " + tertiary + ", z " + z);
    }

    /** Mean true q_i by education level. */
    static Map<String, Double> coarseShareByEducation(SimulatedSurvey survey) {
        String[] education = survey.category("education");
        double[] q = survey.coarseProbability();
        return Arrays.stream(new String[] {"basic", "secondary", "tertiary"}).collect(Collectors.toMap(level -> level,
                level -> IntStream.range(0, q.length).filter(i -> education[i].equals(level))
                        .mapToDouble(i -> q[i]).average().orElseThrow()));
    }
}
