package org.rungs.sampler.run;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;
import org.rungs.models.ModelSpec;
import org.rungs.models.survey.Scale;
import org.rungs.models.survey.Survey;

/** Valid but unusual data, or model choices, that deserve a word before fitting. */
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
        Map<Integer, Long> declaredMissing = survey.exclusions().answersDeclaredMissing();
        for (int k = 0; k < m; k++) {
            int rating = survey.scale().rating(k);
            long declared = declaredMissing.getOrDefault(rating, 0L);
            if (declared > 0) {
                // a code of the rating column matches every answer of its rating, so none is left
                warnings.add("every answer of " + rating + " was declared missing (" + declared
                        + (declared == 1 ? " answer" : " answers") + ", by a missing code of the rating column)"
                        + "; the thresholds around it rest on the prior and on their neighbours");
            } else if (counts[k] == 0) {
                warnings.add("nobody answered " + rating
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

    /** The survey's warnings, then the model's on it. */
    static List<String> of(Survey survey, ModelSpec model) {
        List<String> warnings = of(survey);
        warnings.addAll(model(survey.scale(), model));
        return warnings;
    }

    /**
     * A named attraction on a coarse point: MODEL.md 4b allows it, but the coarse class puts answers
     * there too (4a), so the two explain the same excess and the data tell them apart only by how
     * each varies with the latent level and the class's covariates.
     */
    static List<String> model(Scale scale, ModelSpec model) {
        List<String> warnings = new ArrayList<>();
        if (!model.styleClasses().coarse()) {
            return warnings;
        }
        int[] points = model.styleClasses().points(scale);
        for (int r : model.attraction().resolve(scale, model.styleClasses())) {
            if (Arrays.stream(points).anyMatch(p -> p == r)) {
                warnings.add("attraction on " + r + ", a coarse point: the coarse class also explains an excess of "
                        + r + "s, so the two trade against each other and the attraction of " + r
                        + " is weakly identified; read its sd_ratio in attraction.csv");
            }
        }
        return warnings;
    }
}
