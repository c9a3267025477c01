package org.rungs.sampler.derived;

import java.io.IOException;
import java.nio.file.Path;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.rungs.posteriors.AtomicFiles;
import org.rungs.posteriors.CsvField;
import org.rungs.posteriors.Draws;
import org.rungs.posteriors.ParameterSummary;

/**
 * The CSV files of the derived quantities. Intervals are the 90% central posterior intervals
 * (the summaries' q5 and q95); numbers are written in full precision, independent of the locale.
 */
final class DerivedTables {
    private static final String[] GROUP_QUANTITIES = {"intended_mean", "harmonised_mean", "attracted_mean", "mean_bias",
        "mean_bias_attraction", "mean_bias_rounding", "coarse_share", "rank_intended", "rank_harmonised"};
    private static final int TOP = 3;

    private DerivedTables() {
    }

    /**
     * group, respondents, reported_mean, then mean/q5/q95 of intended_mean, harmonised_mean,
     * attracted_mean (with attraction), mean_bias, mean_bias_attraction and mean_bias_rounding
     * (with attraction), coarse_share (with the coarse class), rank_intended and rank_harmonised,
     * p_top3_intended and p_top3_harmonised (share of draws ranking the group in the top 3), and
     * rank_change (posterior mean intended rank minus the rank by reported mean).
     */
    static void writeGroups(DerivedResult r, List<ParameterSummary> summaries, Path file) throws IOException {
        Map<String, ParameterSummary> byName = byName(summaries);
        List<String> labels = r.groupLabels();
        StringBuilder header = new StringBuilder("group,respondents,reported_mean");
        for (String quantity : GROUP_QUANTITIES) {
            if (present(r, quantity)) {
                header.append(',').append(quantity).append("_mean,").append(quantity).append("_q5,")
                        .append(quantity).append("_q95");
            }
        }
        header.append(",p_top").append(TOP).append("_intended,p_top").append(TOP).append("_harmonised,rank_change\n");
        AtomicFiles.write(file, out -> {
            out.append(header);
            StringBuilder line = new StringBuilder();
            for (int g = 0; g < labels.size(); g++) {
                String label = labels.get(g);
                line.setLength(0);
                line.append(CsvField.quote(label)).append(',').append(r.respondents(g)).append(',').append(number(r.reportedMeans()[g]));
                for (String quantity : GROUP_QUANTITIES) {
                    if (present(r, quantity)) {
                        interval(line, summary(byName, DerivedColumns.groupName(quantity, label)));
                    }
                }
                line.append(',').append(number(topShare(r.draws(), DerivedColumns.groupName("rank_intended", label))));
                line.append(',').append(number(topShare(r.draws(), DerivedColumns.groupName("rank_harmonised", label))));
                double meanRank = summary(byName, DerivedColumns.groupName("rank_intended", label)).mean();
                line.append(',').append(number(meanRank - DrawEvaluator.rank(r.reportedMeans(), g))).append('\n');
                out.append(line);
            }
        });
    }

    /** Whether groups.csv has the columns of {@code quantity}: the coarse share and the attraction terms only with their component. */
    private static boolean present(DerivedResult r, String quantity) {
        if (quantity.equals("coarse_share")) {
            return r.coarseClass();
        }
        return r.attraction() || !(quantity.equals("attracted_mean") || quantity.startsWith("mean_bias_"));
    }

    /**
     * Long format, one row per group and rating: observed_count, reported_share (weighted), the
     * mean/q5/q95 of the intended and harmonised shares, of the attracted share (with attraction)
     * and of the replicated count, and outside_90, true when the observed count lies outside the
     * replicated 90% interval.
     */
    static void writeDistributions(DerivedResult r, List<ParameterSummary> summaries, Path file) throws IOException {
        Map<String, ParameterSummary> byName = byName(summaries);
        List<String> labels = r.groupLabels();
        AtomicFiles.write(file, out -> {
            out.append("group,rating,observed_count,reported_share,intended_share_mean,intended_share_q5,"
                    + "intended_share_q95,harmonised_share_mean,harmonised_share_q5,harmonised_share_q95,"
                    + (r.attraction() ? "attracted_share_mean,attracted_share_q5,attracted_share_q95," : "")
                    + "replicated_mean,replicated_q5,replicated_q95,outside_90\n");
            StringBuilder line = new StringBuilder();
            for (int g = 0; g < labels.size(); g++) {
                String label = labels.get(g);
                for (int k = 0; k < r.scale().categories(); k++) {
                    int rating = r.scale().rating(k);
                    int observed = r.observedCounts()[g][k];
                    line.setLength(0);
                    line.append(CsvField.quote(label)).append(',').append(rating).append(',').append(observed).append(',')
                            .append(number(r.reportedShares()[g][k]));
                    interval(line, summary(byName, DerivedColumns.ratingName("intended_share", label, rating)));
                    interval(line, summary(byName, DerivedColumns.ratingName("harmonised_share", label, rating)));
                    if (r.attraction()) {
                        interval(line, summary(byName, DerivedColumns.ratingName("attracted_share", label, rating)));
                    }
                    ParameterSummary replicated = summary(byName, DerivedColumns.ratingName("replicated", label, rating));
                    interval(line, replicated);
                    line.append(',').append(observed < replicated.q05() || observed > replicated.q95()).append('\n');
                    out.append(line);
                }
            }
        });
    }

    /** column, level, share_mean, share_q5, share_q95; only the header without categorical style covariates. */
    static void writeCoarseShares(DerivedResult r, List<ParameterSummary> summaries, Path file) throws IOException {
        Map<String, ParameterSummary> byName = byName(summaries);
        AtomicFiles.write(file, out -> {
            out.append("column,level,share_mean,share_q5,share_q95\n");
            StringBuilder line = new StringBuilder();
            for (DerivedResult.StyleLevel level : r.coarseLevels()) {
                line.setLength(0);
                line.append(CsvField.quote(level.column())).append(',').append(CsvField.quote(level.level()));
                interval(line, summary(byName, DerivedColumns.coarseShareByName(level)));
                out.append(line.append('\n'));
            }
        });
    }

    /** Share of the used draws in which the named rank is at most {@value #TOP}. */
    private static double topShare(Draws draws, String rankName) {
        int column = draws.indexOf(rankName);
        if (column < 0) {
            throw new IllegalArgumentException("the derived draws have no column " + rankName);
        }
        int top = 0;
        for (int c = 0; c < draws.chains(); c++) {
            for (int t = 0; t < draws.iterations(); t++) {
                if (draws.get(column, c, t) <= TOP) {
                    top++;
                }
            }
        }
        return (double) top / ((long) draws.chains() * draws.iterations());
    }

    private static void interval(StringBuilder line, ParameterSummary s) {
        line.append(',').append(number(s.mean())).append(',').append(number(s.q05())).append(',').append(number(s.q95()));
    }

    private static Map<String, ParameterSummary> byName(List<ParameterSummary> summaries) {
        Map<String, ParameterSummary> map = new HashMap<>();
        for (ParameterSummary s : summaries) {
            map.put(s.name(), s);
        }
        return map;
    }

    private static ParameterSummary summary(Map<String, ParameterSummary> byName, String name) {
        ParameterSummary s = byName.get(name);
        if (s == null) {
            throw new IllegalArgumentException("no summary of the derived quantity " + name);
        }
        return s;
    }

    /** Shortest text that reads back to the same double; Double.toString ignores the locale. */
    static String number(double v) {
        return Double.toString(v);
    }
}
