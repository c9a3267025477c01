package org.rungs.posteriors.report;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;

/** The model's settings from run.json, and what the correction assumes, in plain sentences. */
final class ModelWords {
    private ModelWords() {
    }

    static List<String> describe(FitFolder fit) {
        List<String> sentences = new ArrayList<>();
        sentences.add("Each rating is read as a latent level (how satisfied a respondent is) cut into the "
                + fit.text("input.scale", "") + " scale points by thresholds (an ordered probit).");
        String thresholds = fit.text("model.thresholds", "");
        if (thresholds.startsWith("by-group")) {
            sentences.add("Each group uses the scale in its own way: it has its own thresholds, drawn around common thresholds.");
        } else if (!thresholds.isEmpty()) {
            sentences.add("All groups share one set of thresholds (" + thresholds + ").");
        }
        String style = fit.text("model.style_classes", "none");
        if (style.contains("coarse")) {
            sentences.add("Some respondents are coarse responders who round their answer to a few points; the model estimates "
                    + "who they probably are and their share (" + style + ").");
        } else {
            sentences.add("No coarse-responder class: every respondent is taken to use the full scale.");
        }
        String attraction = fit.text("model.attraction", "none");
        if (attraction.equals("none") || attraction.equals("off")) {
            sentences.add("Number attraction is off: no number is taken to be liked or avoided for itself.");
        } else {
            sentences.add("Number attraction is on (" + attraction + "): some numbers may be chosen more or less often than "
                    + "the latent level implies.");
        }
        Map<String, Object> covariates = fit.map("model.level_covariates");
        if (covariates.isEmpty()) {
            sentences.add("No covariates of the level: groups differ only by their group effects.");
        } else {
            List<String> names = new ArrayList<>();
            for (Map.Entry<String, Object> entry : covariates.entrySet()) {
                String kind = entry.getValue() instanceof Map<?, ?> m && m.get("kind") != null ? " (" + m.get("kind") + ")" : "";
                names.add(entry.getKey() + kind);
            }
            sentences.add("The latent level depends on the group and on " + String.join(", ", names) + ".");
        }
        return sentences;
    }

    static List<String> cautions(FitFolder fit) {
        List<String> sentences = new ArrayList<>();
        sentences.add("Every figure here is an estimate from a sample of respondents and from a finite number of posterior draws; "
                + "the 90% intervals show the uncertainty, and two groups whose intervals overlap may not differ.");
        sentences.add("The correction assumes that the model describes how people answer: a latent level cut by thresholds, "
                + "normal noise, and the response styles that are switched on. Patterns the model does not include "
                + "(for example acquiescence, or misreading the scale) are not corrected.");
        sentences.add("Intended means rest on how each group uses the scale being learnt from the data; groups with few "
                + "respondents borrow strength from the others and are pulled towards the average.");
        if (fit.text("model.style_classes", "none").contains("coarse")) {
            sentences.add("The coarse-responder class assumes that rounders pick the nearest coarse point to their latent answer; "
                    + "a respondent who truly means 5 and one who rounds to 5 cannot be told apart individually, only in share.");
        }
        if (fit.coefficients() != null) {
            sentences.add("Covariate effects are associations adjusted for the listed covariates and groups, not causal effects.");
        }
        sentences.add("Harmonised figures compare groups as if all used the scale in one common way; they answer a "
                + "\"what if\" question and are not what anyone reported.");
        if (!ConvergenceSection.verdict(fit).converged()) {
            sentences.add("This fit did not pass the convergence checks, so none of the figures above should be relied on yet.");
        }
        return sentences;
    }
}
