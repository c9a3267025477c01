package org.rungs.models;

import org.rungs.priors.Priors;

/**
 * What is fitted: the threshold mode and the priors. The response-style class and number
 * attraction (MODEL.md 4) are off in this model.
 */
public record ModelSpec(ThresholdMode thresholdMode, Priors priors) {

    public static ModelSpec defaults() {
        return new ModelSpec(ThresholdMode.BY_GROUP, Priors.defaults());
    }

    /** The mode actually used for a survey: group deviations need at least two groups. */
    public ThresholdMode effectiveThresholdMode(int groupCount) {
        return groupCount > 1 ? thresholdMode : ThresholdMode.SHARED;
    }
}
