package org.rungs.models;

import java.util.Arrays;
import org.rungs.models.survey.Scale;

/**
 * The coarse responders' rounding channel R(j|k) of MODEL.md 4a: an intended rating k is
 * reported as the nearest coarse point, a k equally near two points going to each with
 * probability 1/2. Positions are 0-based (rating - lowest). For a coarse point j the categories
 * that round to it form one run {@code fullLow(j)..fullHigh(j)} of weight 1, with possibly one
 * tie category of weight 1/2 just below and one just above.
 */
public final class RoundingChannel {
    private final int categories;
    private final int[] points;
    private final boolean[] isPoint;
    private final int[] fullLow;
    private final int[] fullHigh;
    private final boolean[] tieBelow;
    private final boolean[] tieAbove;

    private RoundingChannel(Scale scale, int[] pointRatings) {
        categories = scale.categories();
        int[] sorted = pointRatings.clone();
        Arrays.sort(sorted);
        points = new int[sorted.length];
        isPoint = new boolean[categories];
        for (int p = 0; p < sorted.length; p++) {
            if (!scale.contains(sorted[p])) {
                throw new IllegalArgumentException("coarse point " + sorted[p] + " is not on the scale " + scale
                        + "; --coarse-points expects ratings of the scale, e.g. its two ends and its middle");
            }
            if (p > 0 && sorted[p] == sorted[p - 1]) {
                throw new IllegalArgumentException("coarse point " + sorted[p] + " is given twice");
            }
            points[p] = scale.position(sorted[p]);
            isPoint[points[p]] = true;
        }
        if (points.length < 2) {
            throw new IllegalArgumentException("at least two coarse points are needed (a coarse responder reports the"
                    + " nearest of them), got only " + (points.length == 0 ? "none" : Integer.toString(sorted[0]))
                    + "; name two or more with --coarse-points, or switch the class off with --style-classes none");
        }
        fullLow = new int[categories];
        fullHigh = new int[categories];
        tieBelow = new boolean[categories];
        tieAbove = new boolean[categories];
        for (int p = 0; p < points.length; p++) {
            int j = points[p];
            int low = 0;
            if (p > 0) {
                int gap = j - points[p - 1];
                low = points[p - 1] + gap / 2 + 1;
                tieBelow[j] = gap % 2 == 0;
            }
            int high = categories - 1;
            if (p + 1 < points.length) {
                int gap = points[p + 1] - j;
                high = j + (gap - 1) / 2;
                tieAbove[j] = gap % 2 == 0;
            }
            fullLow[j] = low;
            fullHigh[j] = high;
        }
    }

    /** The channel for the given coarse points, as ratings on the scale. */
    public static RoundingChannel of(Scale scale, int[] pointRatings) {
        return new RoundingChannel(scale, pointRatings);
    }

    /** The default coarse points {L, floor((L+U)/2), U} of MODEL.md 4a. */
    public static int[] defaultPoints(Scale scale) {
        return new int[] {scale.lowest(), Math.floorDiv(scale.lowest() + scale.highest(), 2), scale.highest()};
    }

    public boolean isPoint(int position) {
        return isPoint[position];
    }

    /** Positions of the coarse points, increasing. */
    public int[] points() {
        return points.clone();
    }

    public int fullLow(int point) {
        return fullLow[point];
    }

    public int fullHigh(int point) {
        return fullHigh[point];
    }

    public boolean tieBelow(int point) {
        return tieBelow[point];
    }

    public boolean tieAbove(int point) {
        return tieAbove[point];
    }

    /** R(j|k): the probability that intended position k is reported as position j. */
    public double probability(int j, int k) {
        if (!isPoint[j]) {
            return 0;
        }
        if (k >= fullLow[j] && k <= fullHigh[j]) {
            return 1;
        }
        if ((tieBelow[j] && k == fullLow[j] - 1) || (tieAbove[j] && k == fullHigh[j] + 1)) {
            return 0.5;
        }
        return 0;
    }

    /**
     * Whether threshold {@code t} (1..M-1, the boundary below position t) enters
     * P(r = j | coarse): the outer boundaries of the run and of its ties.
     */
    public boolean dependsOn(int j, int t) {
        if (!isPoint[j]) {
            return false;
        }
        return t == fullLow[j] || t == fullHigh[j] + 1
                || (tieBelow[j] && t == fullLow[j] - 1) || (tieAbove[j] && t == fullHigh[j] + 2);
    }
}
