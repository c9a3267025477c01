package org.rungs.models;

import static org.junit.jupiter.api.Assertions.assertDoesNotThrow;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;
import org.rungs.models.survey.Scale;

/**
 * The checks of the ratings a model names against the scale: coarse points that are every rating
 * of the scale leave the coarse share unidentified (MODEL.md 4a: every intended rating is then its
 * own nearest coarse point, so a coarse responder answers as a full-scale responder), and the
 * default points need three distinct ratings.
 */
class ModelSpecTest {
    private static ModelSpec coarse(int... points) {
        return ModelSpec.defaults().withStyleClasses(StyleClasses.coarse(points.length == 0 ? null : points));
    }

    private static void assertRefused(ModelSpec model, Scale scale, String... parts) {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> model.checkRatings(scale));
        for (String part : parts) {
            assertTrue(e.getMessage().contains(part), () -> "expected '" + part + "' in: " + e.getMessage());
        }
    }

    @Test
    void theDefaultCoarsePointsNeedAScaleOfThreePoints() {
        assertRefused(coarse(), new Scale(0, 1), "the default coarse points (the two ends and the middle of the scale)"
                + " need a scale of at least 3 points, and 0..1 has 2", "--style-classes none", "--coarse-points");
    }

    @Test
    void coarsePointsThatAreTheWholeScaleAreRefused() {
        assertRefused(coarse(), new Scale(0, 2), "the coarse points (by default the two ends and the middle) are every"
                + " rating of the scale 0..2", "cannot be identified", "--coarse-points", "--style-classes none");
        assertRefused(coarse(0, 1), new Scale(0, 1), "the coarse points are every rating of the scale 0..1");
        assertRefused(coarse(3, 1, 2), new Scale(1, 3), "every rating of the scale 1..3");
    }

    @Test
    void coarsePointsThatLeaveOutARatingAndModelsWithoutTheCoarseClassPass() {
        assertDoesNotThrow(() -> coarse().checkRatings(new Scale(0, 3)));
        assertDoesNotThrow(() -> coarse(0, 2).checkRatings(new Scale(0, 2)));
        assertDoesNotThrow(() -> ModelSpec.defaults().checkRatings(new Scale(0, 1)));
        assertDoesNotThrow(() -> ModelSpec.defaults().checkRatings(new Scale(0, 2)));
    }
}
