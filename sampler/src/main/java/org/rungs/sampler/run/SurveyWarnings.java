package org.rungs.sampler.run;

import java.util.ArrayList;
import java.util.List;
import org.rungs.models.survey.Survey;

/** Valid but unusual data that deserve a word before fitting. */
final class SurveyWarnings {
    /** Below this many respondents a group's own thresholds and level rest mostly on the priors (common practice, no source). */
    static final int SMALL_GROUP = 30;

    private SurveyWarnings() {
    }

    static List<String> of(Survey survey) {
        List<String> warnings = new ArrayList<>();
        int m = survey.scale().categories();
        long[] counts = new long[m];
        for (byte c : survey.category()) {
            counts[c]++;
        }
        for (int k = 0; k < m; k++) {
            if (counts[k] == 0) {
                warnings.add("nobody answered " + survey.scale().rating(k)
                        + "; the thresholds around it rest on the prior and on their neighbours");
            }
        }
        int[] sizes = survey.groupSizes();
        for (int g = 0; g < sizes.length; g++) {
            if (sizes[g] < SMALL_GROUP) {
                warnings.add("group " + survey.groupLabels().get(g) + " has only " + sizes[g]
                        + " respondents; its estimates lean on the other groups");
            }
        }
        return warnings;
    }
}
