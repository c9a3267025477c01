package org.rungs.models;

import org.rungs.models.survey.Scale;
import org.rungs.priors.Priors;

/**
 * What is fitted: the threshold mode, the response-style classes (MODEL.md 4), the number
 * attraction (MODEL.md 4b) and the priors.
 */
public record ModelSpec(ThresholdMode thresholdMode, Priors priors, StyleClasses styleClasses, NumberAttraction attraction) {

    /** The plain hierarchical ordered probit (style classes and attraction off). */
    public ModelSpec(ThresholdMode thresholdMode, Priors priors) {
        this(thresholdMode, priors, StyleClasses.none());
    }

    /** Attraction off. */
    public ModelSpec(ThresholdMode thresholdMode, Priors priors, StyleClasses styleClasses) {
        this(thresholdMode, priors, styleClasses, NumberAttraction.none());
    }

    public static ModelSpec defaults() {
        return new ModelSpec(ThresholdMode.BY_GROUP, Priors.defaults());
    }

    /**
     * Checks the ratings the model names against the survey's scale (the coarse points and the
     * attraction set), so that a caller can refuse them before writing anything. Coarse points
     * that are every rating of the scale are refused: a coarse responder then reports the rating
     * a full-scale responder would (MODEL.md 4a's channel is the identity), so the coarse share is
     * not identified by the data (its posterior is its prior).
     *
     * @throws IllegalArgumentException naming the first rating that is off the scale, given twice,
     *     or otherwise unusable, or saying that the coarse points cover the scale
     */
    public void checkRatings(Scale scale) {
        if (styleClasses.coarse()) {
            if (styleClasses.coarsePoints() == null && scale.categories() < 3) {
                throw new IllegalArgumentException("the default coarse points (the two ends and the middle of the scale)"
                        + " need a scale of at least 3 points, and " + scale + " has " + scale.categories() + "; switch"
                        + " the coarse class off with --style-classes none (on a scale of 2 points, coarse points given"
                        + " with --coarse-points would be the whole scale, where the coarse share cannot be identified)");
            }
            int[] points = RoundingChannel.of(scale, styleClasses.points(scale)).points();
            if (points.length == scale.categories()) {
                throw new IllegalArgumentException("the coarse points " + (styleClasses.coarsePoints() == null
                        ? "(by default the two ends and the middle) " : "") + "are every rating of the scale " + scale
                        + ": a coarse responder then gives the same answer as a full-scale responder, so the share of"
                        + " coarse responders cannot be identified; name fewer coarse points with --coarse-points, or"
                        + " switch the coarse class off with --style-classes none");
            }
        }
        attraction.resolve(scale, styleClasses);
    }

    /** The mode actually used for a survey: group deviations need at least two groups. */
    public ThresholdMode effectiveThresholdMode(int groupCount) {
        return groupCount > 1 ? thresholdMode : ThresholdMode.SHARED;
    }

    /** The same model with other style classes. */
    public ModelSpec withStyleClasses(StyleClasses classes) {
        return new ModelSpec(thresholdMode, priors, classes, attraction);
    }

    /** The same model with another number attraction. */
    public ModelSpec withAttraction(NumberAttraction numbers) {
        return new ModelSpec(thresholdMode, priors, styleClasses, numbers);
    }

    /** The same model with other priors. */
    public ModelSpec withPriors(Priors other) {
        return new ModelSpec(thresholdMode, other, styleClasses, attraction);
    }
}
