package org.rungs.sampler.run;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.rungs.models.ModelSpec;
import org.rungs.models.ThresholdMode;
import org.rungs.models.survey.DataWarnings;
import org.rungs.models.survey.Scale;
import org.rungs.models.survey.Survey;

/** The warnings a fit prints before sampling: the data's ({@link DataWarnings}), then the model's on them. */
final class SurveyWarnings {
    private SurveyWarnings() {
    }

    /** The survey's warnings, then the model's on it. */
    static List<String> of(Survey survey, ModelSpec model) {
        List<String> warnings = new ArrayList<>(DataWarnings.of(survey));
        warnings.addAll(model(survey.scale(), model));
        if (survey.scale().categories() == 2
                && model.effectiveThresholdMode(survey.groupLabels().size()) == ThresholdMode.BY_GROUP) {
            // MODEL.md 3: a group's thresholds average to the common ones, so its one threshold is theirs
            warnings.add("on a scale of 2 points every group's one threshold is the common one, so by-group thresholds"
                    + " are shared ones and threshold_sd follows its prior; say --thresholds shared");
        }
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
