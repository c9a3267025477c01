package org.rungs.sampler.run;

import java.nio.file.Path;
import java.util.Map;
import org.rungs.models.ModelSpec;
import org.rungs.models.survey.SurveySpec;
import org.rungs.sampler.SamplerSettings;

/**
 * Everything a fit from a file needs.
 *
 * @param file      the survey file
 * @param survey    which columns mean what
 * @param model     the model and its priors
 * @param settings  chains, iterations, seed, threads
 * @param out       the output folder
 * @param overwrite whether files of an earlier run in {@code out} may be replaced
 * @param options   the options as the user gave them, recorded verbatim in {@code run.json}
 * @param crossValidate whether to write the leave-one-out cross-validation ({@code cross_validation.csv})
 */
public record FitRequest(Path file, SurveySpec survey, ModelSpec model, SamplerSettings settings, Path out,
                         boolean overwrite, Map<String, Object> options, boolean crossValidate) {
    /** A fit without cross-validation. */
    public FitRequest(Path file, SurveySpec survey, ModelSpec model, SamplerSettings settings, Path out,
                      boolean overwrite, Map<String, Object> options) {
        this(file, survey, model, settings, out, overwrite, options, false);
    }
}
