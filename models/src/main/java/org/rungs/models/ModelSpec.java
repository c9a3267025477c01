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
     * attraction set), so that a caller can refuse them before writing anything.
     *
     * @throws IllegalArgumentException naming the first rating that is off the scale, given twice,
     *     or otherwise unusable
     */
    public void checkRatings(Scale scale) {
        if (styleClasses.coarse()) {
            RoundingChannel.of(scale, styleClasses.points(scale));
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
