package org.rungs.sampler.run;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.junit.jupiter.api.Test;
import org.rungs.models.ModelSpec;
import org.rungs.models.NumberAttraction;
import org.rungs.models.StyleClasses;
import org.rungs.models.ThresholdMode;
import org.rungs.models.survey.Covariates;
import org.rungs.models.survey.Scale;
import org.rungs.models.survey.Survey;
import org.rungs.priors.Priors;

/** The model's warnings on the survey it is fitted to. */
class SurveyWarningsTest {
    private static Survey twoGroups(Scale scale) {
        byte[] category = {0, 1, 0, 1, 1, 0};
        int[] group = {0, 0, 0, 1, 1, 1};
        return Survey.of(scale, category, group, List.of("North", "South"), Covariates.none(), Covariates.none(), null);
    }

    private static ModelSpec plain(ThresholdMode mode) {
        return new ModelSpec(mode, Priors.defaults(), StyleClasses.none(), NumberAttraction.none());
    }

    /**
     * MODEL.md 3: a group's thresholds average to the common ones, so on a 2-point scale by-group
     * thresholds are the shared ones and threshold_sd has no data (an audit found it reported
     * without a word, following its prior). Our rule: say so, and say --thresholds shared.
     */
    @Test
    void byGroupThresholdsOnATwoPointScaleAreWarnedAbout() {
        // the groups of 3 also get the small-group warning; only the thresholds' is under test
        List<String> warnings = SurveyWarnings.of(twoGroups(new Scale(0, 1)), plain(ThresholdMode.BY_GROUP)).stream()
                .filter(w -> w.contains("threshold")).toList();
        assertEquals(1, warnings.size(), warnings.toString());
        assertTrue(warnings.get(0).startsWith("on a scale of 2 points every group's one threshold is the common one")
                && warnings.get(0).endsWith("say --thresholds shared"), warnings.get(0));
        assertTrue(SurveyWarnings.of(twoGroups(new Scale(0, 1)), plain(ThresholdMode.SHARED)).stream()
                .noneMatch(w -> w.contains("threshold")));
        // three points: two thresholds, whose spacing a group may change
        assertTrue(SurveyWarnings.of(twoGroups(new Scale(0, 2)), plain(ThresholdMode.BY_GROUP)).stream()
                .noneMatch(w -> w.contains("threshold_sd")));
    }
}
