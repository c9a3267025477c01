package org.rungs.priors;

import java.util.Locale;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * The priors of every model parameter, on the internal (standardised-covariate) scale.
 * Defaults are those of MODEL.md section 5; each can be replaced by name with {@link #with}.
 *
 * @param level          each level coefficient {@code beta}
 * @param groupMean      {@code mu_alpha}, the average group's level
 * @param groupSd        {@code tau_alpha}, spread of the group levels
 * @param threshold      each {@code b[k]}; the common thresholds are {@code c = b - mean(b)}
 * @param thresholdSd    {@code tau_d}, spread of the group threshold deviations
 * @param style          each style coefficient {@code delta}
 * @param styleMean      {@code mu_gamma}, the average group's coarse-class probit intercept
 * @param styleSd        {@code tau_gamma}, its spread across groups
 * @param attractionMean each common attraction {@code abar[j]}
 * @param attractionSd   {@code tau_a}, spread of the group attraction deviations
 */
public record Priors(
        Normal level,
        Normal groupMean,
        HalfNormal groupSd,
        Normal threshold,
        HalfNormal thresholdSd,
        Normal style,
        Normal styleMean,
        HalfNormal styleSd,
        Normal attractionMean,
        HalfNormal attractionSd) {

    /** The names accepted by {@link #with}, in the order of the record components. */
    public static final String NAMES =
            "level, group_mean, group_sd, threshold, threshold_sd, style, style_mean, style_sd, attraction_mean, attraction_sd";

    /*
     * Our rule, after an audit in which threshold_sd=half-normal(1e-155) and
     * group_mean=normal(1e200,1) hung the sampler (the prior's density underflows or overflows, so
     * no proposal is ever accepted) while 1e-6..1e6 and means up to 100 fitted: the latent scale's
     * unit is the respondent noise (sd 1), so such priors say nothing a sensible one cannot.
     */
    private static final double MIN_SD = 1e-6;
    private static final double MAX_SD = 1e6;
    private static final double MAX_MEAN = 100;
    private static final String RANGE_REASON = " (the latent scale's unit is the respondents' noise, sd 1; beyond it"
            + " the sampler's arithmetic fails)";

    private static final Pattern NORMAL = Pattern.compile("normal\\(\\s*([^,\\s]+)\\s*,\\s*([^)\\s]+)\\s*\\)");
    private static final Pattern HALF_NORMAL = Pattern.compile("half-normal\\(\\s*(?:0\\s*,\\s*)?([^)\\s]+)\\s*\\)");

    public Priors {
        if (threshold.mean() != 0) {
            throw new IllegalArgumentException("the threshold prior must have mean 0 (a common shift of b cancels in c = b - mean(b)), got " + threshold);
        }
    }

    /** MODEL.md section 5. */
    public static Priors defaults() {
        return new Priors(
                new Normal(0, 1),
                new Normal(0, 2),
                new HalfNormal(1),
                new Normal(0, 3),
                new HalfNormal(0.5),
                new Normal(0, 1),
                new Normal(-1, 1),
                new HalfNormal(1),
                new Normal(0, 0.5),
                new HalfNormal(0.3));
    }

    /**
     * Returns a copy with one prior replaced, from text such as {@code level=normal(0,2.5)} or
     * {@code group_sd=half-normal(0.5)}.
     *
     * @throws IllegalArgumentException with a message naming what was expected
     */
    public Priors with(String assignment) {
        int eq = assignment.indexOf('=');
        if (eq < 0) {
            throw new IllegalArgumentException("a prior is written NAME=normal(MEAN,SD) or NAME=half-normal(SD), got '" + assignment + "'");
        }
        String name = assignment.substring(0, eq).trim().toLowerCase(Locale.ROOT);
        String text = assignment.substring(eq + 1).trim().toLowerCase(Locale.ROOT);
        switch (name) {
            case "level": return new Priors(normal(name, text), groupMean, groupSd, threshold, thresholdSd, style, styleMean, styleSd, attractionMean, attractionSd);
            case "group_mean": return new Priors(level, normal(name, text), groupSd, threshold, thresholdSd, style, styleMean, styleSd, attractionMean, attractionSd);
            case "group_sd": return new Priors(level, groupMean, halfNormal(name, text), threshold, thresholdSd, style, styleMean, styleSd, attractionMean, attractionSd);
            case "threshold": return new Priors(level, groupMean, groupSd, normal(name, text), thresholdSd, style, styleMean, styleSd, attractionMean, attractionSd);
            case "threshold_sd": return new Priors(level, groupMean, groupSd, threshold, halfNormal(name, text), style, styleMean, styleSd, attractionMean, attractionSd);
            case "style": return new Priors(level, groupMean, groupSd, threshold, thresholdSd, normal(name, text), styleMean, styleSd, attractionMean, attractionSd);
            case "style_mean": return new Priors(level, groupMean, groupSd, threshold, thresholdSd, style, normal(name, text), styleSd, attractionMean, attractionSd);
            case "style_sd": return new Priors(level, groupMean, groupSd, threshold, thresholdSd, style, styleMean, halfNormal(name, text), attractionMean, attractionSd);
            case "attraction_mean": return new Priors(level, groupMean, groupSd, threshold, thresholdSd, style, styleMean, styleSd, normal(name, text), attractionSd);
            case "attraction_sd": return new Priors(level, groupMean, groupSd, threshold, thresholdSd, style, styleMean, styleSd, attractionMean, halfNormal(name, text));
            default:
                throw new IllegalArgumentException("unknown prior '" + name + "'; the priors are " + NAMES);
        }
    }

    private static Normal normal(String name, String text) {
        Matcher m = NORMAL.matcher(text);
        if (!m.matches()) {
            throw new IllegalArgumentException("prior " + name + " must be written normal(MEAN,SD), got '" + text + "'");
        }
        double mean = number(name, m.group(1));
        double sd = number(name, m.group(2));
        if (!(Math.abs(mean) <= MAX_MEAN)) {
            throw new IllegalArgumentException("prior " + name + ": the mean " + mean + " is outside -" + (int) MAX_MEAN
                    + ".." + (int) MAX_MEAN + "; expected a mean in that range" + RANGE_REASON);
        }
        return new Normal(mean, sd(name, sd));
    }

    private static HalfNormal halfNormal(String name, String text) {
        Matcher m = HALF_NORMAL.matcher(text);
        if (!m.matches()) {
            throw new IllegalArgumentException("prior " + name + " must be written half-normal(SD), got '" + text + "'");
        }
        return new HalfNormal(sd(name, number(name, m.group(1))));
    }

    private static double sd(String name, double sd) {
        if (!(sd >= MIN_SD && sd <= MAX_SD)) {
            throw new IllegalArgumentException("prior " + name + ": the sd " + sd + " is outside 1e-6..1e6; expected a"
                    + " positive sd in that range" + RANGE_REASON);
        }
        return sd;
    }

    private static double number(String name, String text) {
        try {
            return Double.parseDouble(text);
        } catch (NumberFormatException e) {
            throw new IllegalArgumentException("prior " + name + ": '" + text + "' is not a number", e);
        }
    }
}
