package org.rungs.models.survey;

/**
 * A rating scale of consecutive integers {@code lowest..highest} (MODEL.md section 1: {@code L..U},
 * {@code M = U - L + 1} categories). A rating is stored as its position {@code rating - lowest},
 * which fits a byte because a scale has at most {@value #MAX_CATEGORIES} categories.
 */
public record Scale(int lowest, int highest) {

    /** Largest number of categories: positions 0..126 fit a signed byte. */
    public static final int MAX_CATEGORIES = 127;

    public Scale {
        if (lowest >= highest) {
            throw new IllegalArgumentException("a scale needs lowest < highest, got " + lowest + ".." + highest);
        }
        long categories = (long) highest - lowest + 1;
        if (categories > MAX_CATEGORIES) {
            throw new IllegalArgumentException("the scale " + lowest + ".." + highest + " has " + categories
                    + " categories; at most " + MAX_CATEGORIES + " are supported");
        }
    }

    /** Number of categories {@code M}. */
    public int categories() {
        return highest - lowest + 1;
    }

    /** Whether {@code rating} is one of the scale's numbers. */
    public boolean contains(int rating) {
        return rating >= lowest && rating <= highest;
    }

    /** Position of a rating, 0..M-1. */
    public int position(int rating) {
        if (!contains(rating)) {
            throw new IllegalArgumentException("rating " + rating + " is outside the scale " + this);
        }
        return rating - lowest;
    }

    /** Rating at a position 0..M-1. */
    public int rating(int position) {
        if (position < 0 || position >= categories()) {
            throw new IllegalArgumentException("position " + position + " is outside 0.." + (categories() - 1)
                    + " for the scale " + this);
        }
        return lowest + position;
    }

    /**
     * Reads {@code "LOWEST..HIGHEST"}, e.g. {@code "0..10"}, {@code "1..7"}, {@code "-3..3"}; spaces
     * around the numbers are allowed.
     */
    public static Scale parse(String text) {
        if (text == null) {
            throw new IllegalArgumentException("no scale given; expected LOWEST..HIGHEST, e.g. 0..10 or 1..7");
        }
        int dots = text.indexOf("..");
        if (dots < 0) {
            throw notAScale(text, "it has no \"..\"");
        }
        int lowest = parseBound(text, text.substring(0, dots));
        int highest = parseBound(text, text.substring(dots + 2));
        if (lowest >= highest) {
            throw notAScale(text, "the lowest rating must be below the highest");
        }
        if ((long) highest - lowest + 1 > MAX_CATEGORIES) {
            throw notAScale(text, "it has more than " + MAX_CATEGORIES + " categories");
        }
        return new Scale(lowest, highest);
    }

    private static int parseBound(String whole, String bound) {
        String b = bound.strip();
        int start = b.startsWith("-") || b.startsWith("+") ? 1 : 0;
        if (b.length() == start || b.length() - start > 9) {
            throw notAScale(whole, "\"" + b + "\" is not an integer");
        }
        for (int i = start; i < b.length(); i++) {
            if (b.charAt(i) < '0' || b.charAt(i) > '9') {
                throw notAScale(whole, "\"" + b + "\" is not an integer");
            }
        }
        return Integer.parseInt(b);
    }

    private static IllegalArgumentException notAScale(String text, String why) {
        return new IllegalArgumentException("\"" + text + "\" is not a rating scale (" + why
                + "); expected LOWEST..HIGHEST with integers, e.g. 0..10, 1..7 or 0..100");
    }

    /** {@code "lowest..highest"}, the form {@link #parse} reads. */
    @Override
    public String toString() {
        return lowest + ".." + highest;
    }
}
