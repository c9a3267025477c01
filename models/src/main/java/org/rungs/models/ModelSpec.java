package org.rungs.models;

import org.rungs.priors.Priors;

/**
 * What is fitted: the threshold mode, the response-style classes (MODEL.md 4) and the priors.
 * Number attraction (MODEL.md 4b) is not yet part of the model.
 */
public record ModelSpec(ThresholdMode thresholdMode, Priors priors, StyleClasses styleClasses) {

    /** The plain hierarchical ordered probit (style classes off). */
    public ModelSpec(ThresholdMode thresholdMode, Priors priors) {
        this(thresholdMode, priors, StyleClasses.none());
    }

    public static ModelSpec defaults() {
        return new ModelSpec(ThresholdMode.BY_GROUP, Priors.defaults());
    }

    /** The mode actually used for a survey: group deviations need at least two groups. */
    public ThresholdMode effectiveThresholdMode(int groupCount) {
        return groupCount > 1 ? thresholdMode : ThresholdMode.SHARED;
    }

    /** The same model with other style classes. */
    public ModelSpec withStyleClasses(StyleClasses classes) {
        return new ModelSpec(thresholdMode, priors, classes);
    }
}
