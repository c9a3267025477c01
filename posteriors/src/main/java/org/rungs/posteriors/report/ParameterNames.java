package org.rungs.posteriors.report;

import java.util.Map;

/**
 * What a parameter's name in summary.csv and draws.csv means, by its family, in plain words (the
 * README's table of parameter names), so that the report can be read without it. Group labels
 * may hold dots, so a name is read from its ends: {@code threshold.St. Ives.3} is a group's.
 */
final class ParameterNames {
    /** A family of names: its pattern as shown, and what it is. */
    record Family(String pattern, String meaning) {
    }

    private static final Map<String, Family> SINGLE = Map.of(
            "group_mean", new Family("group_mean", "mean of the group levels"),
            "group_sd", new Family("group_sd", "spread of the group levels"),
            "threshold_sd", new Family("threshold_sd", "spread of the groups' thresholds around the common ones"),
            "style_mean", new Family("style_mean", "mean of the groups' intercepts of the probit of being a coarse responder"),
            "style_sd", new Family("style_sd", "spread of the groups' intercepts of the probit of being a coarse responder"),
            "attraction_sd", new Family("attraction_sd", "spread of the groups' attractions around the common ones"));

    private ParameterNames() {
    }

    /** The family of a parameter's name, or null for a name outside the model's families. */
    static Family of(String name) {
        Family single = SINGLE.get(name);
        if (single != null) {
            return single;
        }
        if (name.startsWith("level.")) {
            return name.endsWith(".per_unit")
                    ? new Family("level.<covariate>.per_unit", "effect of a covariate on the latent level per unit of its column")
                    : new Family("level.<covariate>", "effect of a covariate on the latent level, per standard deviation "
                            + "of a numeric column or per 0/1 indicator");
        }
        if (name.startsWith("group.")) {
            return new Family("group.<group>", "a group's latent level at the covariates' means");
        }
        if (name.startsWith("threshold.")) {
            return isInteger(name.substring("threshold.".length()))
                    ? new Family("threshold.<k>", "common threshold: the latent value above which the answer is at least k")
                    : new Family("threshold.<group>.<k>", "a group's threshold above which its answer is at least k");
        }
        if (name.startsWith("style_group.")) {
            return new Family("style_group.<group>", "a group's intercept of the probit of being a coarse responder");
        }
        if (name.startsWith("style.")) {
            return new Family("style.<covariate>", "effect of a covariate on the probit of being a coarse responder");
        }
        if (name.startsWith("attraction.")) {
            return isInteger(name.substring("attraction.".length()))
                    ? new Family("attraction.<j>", "common attraction a of number j (log of the odds multiplier exp(a))")
                    : new Family("attraction.<group>.<j>", "a group's attraction a of number j (log of the odds multiplier exp(a))");
        }
        return null;
    }

    /**
     * What a prior in run.json's {@code model.priors} is the prior of, by its key (the names of
     * {@code --prior}, Priors in the priors module), or null for another key. Most keys name a
     * parameter; the rest name the parameters of a family, each of which has that prior.
     */
    static String ofPrior(String key) {
        return switch (key) {
            case "level" -> "each " + of("level.x").meaning();
            case "style" -> "each " + of("style.x").meaning();
            case "attraction_mean" -> "each " + of("attraction.1").meaning();
            // MODEL.md 3: c = b - mean(b), so the prior is on b and the thresholds are b less its mean
            case "threshold" -> "each common threshold before the thresholds are shifted to average 0 "
                    + "(the mean threshold is the latent scale's origin)";
            default -> SINGLE.containsKey(key) ? SINGLE.get(key).meaning() : null;
        };
    }

    private static boolean isInteger(String text) {
        return text.matches("-?\\d+");
    }
}
