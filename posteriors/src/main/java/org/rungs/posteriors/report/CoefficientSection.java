package org.rungs.posteriors.report;

import java.util.List;
import java.util.Map;

/**
 * Section 7: per level covariate, the naive least-squares coefficient of the raw ratings beside
 * the corrected average marginal effect on the intended rating (MODEL.md section 6), both in
 * rating points per unit of the covariate as given in the data, and the naive coefficient's bias.
 */
final class CoefficientSection {
    private CoefficientSection() {
    }

    static void write(FitFolder fit, StringBuilder out) {
        out.append("<section id=\"coefficients\"><h2>7. Effects of covariates: naive against corrected</h2>\n");
        CsvTable table = fit.coefficients();
        if (table == null) {
            out.append("<p>No covariate effects were computed for this fit (no level covariates, or no coefficients.csv in the folder).</p></section>\n");
            return;
        }
        out.append("<p class=\"note\">All in rating points per unit of the covariate as it appears in the data file ")
                .append("(for a 0/1 indicator: the change from 0 to 1). Naive: least squares of the raw ratings on the covariates ")
                .append("and group indicators. Corrected: the average marginal effect on the intended rating, with its 90% interval. ")
                .append("Plain ordered probit: the same effect from a model without the response styles. ")
                .append("Bias: naive minus corrected.</p>\n");
        String plainVerdict = fit.text("comparison_fit.verdict", "");
        if (!plainVerdict.isEmpty()) {
            // run.json records the plain fit's own verdict; its column means little if it has not converged
            out.append("<p class=\"note\">The plain ordered probit's chains (")
                    .append(Html.number(fit.number("comparison_fit.chains"), 0)).append(" of ")
                    .append(Html.number(fit.number("comparison_fit.warmup"), 0)).append(" warm-up and ")
                    .append(Html.number(fit.number("comparison_fit.draws"), 0)).append(" kept iterations): ")
                    .append(Html.escape(plainVerdict)).append("</p>\n");
        }
        Html.tableHead(out, "num", List.of("covariate", "kind", "naive least squares", "corrected effect [90%]",
                "plain ordered probit [90%]", "bias of naive"));
        for (int r = 0; r < table.size(); r++) {
            int decimals = decimals(table.number(r, "naive_ols_per_unit"), table.number(r, "ame_per_unit_mean"),
                    table.number(r, "ame_per_unit_q5"), table.number(r, "ame_per_unit_q95"),
                    table.number(r, "plain_probit_per_unit_mean"));
            Html.row(out, Html.escape(table.text(r, "covariate")), Html.escape(table.has("kind") ? table.text(r, "kind") : ""),
                    Html.number(table.number(r, "naive_ols_per_unit"), decimals),
                    Html.interval(table.number(r, "ame_per_unit_mean"), table.number(r, "ame_per_unit_q5"),
                            table.number(r, "ame_per_unit_q95"), decimals),
                    Html.interval(table.number(r, "plain_probit_per_unit_mean"), table.number(r, "plain_probit_per_unit_q5"),
                            table.number(r, "plain_probit_per_unit_q95"), decimals),
                    Html.number(table.number(r, "naive_bias"), decimals));
        }
        Html.tableEnd(out);
        // One chart per covariate: units differ, so a shared axis would flatten the small effects.
        Map<String, Object> covariates = fit.map("model.level_covariates");
        out.append("<div class=\"grid\">\n");
        for (int r = 0; r < table.size(); r++) {
            String name = table.text(r, "covariate");
            String source = covariates.get(name) instanceof Map<?, ?> m && m.get("source_column") != null
                    ? m.get("source_column").toString() : name;
            boolean indicator = table.has("kind") && table.text(r, "kind").equals("indicator");
            double naive = table.number(r, "naive_ols_per_unit");
            double[] mean = {table.number(r, "plain_probit_per_unit_mean"), table.number(r, "ame_per_unit_mean"), naive};
            double[] low = {table.number(r, "plain_probit_per_unit_q5"), table.number(r, "ame_per_unit_q5"), naive};
            double[] high = {table.number(r, "plain_probit_per_unit_q95"), table.number(r, "ame_per_unit_q95"), naive};
            String unit = indicator ? "Change from 0 to 1 (rating points)" : "Rating points per unit of " + source;
            out.append("<figure><figcaption><b>").append(Html.escape(name)).append("</b>")
                    .append(source.equals(name) ? "" : " (column <code>" + Html.escape(source) + "</code>)")
                    .append("</figcaption>")
                    .append(DotPlot.of(List.of("plain ordered probit", "corrected", "naive least squares"), unit)
                            .series("effect", mean, low, high).reference(0)
                            .svg("coefficient-" + (r + 1), 440, "Naive and corrected effect of " + name))
                    .append("</figure>\n");
        }
        out.append("</div>\n</section>\n");
    }

    /**
     * Decimals for one covariate's row: three significant digits of its largest effect, at least
     * two decimals (our rule). Effects per unit range from points per year of age (0.004) to
     * points per indicator (0.3), so a fixed number of decimals leaves the small ones one digit.
     */
    static int decimals(double... effects) {
        double largest = 0;
        for (double effect : effects) {
            if (Double.isFinite(effect)) {
                largest = Math.max(largest, Math.abs(effect));
            }
        }
        if (largest == 0) {
            return 2;
        }
        return (int) Math.max(2, Math.min(12, 2 - Math.floor(Math.log10(largest))));
    }
}
