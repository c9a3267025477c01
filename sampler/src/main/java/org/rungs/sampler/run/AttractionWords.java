package org.rungs.sampler.run;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.rungs.sampler.derived.AttractionProfile;

/**
 * The console's words on number attraction (MODEL.md 4b, 6): per group, the numbers chosen
 * credibly more or less often than the latent level implies, then the attraction terms the data
 * hardly inform.
 */
final class AttractionWords {
    /** P(a > 0) above this, or below 1 minus it, makes a number credibly liked or avoided. */
    static final double CREDIBLE = 0.95;
    /** Posterior sd above this share of the prior sd: the data hardly narrowed the prior (common practice, no source). */
    static final double WEAK = 0.8;
    /** Groups named in the line on weak terms before the rest are counted. */
    private static final int LISTED_GROUPS = 6;

    private AttractionWords() {
    }

    /**
     * @param rows        the attraction profile (common rows and, with several groups, group rows)
     * @param groupLabels the survey's group labels; with one group its common rows are shown under its label
     */
    static String format(List<AttractionProfile.Row> rows, List<String> groupLabels) {
        boolean single = groupLabels.size() == 1;
        StringBuilder sb = new StringBuilder();
        sb.append(String.format(Locale.ROOT, "Numbers liked or avoided (P(a > 0) above %.2f or below %.2f; "
                + "1x = as often as the latent level implies):%n", CREDIBLE, 1 - CREDIBLE));
        for (String label : groupLabels) {
            List<String> said = new ArrayList<>();
            for (AttractionProfile.Row r : rows) {
                if (single ? r.common() : !r.common() && r.group().equals(label)) {
                    if (r.pPositive() > CREDIBLE) {
                        said.add(String.format(Locale.ROOT, "%d is chosen %sx as often as expected (90%% interval %sx to %sx)",
                                r.rating(), times(r.expMean()), times(r.expQ5()), times(r.expQ95())));
                    } else if (r.pPositive() < 1 - CREDIBLE) {
                        said.add(String.format(Locale.ROOT, "%d is avoided: chosen %sx as often (%sx to %sx)",
                                r.rating(), times(r.expMean()), times(r.expQ5()), times(r.expQ95())));
                    }
                }
            }
            sb.append("  ").append(Printable.of(label)).append(": ")
                    .append(said.isEmpty() ? "no number credibly liked or avoided" : String.join("; ", said))
                    .append(System.lineSeparator());
        }
        sb.append(weak(rows, single)).append(System.lineSeparator());
        return sb.toString();
    }

    /** One line naming the terms whose sd ratio exceeds {@value #WEAK}, by group (common terms first). */
    private static String weak(List<AttractionProfile.Row> rows, boolean single) {
        Map<String, List<String>> byGroup = new LinkedHashMap<>();
        int count = 0;
        for (AttractionProfile.Row r : rows) {
            if (r.sdRatio() > WEAK) {
                String where = single ? "" : r.common() ? "common terms" : Printable.of(r.group());
                byGroup.computeIfAbsent(where, g -> new ArrayList<>()).add(Integer.toString(r.rating()));
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
                + rows.size() + " attraction terms: " + String.join("; ", parts) + ".";
    }

    /** A multiplier with one decimal, or two significant digits below 0.1. */
    static String times(double v) {
        return String.format(Locale.ROOT, v >= 0.095 ? "%.1f" : "%.2g", v);
    }
}
