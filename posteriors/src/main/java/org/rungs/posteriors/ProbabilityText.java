package org.rungs.posteriors;

import java.util.Locale;

/**
 * A probability as text that never shows an uncertain one as certain (our rule): one that rounds
 * to 1 or 0 at the given decimals reads "&gt; 0.99" or "&lt; 0.01", and a share of posterior
 * draws of exactly 1 or 0 reads "all draws" or "no draw", since a larger sample of draws could
 * hold one on the other side.
 */
public final class ProbabilityText {
    /** A share of draws of exactly 1: every draw, which is not certainty. */
    public static final String ALL_DRAWS = "all draws";
    /** A share of draws of exactly 0. */
    public static final String NO_DRAW = "no draw";

    private ProbabilityText() {
    }

    /**
     * A computed probability (a chance from a formula) with {@code decimals} decimals; values
     * that round to 1 or 0, 1 and 0 themselves included, as "&gt; 1 - 10^-decimals" or "&lt;
     * 10^-decimals"; a value that is not finite as Java writes it.
     */
    public static String of(double p, int decimals) {
        if (!Double.isFinite(p)) {
            return Double.toString(p);
        }
        String fixed = "%." + decimals + "f";
        String text = String.format(Locale.ROOT, fixed, p);
        // the rounded text decides, so that no value the formatter would show as 1 or 0 slips through
        double shown = Double.parseDouble(text);
        if (shown >= 1) {
            return "> " + String.format(Locale.ROOT, fixed, 1 - Math.pow(10, -decimals));
        }
        if (shown <= 0) {
            return "< " + String.format(Locale.ROOT, fixed, Math.pow(10, -decimals));
        }
        return text;
    }

    /** A share of posterior draws: as {@link #of}, except that exactly 1 or 0 reads {@value #ALL_DRAWS} or {@value #NO_DRAW}. */
    public static String ofDraws(double share, int decimals) {
        if (share == 1) {
            return ALL_DRAWS;
        }
        if (share == 0) {
            return NO_DRAW;
        }
        return of(share, decimals);
    }
}
