package org.rungs.posteriors.report;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.rungs.posteriors.ProbabilityText;

/**
 * Sections 4 and 5: reported against intended and harmonised means per group with 90%
 * intervals, sorted, with the rank changes; and the share of coarse responders per group and
 * per level of each categorical style covariate (MODEL.md section 6).
 */
final class GroupSection {
    private static final int WIDTH = 900;

    private GroupSection() {
    }

    static void writeMeans(FitFolder fit, StringBuilder out) {
        out.append("<section id=\"means\"><h2>4. Reported and intended means per group</h2>\n");
        CsvTable groups = fit.groups();
        if (groups == null) {
            out.append("<p>Group means were not computed for this fit (no groups.csv in the folder).</p></section>\n");
            return;
        }
        Integer[] order = sortedBy(groups, "intended_mean_mean");
        List<String> labels = new ArrayList<>();
        for (int r : order) {
            labels.add(groups.text(r, "group"));
        }
        out.append("<p class=\"note\">Reported: the plain mean of the ratings given. Intended: what the respondents would have ")
                .append("answered on the full scale without rounding or number attraction, with their group's own use of the scale. ")
                .append("Harmonised: the same with one common use of the scale, so comparable across groups. ")
                .append("Points are posterior means, bars 90% intervals; groups sorted by intended mean, highest at the top.</p>\n");
        DotPlot plot = DotPlot.of(labels, "Mean rating (scale points)")
                .series("reported", column(groups, order, "reported_mean"), column(groups, order, "reported_mean"),
                        column(groups, order, "reported_mean"))
                .series("intended (90% interval)", column(groups, order, "intended_mean_mean"),
                        column(groups, order, "intended_mean_q5"), column(groups, order, "intended_mean_q95"));
        if (groups.has("harmonised_mean_mean")) {
            plot.series("harmonised (90% interval)", column(groups, order, "harmonised_mean_mean"),
                    column(groups, order, "harmonised_mean_q5"), column(groups, order, "harmonised_mean_q95"));
        }
        out.append("<div class=\"scroll\"><figure>").append(plot.svg("means", WIDTH, "Reported, intended and harmonised means per group"))
                .append("</figure></div>\n");
        rankTable(fit, groups, order, out);
        out.append("</section>\n");
    }

    static void writeCoarse(FitFolder fit, StringBuilder out) {
        out.append("<section id=\"coarse\"><h2>5. Coarse responders</h2>\n");
        CsvTable groups = fit.groups();
        CsvTable levels = fit.coarseShares();
        boolean byGroup = groups != null && groups.has("coarse_share_mean");
        if (!byGroup && levels == null) {
            out.append("<p>The coarse-responder class was off in this model, or its shares were not computed ")
                    .append("(no coarse_share columns in groups.csv and no coarse_shares.csv).</p></section>\n");
            return;
        }
        out.append("<p class=\"note\">Estimated share of respondents who answer on a few coarse points (such as 0, 5 and 10) ")
                .append("instead of the full scale; points are posterior means, bars 90% intervals.</p>\n");
        if (byGroup) {
            Integer[] order = sortedBy(groups, "coarse_share_mean");
            List<String> labels = new ArrayList<>();
            for (int r : order) {
                labels.add(groups.text(r, "group"));
            }
            out.append("<h3>Per group</h3><div class=\"scroll\"><figure>")
                    .append(DotPlot.of(labels, "Share of coarse responders (%)")
                            .series("coarse share", percent(column(groups, order, "coarse_share_mean")),
                                    percent(column(groups, order, "coarse_share_q5")), percent(column(groups, order, "coarse_share_q95")))
                            .svg("coarse-groups", WIDTH, "Coarse share per group"))
                    .append("</figure></div>\n");
        }
        if (levels != null) {
            Map<String, List<Integer>> byColumn = new java.util.LinkedHashMap<>();
            for (int r = 0; r < levels.size(); r++) {
                byColumn.computeIfAbsent(levels.text(r, "column"), c -> new ArrayList<>()).add(r);
            }
            int c = 0;
            for (Map.Entry<String, List<Integer>> entry : byColumn.entrySet()) {
                c++;
                List<Integer> rows = entry.getValue();
                List<String> labels = new ArrayList<>();
                double[] mean = new double[rows.size()];
                double[] low = new double[rows.size()];
                double[] high = new double[rows.size()];
                for (int i = 0; i < rows.size(); i++) {
                    int r = rows.get(i);
                    labels.add(levels.text(r, "level"));
                    mean[i] = 100 * levels.number(r, "share_mean");
                    low[i] = 100 * levels.number(r, "share_q5");
                    high[i] = 100 * levels.number(r, "share_q95");
                }
                out.append("<h3>By ").append(Html.escape(entry.getKey())).append("</h3><figure>")
                        .append(DotPlot.of(labels, "Share of coarse responders (%)").series("coarse share", mean, low, high)
                                .svg("coarse-" + c, WIDTH, "Coarse share by " + entry.getKey()))
                        .append("</figure>\n");
            }
        }
        out.append("</section>\n");
    }

    private static void rankTable(FitFolder fit, CsvTable groups, Integer[] ascending, StringBuilder out) {
        double[] reported = new double[groups.size()];
        for (int r = 0; r < reported.length; r++) {
            reported[r] = groups.number(r, "reported_mean");
        }
        // groups.csv's rank_change is the posterior mean intended rank minus the rank by reported mean (DerivedTables)
        out.append("<h3>Ranks (1 = highest mean)</h3>\n<p class=\"note\">Rank change: intended rank (posterior mean) minus ")
                .append("rank by reported mean; a negative change means the group moves up once scale use is accounted for, ")
                .append("a positive one that it moves down.</p>\n");
        // groups.csv's p_top3_intended is a share of the derived draws (DerivedTables): exactly 1 is no draw outside the top 3
        double draws = fit.number("derived_draws");
        out.append("<p class=\"note\">P(top 3): the share of the posterior draws")
                .append(Double.isFinite(draws) && draws > 0 ? String.format(Locale.ROOT, " (the %,.0f of derived_draws.csv)", draws) : "")
                .append(" in which the group's intended mean is among the three highest. &gt; 0.99 and &lt; 0.01 are shares ")
                .append("that would round to 1 and 0; &ldquo;").append(ProbabilityText.ALL_DRAWS).append("&rdquo; and &ldquo;")
                .append(ProbabilityText.NO_DRAW).append("&rdquo; a share of exactly 1 or 0: the group is in the top 3 in every ")
                .append("draw, or in none, which makes it very likely or very unlikely, not certain.</p>\n");
        out.append("<div class=\"scroll short\">");
        Html.tableHead(out, "num", List.of("group", "reported mean", "reported rank", "intended mean [90%]",
                "intended rank [90%]", "harmonised rank [90%]", "rank change", "P(top 3), intended"));
        for (int i = ascending.length - 1; i >= 0; i--) {
            int r = ascending[i];
            Html.row(out, Html.escape(groups.text(r, "group")), Html.number(reported[r], 2),
                    Integer.toString(rankOf(reported, r)),
                    Html.interval(groups.number(r, "intended_mean_mean"), groups.number(r, "intended_mean_q5"),
                            groups.number(r, "intended_mean_q95"), 2),
                    Html.interval(groups.number(r, "rank_intended_mean"), groups.number(r, "rank_intended_q5"),
                            groups.number(r, "rank_intended_q95"), 1),
                    Html.interval(groups.number(r, "rank_harmonised_mean"), groups.number(r, "rank_harmonised_q5"),
                            groups.number(r, "rank_harmonised_q95"), 1),
                    signed(groups.number(r, "rank_change")), Html.drawShare(groups.number(r, "p_top3_intended"), 2));
        }
        Html.tableEnd(out);
        out.append("</div>\n");
    }

    /** Rank 1 = highest value. */
    private static int rankOf(double[] values, int index) {
        int rank = 1;
        for (int j = 0; j < values.length; j++) {
            if (values[j] > values[index] || (values[j] == values[index] && j < index)) {
                rank++;
            }
        }
        return rank;
    }

    private static String signed(double value) {
        if (!Double.isFinite(value)) {
            return "&ndash;";
        }
        String text = Html.number(value, value == Math.rint(value) ? 0 : 1);
        // a change that rounds to zero shows no sign: neither "+0.0" nor "-0.0"
        if (Double.parseDouble(text) == 0) {
            return text.startsWith("-") ? text.substring(1) : text;
        }
        return value > 0 ? "+" + text : text;
    }

    /** Row indices in ascending order of the column (rows without a value first). */
    static Integer[] sortedBy(CsvTable table, String column) {
        Integer[] rows = new Integer[table.size()];
        Arrays.setAll(rows, i -> i);
        Arrays.sort(rows, Comparator.comparingDouble((Integer r) -> {
            double v = table.number(r, column);
            return Double.isFinite(v) ? v : Double.NEGATIVE_INFINITY;
        }));
        return rows;
    }

    static double[] column(CsvTable table, Integer[] order, String column) {
        double[] values = new double[order.length];
        for (int i = 0; i < order.length; i++) {
            values[i] = table.number(order[i], column);
        }
        return values;
    }

    private static double[] percent(double[] shares) {
        double[] values = new double[shares.length];
        for (int i = 0; i < shares.length; i++) {
            values[i] = 100 * shares[i];
        }
        return values;
    }
}
