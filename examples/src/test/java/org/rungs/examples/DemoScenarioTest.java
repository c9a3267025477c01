package org.rungs.examples;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.Set;
import java.util.stream.Collectors;
import org.junit.jupiter.api.Test;

class DemoScenarioTest {

    @Test
    void twelveRegionsOf1200OnAnElevenPointScale() {
        Scenario demo = DemoScenario.scenario();
        assertEquals(new Scenario.Scale(0, 10), demo.scale());
        assertEquals(12, demo.groupCount());
        assertEquals(12, demo.groups().stream().map(Scenario.Group::label).collect(Collectors.toSet()).size());
        assertTrue(demo.groups().stream().allMatch(group -> group.respondents() == 1200));
        assertEquals(20261202L, demo.seed());
        assertEquals(Set.of("income", "age"),
                demo.levelCovariates().stream().map(Scenario.LevelCovariate::name).collect(Collectors.toSet()));
    }

    @Test
    void looksLikeALifeSatisfactionSurvey() {
        SimulatedSurvey survey = Simulator.simulate(DemoScenario.scenario());
        double mean = Arrays.stream(survey.rating()).average().orElseThrow();
        assertTrue(mean > 6 && mean < 7.5, "mean rating " + mean);
        double groupSd = survey.truth().get("group_sd");
        assertTrue(groupSd > 0.3 && groupSd < 0.5, "spread of region levels " + groupSd);
        double[] income = survey.covariate("income");
        assertTrue(Arrays.stream(income).allMatch(v -> v > 0));
        double[] age = survey.covariate("age");
        assertTrue(Arrays.stream(age).allMatch(v -> v >= 18 && v <= 90 && v == Math.rint(v)));
    }
}
