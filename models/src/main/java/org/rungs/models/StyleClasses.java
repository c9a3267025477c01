package org.rungs.models;

import java.util.Arrays;
import org.rungs.models.survey.Scale;

/**
 * The response-style classes of MODEL.md 4: off ({@code none}), or a coarse class whose members
 * report the nearest of the coarse points (ratings; null means the default {L, mid, U}).
 */
public record StyleClasses(boolean coarse, int[] coarsePoints) {

    public static StyleClasses none() {
        return new StyleClasses(false, null);
    }

    public static StyleClasses coarse(int[] coarsePoints) {
        return new StyleClasses(true, coarsePoints == null ? null : coarsePoints.clone());
    }

    /** The coarse points on {@code scale}: the given ones, or the default {L, mid, U}. */
    public int[] points(Scale scale) {
        return coarsePoints != null ? coarsePoints : RoundingChannel.defaultPoints(scale);
    }

    /** "none", or "coarse" with its points. */
    public String label() {
        return coarse ? "coarse" + (coarsePoints == null ? " (default points)" : " " + Arrays.toString(coarsePoints)) : "none";
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof StyleClasses && ((StyleClasses) o).coarse == coarse
                && Arrays.equals(((StyleClasses) o).coarsePoints, coarsePoints);
    }

    @Override
    public int hashCode() {
        return Boolean.hashCode(coarse) * 31 + Arrays.hashCode(coarsePoints);
    }

    @Override
    public String toString() {
        return label();
    }
}
