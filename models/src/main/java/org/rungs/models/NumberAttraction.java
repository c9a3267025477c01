package org.rungs.models;

import java.util.Arrays;
import java.util.stream.IntStream;
import org.rungs.models.survey.Scale;

/**
 * The number attraction of MODEL.md 4b: off ({@code none}), or on for a set A of ratings; a null
 * set means the default, every number of the scale but the coarse points, which act as the
 * reference.
 */
public record NumberAttraction(boolean on, int[] numbers) {

    public static NumberAttraction none() {
        return new NumberAttraction(false, null);
    }

    /** Every number of the scale but the coarse points. */
    public static NumberAttraction besidesCoarsePoints() {
        return new NumberAttraction(true, null);
    }

    /** The named ratings. */
    public static NumberAttraction of(int... numbers) {
        return new NumberAttraction(true, numbers.clone());
    }

    /**
     * Parses the command-line form: {@code none}, {@code default} (every number but the coarse
     * points) or a comma-separated list of ratings such as {@code 3,7}.
     *
     * @throws IllegalArgumentException naming the expected forms
     */
    public static NumberAttraction parse(String text) {
        String t = text.trim();
        if (t.equals("none")) {
            return none();
        }
        if (t.equals("default")) {
            return besidesCoarsePoints();
        }
        try {
            return of(Arrays.stream(t.split(",")).map(String::trim).mapToInt(Integer::parseInt).toArray());
        } catch (NumberFormatException e) {
            throw new IllegalArgumentException("attraction must be 'none', 'default' (every number but the coarse points)"
                    + " or ratings separated by commas such as 3,7; got '" + text + "'");
        }
    }

    /**
     * The attraction set A as ratings in increasing order (empty when off): the named numbers, or
     * every number but the coarse points the style classes use (the default points {L, mid, U}
     * when the classes are off or name none); empty, so attraction is off, when a scale has no
     * other number.
     *
     * @throws IllegalArgumentException if a named number is off the scale, named twice, or the set
     *     is empty
     */
    public int[] resolve(Scale scale, StyleClasses classes) {
        if (!on) {
            return new int[0];
        }
        int[] set;
        if (numbers == null) {
            int[] points = classes.points(scale);
            set = IntStream.rangeClosed(scale.lowest(), scale.highest())
                    .filter(r -> Arrays.stream(points).noneMatch(p -> p == r)).toArray();
        } else {
            set = numbers.clone();
            Arrays.sort(set);
            for (int i = 0; i < set.length; i++) {
                if (set[i] < scale.lowest() || set[i] > scale.highest()) {
                    throw new IllegalArgumentException("attraction number " + set[i] + " is not on the scale "
                            + scale.lowest() + ".." + scale.highest() + "; --attraction expects none, default or"
                            + " ratings of the scale, e.g. 3,7");
                }
                if (i > 0 && set[i] == set[i - 1]) {
                    throw new IllegalArgumentException("attraction number " + set[i] + " is named twice");
                }
            }
        }
        if (set.length == 0 && numbers != null) {
            throw new IllegalArgumentException("the attraction set is empty; use 'none' to switch attraction off");
        }
        if (set.length == scale.categories()) {
            throw new IllegalArgumentException("every number of the scale is in the attraction set; leave at least one out"
                    + " as the reference (attraction is only identified relative to the numbers outside the set)");
        }
        return set;
    }

    /** "none", "every number but the coarse points", or the named numbers. */
    public String label() {
        return !on ? "none" : numbers == null ? "every number but the coarse points" : Arrays.toString(numbers);
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof NumberAttraction && ((NumberAttraction) o).on == on
                && Arrays.equals(((NumberAttraction) o).numbers, numbers);
    }

    @Override
    public int hashCode() {
        return Boolean.hashCode(on) * 31 + Arrays.hashCode(numbers);
    }

    @Override
    public String toString() {
        return label();
    }
}
