package org.rungs.posteriors.report;

import java.awt.BasicStroke;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Locale;
import java.util.Set;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.plot.ValueMarker;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.XYLineAndShapeRenderer;
import org.jfree.chart.renderer.xy.XYStepRenderer;
import org.jfree.chart.title.LegendTitle;
import org.jfree.chart.ui.RectangleEdge;
import org.jfree.data.xy.XYSeries;
import org.jfree.data.xy.XYSeriesCollection;
import org.rungs.posteriors.ConvergenceVerdict;
import org.rungs.posteriors.Draws;
import org.rungs.posteriors.ParameterSummary;
import org.rungs.posteriors.ProbabilityText;

/**
 * Section 2: the verdict (R-hat above 1.01 or bulk/tail ESS below 100 per chain flags a
 * parameter, MODEL.md section 7), the worst parameters, and trace and rank plots for them.
 * Rank plots follow Vehtari et al. (2021), section 4.4: ranks of all draws pooled, one
 * histogram per chain; chains that mix show flat, overlapping histograms.
 */
final class ConvergenceSection {
    /** Rows in each table of worst parameters. */
    static final int WORST_ROWS = 10;
    /** Parameters with trace and rank plots: the worst by R-hat, then the worst by bulk ESS. */
    static final int PLOTTED_BY_RHAT = 3;
    static final int PLOTTED_BY_ESS = 2;
    /** Points drawn per chain in a trace plot; more only make the file larger. */
    private static final int TRACE_POINTS = 400;
    private static final int RANK_BINS = 20;

    /** converged: no flag, or flags within chance ({@link ConvergenceVerdict}), and the run finished. */
    record Verdict(boolean converged, ConvergenceVerdict family, boolean interrupted) {
    }

    private ConvergenceSection() {
    }

    /** The verdict of summary.csv's rows; a file without the rhat_chance column never puts a flag down to chance. */
    static Verdict verdict(FitFolder fit) {
        CsvTable summary = fit.summary();
        List<ConvergenceVerdict.Quantity> quantities = new ArrayList<>(summary.size());
        for (int r = 0; r < summary.size(); r++) {
            String flag = summary.has("flag") ? summary.text(r, "flag").trim() : "ok";
            List<String> reasons = flag.isEmpty() || flag.equals("ok") ? List.of() : List.of(flag.split(";"));
            quantities.add(new ConvergenceVerdict.Quantity(summary.text(r, "name"), reasons, summary.number(r, "rhat"),
                    summary.number(r, "rhat_chance")));
        }
        ConvergenceVerdict family = ConvergenceVerdict.ofQuantities(quantities);
        boolean interrupted = fit.flag("sampler.interrupted");
        return new Verdict(family.readable() && !interrupted, family, interrupted);
    }

    /** The prefix of run.json's warning that carries the derived quantities' verdict (FitJob writes it when one is flagged). */
    static final String DERIVED_WARNING = "derived quantities: ";

    /**
     * The derived quantities' verdict line from run.json ("derived_verdict"; in folders written
     * before it, the warning FitJob writes when one is flagged), or null when there is none.
     */
    static String derivedVerdict(FitFolder fit) {
        String line = fit.text("derived_verdict", null);
        if (line != null) {
            return line;
        }
        for (Object warning : fit.list("warnings")) {
            if (warning instanceof String w && w.startsWith(DERIVED_WARNING)) {
                return w.substring(DERIVED_WARNING.length());
            }
        }
        return null;
    }

    /** The verdict's colour on the page: an alarm when the parameters or the derived quantities have not converged. */
    static String verdictClass(FitFolder fit, Verdict verdict) {
        String derived = derivedVerdict(fit);
        return verdict.converged() && (derived == null || !derived.startsWith("Not converged")) ? "ok" : "alarm";
    }

    /** The plain-words verdict shown at the top of the page and in this section. */
    static String verdictText(FitFolder fit, Verdict verdict) {
        StringBuilder sb = new StringBuilder();
        ConvergenceVerdict family = verdict.family();
        int parameters = family.quantities();
        switch (family.kind()) {
            case NOT_CONVERGED -> {
                sb.append("This fit has not converged: ").append(family.flagged().size()).append(" of ")
                        .append(parameters)
                        .append(" parameters fail the checks (R-hat above 1.01 or an effective sample size below 100 per chain). ")
                        .append("The chains disagree or have too few independent draws, so the estimates below are not reliable; ")
                        .append("run longer chains (more warm-up and draws) and check again before using them. ");
                double kept = fit.number("sampler.kept_draws");
                if (kept < ParameterSummary.MIN_ESS_PER_CHAIN) {
                    // as LongerChains.advice says on the console (our rule: no --thin reaches 100 from fewer draws)
                    sb.append(String.format(Locale.ROOT, "With %.0f kept draws per chain no quantity can reach %.0f "
                            + "effective draws per chain: keep at least %.0f (--draws). ", kept,
                            ParameterSummary.MIN_ESS_PER_CHAIN, ParameterSummary.MIN_ESS_PER_CHAIN));
                }
            }
            case WITHIN_CHANCE -> {
                boolean one = family.flagged().size() == 1;
                sb.append(String.format(Locale.ROOT, "This fit has converged within chance: %d of %d parameters %s an "
                        + "R-hat a little above 1.01 (at most %.4f) and every effective sample size is sufficient; chains "
                        + "drawing from the posterior itself give an R-hat this far from 1 among %d parameters with "
                        + "probability %s, so the estimates below can be read. Longer chains would clear the %s. ",
                        family.flagged().size(), parameters, one ? "has" : "have", family.largestRhat(), parameters,
                        ProbabilityText.of(family.familyChance(), 2), one ? "flag" : "flags"));
            }
            case CONVERGED -> sb.append("All ").append(parameters)
                    .append(" parameters pass the checks (R-hat at most 1.01, bulk and tail effective sample size at least 100 per chain). ");
        }
        String derived = derivedVerdict(fit);
        if (derived != null) {
            // the corrected means, shares and ranks are derived quantities: the page shows them, so their verdict too
            sb.append("The corrected quantities computed from the draws (derived_summary.csv) have their own check: ")
                    .append(derived).append(' ');
        }
        if (fit.flag("continuable")) {
            sb.append("The fit kept its chains (in the folder's .checkpoint): 'rungs fit --resume DIR --thin K', with K a"
                    + " multiple of this fit's thin (").append(fit.text("options.thin", "1")).append("), runs them on"
                    + " without a new warm-up (README), as does --draws N with N above its draws per chain (")
                    .append(fit.text("options.draws", fit.text("sampler.draws", "?"))).append("). ");
        }
        if (verdict.interrupted()) {
            sb.append("The run was interrupted: only ").append(fit.text("sampler.kept_draws", "some"))
                    .append(" of ").append(fit.text("sampler.draws", "the planned")).append(" draws per chain were kept.");
        }
        return sb.toString().trim();
    }

    static void write(FitFolder fit, StringBuilder out) {
        Verdict verdict = verdict(fit);
        out.append("<section id=\"convergence\"><h2>2. Convergence</h2>\n");
        out.append("<p class=\"").append(verdictClass(fit, verdict)).append("\">")
                .append(Html.escape(verdictText(fit, verdict))).append("</p>\n");
        CsvTable summary = fit.summary();
        out.append("<div class=\"two\"><div><h3>Highest R-hat</h3>\n");
        worstTable(summary, byRhat(summary), out);
        out.append("</div><div><h3>Lowest effective sample size</h3>\n");
        worstTable(summary, byEss(summary), out);
        double chainCount = fit.number("sampler.chains");
        out.append("</div></div>\n");
        out.append("<p class=\"note\">R-hat compares the chains with each other (1 is perfect agreement); ")
                .append("its chance is how often chains drawing from the posterior itself give an R-hat at least this high ")
                .append("(small: the chains disagree); ")
                .append("ESS is the number of independent draws the correlated draws are worth (bulk: centre, tail: 5% and 95% quantiles), ")
                .append("counted over all chains together, as in summary.csv; the check asks for 100 per chain")
                .append(Double.isFinite(chainCount) && chainCount > 0 ? String.format(Locale.ROOT, ", so %,.0f for these %.0f chains",
                        ParameterSummary.MIN_ESS_PER_CHAIN * chainCount, chainCount) : "")
                .append(".</p>\n");
        names(summary, out);
        Draws draws = fit.draws();
        if (draws == null) {
            out.append("<p>No draws.csv in the folder, so trace and rank plots are not drawn.</p>\n</section>\n");
            return;
        }
        out.append("<h3>Trace and rank plots of the worst parameters</h3>\n");
        out.append("<p class=\"note\">Left: the draws of each chain in order; converged chains overlap like one band of noise. ")
                .append("Right: where each chain's draws rank among all draws; converged chains give flat histograms near the dashed line.</p>\n");
        int n = 0;
        for (String name : plottedNames(fit)) {
            n++;
            int p = draws.indexOf(name);
            double[][] chains = draws.chainsOf(p);
            out.append("<div class=\"two\"><figure>").append(trace(chains, "trace-" + n, name, traceAxisLabel(fit)))
                    .append("<figcaption>Trace of <code>").append(Html.escape(name)).append("</code></figcaption></figure>")
                    .append("<figure>").append(rank(chains, "rank-" + n, name))
                    .append("<figcaption>Rank histogram of <code>").append(Html.escape(name)).append("</code></figcaption></figure></div>\n");
        }
        out.append("</section>\n");
    }

    /** What the names in the two tables mean, one line per family of names, in the order they first appear. */
    private static void names(CsvTable summary, StringBuilder out) {
        Set<ParameterNames.Family> families = new LinkedHashSet<>();
        for (Integer[] order : List.of(byRhat(summary), byEss(summary))) {
            for (int i = 0; i < Math.min(WORST_ROWS, order.length); i++) {
                ParameterNames.Family family = ParameterNames.of(summary.text(order[i], "name"));
                if (family != null) {
                    families.add(family);
                }
            }
        }
        if (families.isEmpty()) {
            return;
        }
        out.append("<p class=\"note\">Names, as in summary.csv:</p>\n<ul class=\"note\">\n");
        for (ParameterNames.Family family : families) {
            out.append("<li><code>").append(Html.escape(family.pattern())).append("</code>: ").append(Html.escape(family.meaning()))
                    .append("</li>\n");
        }
        out.append("</ul>\n");
    }

    /** Parameters that get trace and rank plots, in the order drawn (ids trace-1, rank-1, ...). */
    static List<String> plottedNames(FitFolder fit) {
        CsvTable summary = fit.summary();
        Set<String> plotted = new LinkedHashSet<>();
        if (fit.draws() != null) {
            addNames(summary, byRhat(summary), PLOTTED_BY_RHAT, fit.draws(), plotted);
            addNames(summary, byEss(summary), PLOTTED_BY_RHAT + PLOTTED_BY_ESS, fit.draws(), plotted);
        }
        return new ArrayList<>(plotted);
    }

    /** Rows from the highest R-hat down; an R-hat that is not a number (constant draws) last. */
    private static Integer[] byRhat(CsvTable summary) {
        return order(summary, Comparator.comparingDouble((Integer r) -> -finiteOr(summary.number(r, "rhat"), -1)));
    }

    /** Rows from the lowest of bulk and tail ESS up. */
    private static Integer[] byEss(CsvTable summary) {
        return order(summary, Comparator.comparingDouble((Integer r) -> essOf(summary, r)));
    }

    private static void addNames(CsvTable summary, Integer[] order, int upTo, Draws draws, Set<String> plotted) {
        for (int i = 0; i < order.length && plotted.size() < upTo; i++) {
            String name = summary.text(order[i], "name");
            if (draws.indexOf(name) >= 0) {
                plotted.add(name);
            }
        }
    }

    private static Integer[] order(CsvTable summary, Comparator<Integer> comparator) {
        Integer[] rows = new Integer[summary.size()];
        Arrays.setAll(rows, i -> i);
        Arrays.sort(rows, comparator);
        return rows;
    }

    private static double essOf(CsvTable summary, int row) {
        return finiteOr(Math.min(summary.number(row, "ess_bulk"), summary.number(row, "ess_tail")), Double.MAX_VALUE);
    }

    private static double finiteOr(double value, double fallback) {
        return Double.isFinite(value) ? value : fallback;
    }

    private static void worstTable(CsvTable summary, Integer[] order, StringBuilder out) {
        Html.tableHead(out, "num", List.of("parameter", "mean", "R-hat", "its chance", "bulk ESS (all chains)",
                "tail ESS (all chains)", "flag"));
        for (int i = 0; i < Math.min(WORST_ROWS, order.length); i++) {
            int r = order[i];
            String flag = summary.has("flag") ? summary.text(r, "flag") : "";
            Html.row(out, "<code>" + Html.escape(summary.text(r, "name")) + "</code>", Html.number(summary.number(r, "mean"), 3),
                    Html.number(summary.number(r, "rhat"), 3), Html.probability(summary.number(r, "rhat_chance"), 3),
                    Html.number(summary.number(r, "ess_bulk"), 0),
                    Html.number(summary.number(r, "ess_tail"), 0),
                    flag.equals("ok") ? "ok" : "<strong>" + Html.escape(failedChecks(flag)) + "</strong>");
        }
        Html.tableEnd(out);
    }

    /** The summary's flag ({@code rhat>1.01;low ess_bulk}) as the short names of the failed checks. */
    private static String failedChecks(String flag) {
        List<String> checks = new ArrayList<>();
        for (String part : flag.split(";")) {
            String check = part.trim();
            checks.add(switch (check) {
                case "rhat>1.01" -> "R-hat";
                case "low ess_bulk" -> "bulk ESS";
                case "low ess_tail" -> "tail ESS";
                default -> check;
            });
        }
        return String.join(", ", checks);
    }

    /**
     * The trace plot's horizontal axis: draws.csv numbers the kept draws 1, 2, ..., so with
     * {@code --thin} above 1 a point is a kept draw, not an iteration.
     */
    static String traceAxisLabel(FitFolder fit) {
        double thin = fit.number("sampler.thin");
        return Double.isFinite(thin) && thin > 1
                ? String.format(Locale.ROOT, "Kept draw after warm-up (one every %.0f iterations)", thin)
                : "Iteration after warm-up";
    }

    private static String trace(double[][] chains, String id, String name, String axisLabel) {
        XYSeriesCollection data = new XYSeriesCollection();
        int iterations = chains[0].length;
        int stride = Math.max(1, (iterations + TRACE_POINTS - 1) / TRACE_POINTS);
        for (int c = 0; c < chains.length; c++) {
            XYSeries series = new XYSeries("chain " + (c + 1), false, true);
            for (int i = 0; i < iterations; i += stride) {
                series.add(i + 1, chains[c][i], false);
            }
            data.addSeries(series);
        }
        XYLineAndShapeRenderer renderer = new XYLineAndShapeRenderer(true, false);
        renderer.setDrawSeriesLineAsPath(true);
        for (int c = 0; c < chains.length; c++) {
            renderer.setSeriesPaint(c, Charts.SERIES[c % Charts.SERIES.length]);
            renderer.setSeriesStroke(c, new BasicStroke(0.8f));
        }
        NumberAxis x = new NumberAxis(axisLabel);
        NumberAxis y = new NumberAxis("Value of the draw");
        y.setAutoRangeIncludesZero(false);
        return chart(new XYPlot(data, x, y, renderer), id, "Trace plot of " + name);
    }

    private static String rank(double[][] chains, String id, String name) {
        int iterations = chains[0].length;
        int total = chains.length * iterations;
        double[] pooled = new double[total];
        for (int c = 0; c < chains.length; c++) {
            System.arraycopy(chains[c], 0, pooled, c * iterations, iterations);
        }
        Integer[] order = new Integer[total];
        Arrays.setAll(order, i -> i);
        Arrays.sort(order, Comparator.comparingDouble(i -> pooled[i]));
        int[][] counts = new int[chains.length][RANK_BINS];
        for (int rank = 0; rank < total; rank++) {
            int draw = order[rank];
            counts[draw / iterations][(int) ((long) rank * RANK_BINS / total)]++;
        }
        XYSeriesCollection data = new XYSeriesCollection();
        for (int c = 0; c < chains.length; c++) {
            XYSeries series = new XYSeries("chain " + (c + 1), false, true);
            for (int b = 0; b < RANK_BINS; b++) {
                series.add(b, counts[c][b]);
            }
            series.add(RANK_BINS, counts[c][RANK_BINS - 1]);
            data.addSeries(series);
        }
        XYStepRenderer renderer = new XYStepRenderer();
        for (int c = 0; c < chains.length; c++) {
            renderer.setSeriesPaint(c, Charts.SERIES[c % Charts.SERIES.length]);
            renderer.setSeriesStroke(c, new BasicStroke(1.4f));
        }
        NumberAxis x = new NumberAxis("Rank among all draws (" + RANK_BINS + " bins, low to high)");
        x.setRange(0, RANK_BINS);
        x.setTickLabelsVisible(false);
        NumberAxis y = new NumberAxis("Draws per bin");
        XYPlot plot = new XYPlot(data, x, y, renderer);
        plot.addRangeMarker(new ValueMarker((double) iterations / RANK_BINS, Charts.BLACK,
                new BasicStroke(1f, BasicStroke.CAP_BUTT, BasicStroke.JOIN_MITER, 1f, new float[] {4f, 4f}, 0f)));
        return chart(plot, id, "Rank plot of " + name);
    }

    private static String chart(XYPlot plot, String id, String title) {
        JFreeChart chart = Charts.styled(new JFreeChart(null, JFreeChart.DEFAULT_TITLE_FONT, plot, true));
        LegendTitle legend = chart.getLegend();
        legend.setPosition(RectangleEdge.TOP);
        return Charts.svg(chart, id, 540, 250, title);
    }
}
