package org.rungs.posteriors;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.function.UnaryOperator;

/**
 * The words on number attraction (MODEL.md 4b, 6) that the console and the report both say: per
 * group, the numbers chosen credibly more or less often than the latent level implies, then the
 * attraction terms the data hardly inform.
 */
public final class AttractionWords {
    /** P(a > 0) above this, or below 1 minus it, makes a number credibly liked or avoided. */
    public static final double CREDIBLE = 0.95;
    /** Posterior sd above this share of the prior sd: the data hardly narrowed the prior (common practice, no source). */
    public static final double WEAK = 0.8;
    /** attraction.csv's group label of the common terms abar[j]. */
    public static final String COMMON = "all";
    /** What a group with no credibly liked or avoided number is told. */
    public static final String NONE = "no number credibly liked or avoided";
    /** Groups named in the line on weak terms before the rest are counted. */
    private static final int LISTED_GROUPS = 6;

    /**
     * What the words read of one number's attraction in one group (a row of attraction.csv).
     *
     * @param group     the group's label ("all" for a common term in attraction.csv)
     * @param common    whether the term is the common abar[j] (a[j] with one group)
     * @param rating    the number j
     * @param expMean   posterior mean of exp(a), with its 90% interval {@code expQ5} to {@code expQ95}
     * @param pPositive share of the draws with a > 0
     * @param sdRatio   posterior sd of a over its prior sd
     */
    public record Term(String group, boolean common, int rating, double expMean, double expQ5, double expQ95,
            double pPositive, double sdRatio) {
    }

    private AttractionWords() {
    }

    /** The rule the words follow, as the heading of the per-group lines. */
    public static String rule() {
        return String.format(Locale.ROOT, "Numbers liked or avoided (P(a > 0) above %.2f or below %.2f; "
                + "1x = as often as the latent level implies):", CREDIBLE, 1 - CREDIBLE);
    }

    /**
     * The console's words: the rule, one line per group, the line on weak terms.
     *
     * @param terms       common terms and, with several groups, group terms
     * @param groupLabels the survey's group labels; with one group its common terms are shown under its label
     * @param shown       how a label is shown (made printable for a terminal)
     */
    public static String format(List<Term> terms, List<String> groupLabels, UnaryOperator<String> shown) {
        boolean single = groupLabels.size() == 1;
        StringBuilder sb = new StringBuilder(rule()).append(System.lineSeparator());
        for (String label : groupLabels) {
            List<String> said = credible(terms, label, single);
            sb.append("  ").append(shown.apply(label)).append(": ").append(said.isEmpty() ? NONE : String.join("; ", said))
                    .append(System.lineSeparator());
        }
        sb.append(weak(terms, single, shown)).append(System.lineSeparator());
        return sb.toString();
    }

    /**
     * One sentence per number of the group that is credibly liked (P(a > 0) above {@value #CREDIBLE})
     * or avoided (below 1 minus it), in the order of the terms.
     *
     * @param single one group: its words are those of the common terms
     */
    public static List<String> credible(List<Term> terms, String label, boolean single) {
        List<String> said = new ArrayList<>();
        for (Term t : terms) {
            if (single ? t.common() : !t.common() && t.group().equals(label)) {
                if (t.pPositive() > CREDIBLE) {
                    said.add(String.format(Locale.ROOT, "%d is chosen %sx as often as expected (90%% interval %sx to %sx)",
                            t.rating(), times(t.expMean()), times(t.expQ5()), times(t.expQ95())));
                } else if (t.pPositive() < 1 - CREDIBLE) {
                    said.add(String.format(Locale.ROOT, "%d is avoided: chosen %sx as often (%sx to %sx)",
                            t.rating(), times(t.expMean()), times(t.expQ5()), times(t.expQ95())));
                }
            }
        }
        return said;
    }

    /**
     * One line naming the terms whose sd ratio exceeds {@value #WEAK}, by group (common terms first).
     *
     * @param single one group: its numbers are named without a group
     * @param shown  how a label is shown
     */
    public static String weak(List<Term> terms, boolean single, UnaryOperator<String> shown) {
        Map<String, List<String>> byGroup = new LinkedHashMap<>();
        int count = 0;
        for (Term t : terms) {
            if (t.sdRatio() > WEAK) {
                String where = single ? "" : t.common() ? "common terms" : shown.apply(t.group());
                byGroup.computeIfAbsent(where, g -> new ArrayList<>()).add(Integer.toString(t.rating()));
                count++;
            }
        }
        String rule = String.format(Locale.ROOT, "posterior sd above %.1f x prior sd", WEAK);
        if (count == 0) {
            return "Every attraction term is informed by the data (" + rule + " for none).";
        }
        List<String> parts = new ArrayList<>();
        for (Map.Entry<String, List<String>> e : byGroup.entrySet()) {
            if (parts.size() == LISTED_GROUPS) {
                int more = byGroup.size() - LISTED_GROUPS;
                parts.add("and " + more + (more == 1 ? " more group" : " more groups"));
                break;
            }
            String numbers = String.join(", ", e.getValue());
            parts.add(single ? numbers : e.getKey() + " " + numbers);
        }
        return "Hardly identified by the data (" + rule + "; sd_ratio in attraction.csv): " + count + " of "
                + terms.size() + " attraction terms: " + String.join("; ", parts) + ".";
    }

    /** A multiplier with one decimal, or two significant digits below 0.1. */
    static String times(double v) {
        return String.format(Locale.ROOT, v >= 0.095 ? "%.1f" : "%.2g", v);
    }
}
