package org.rungs.validation.recovery;

import java.util.Arrays;
import java.util.List;
import java.util.Set;
import org.rungs.examples.Scenario;
import org.rungs.examples.SimulatedSurvey;
import org.rungs.models.survey.Covariates;
import org.rungs.models.survey.Scale;
import org.rungs.models.survey.Survey;

/**
 * A simulated survey handed to the engine in memory, as its file would be read: raw level and
 * style covariates (the engine standardises them), categorical style columns against the
 * reference level the simulator's true values are named by, so draw names and truth names agree.
 */
final class EngineSurvey {
    private EngineSurvey() {
    }

    static Survey of(SimulatedSurvey data) {
        Scenario.Scale scale = data.scenario().scale();
        int[] rating = data.rating();
        byte[] category = new byte[rating.length];
        for (int i = 0; i < rating.length; i++) {
            category[i] = (byte) (rating[i] - scale.lowest());
        }
        Covariates.Builder level = Covariates.builder();
        for (String name : data.covariateNames()) {
            level.numeric(name, data.covariate(name));
        }
        Covariates.Builder style = Covariates.builder();
        if (data.scenario().styleClasses() instanceof Scenario.StyleClasses.Coarse coarse) {
            for (Scenario.StyleCovariate covariate : coarse.covariates()) {
                if (covariate instanceof Scenario.StyleCovariate.Categorical categorical) {
                    String[] labels = data.category(categorical.name());
                    // only the levels drawn: the engine needs every level it is given to occur
                    Set<String> drawn = Set.copyOf(Arrays.asList(labels));
                    List<String> levels = categorical.categories().stream().map(Scenario.StyleCovariate.Category::label)
                            .filter(drawn::contains).toList();
                    int[] codes = new int[labels.length];
                    for (int i = 0; i < labels.length; i++) {
                        codes[i] = levels.indexOf(labels[i]);
                    }
                    style.categorical(categorical.name(), codes, levels, data.referenceLevels().get(categorical.name()));
                } else {
                    style.numeric(covariate.name(), data.covariate(covariate.name()));
                }
            }
        }
        return Survey.of(new Scale(scale.lowest(), scale.highest()), category, data.group(), data.groupLabels(),
                level.build(), style.build(), null);
    }
}
