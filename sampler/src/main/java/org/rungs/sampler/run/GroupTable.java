package org.rungs.sampler.run;

import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.rungs.posteriors.ParameterSummary;
import org.rungs.sampler.derived.DerivedResult;

/** The console's per-group table: reported against intended mean, coarse share, rank change. */
final class GroupTable {
    private GroupTable() {
    }

    static String format(DerivedResult derived, List<ParameterSummary> summaries) {
        Map<String, ParameterSummary> by = new HashMap<>();
        for (ParameterSummary s : summaries) {
            by.put(s.name(), s);
        }
        List<String> labels = derived.groupLabels();
        int width = Math.max(5, labels.stream().mapToInt(l -> Printable.of(l).length()).max().orElse(5));
        StringBuilder sb = new StringBuilder();
        String head = "%-" + width + "s %8s %22s %22s %22s %14s%n";
        sb.append(String.format(Locale.ROOT, head, "group", "reported", "intended mean [90%]", "harmonised [90%]",
                derived.coarseClass() ? "coarse share [90%]" : "", "rank (change)"));
        double[] reported = derived.reportedMeans();
        int[] reportedRank = ranks(reported);
        for (int g = 0; g < labels.size(); g++) {
            String label = labels.get(g);
            ParameterSummary intended = by.get("intended_mean." + label);
            ParameterSummary harmonised = by.get("harmonised_mean." + label);
            ParameterSummary coarse = by.get("coarse_share." + label);
            ParameterSummary rank = by.get("rank_intended." + label);
            long rounded = Math.round(rank.mean());
            sb.append(String.format(Locale.ROOT, "%-" + width + "s %8.2f %22s %22s %22s %14s%n", Printable.of(label), reported[g],
                    interval(intended), interval(harmonised), coarse == null ? "" : interval(coarse),
                    String.format(Locale.ROOT, "%d (%+d)", rounded, reportedRank[g] - rounded)));
        }
        return sb.toString();
    }

    private static String interval(ParameterSummary s) {
        return String.format(Locale.ROOT, "%.2f [%.2f, %.2f]", s.mean(), s.q05(), s.q95());
    }

    /** Rank 1 = highest. */
    private static int[] ranks(double[] values) {
        int[] r = new int[values.length];
        for (int i = 0; i < values.length; i++) {
            int rank = 1;
            for (int j = 0; j < values.length; j++) {
                if (values[j] > values[i] || (values[j] == values[i] && j < i)) {
                    rank++;
                }
            }
            r[i] = rank;
        }
        return r;
    }
}
