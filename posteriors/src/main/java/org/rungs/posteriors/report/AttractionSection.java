package org.rungs.posteriors.report;

import java.awt.BasicStroke;
import java.awt.geom.Ellipse2D;
import java.util.ArrayList;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.plot.ValueMarker;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.XYErrorRenderer;
import org.jfree.data.xy.YIntervalSeries;
import org.jfree.data.xy.YIntervalSeriesCollection;
import org.rungs.posteriors.AttractionWords;

/**
 * Section 6: the attraction profile per group, exp(a[g,j]) per attracting number j with its 90%
 * interval (MODEL.md section 6); 1 means no pull, above 1 a liked number, below 1 an avoided one;
 * and, in the console's words ({@link AttractionWords}), the numbers credibly liked or avoided.
 */
final class AttractionSection {
    private static final int WIDTH = 340;
    private static final int HEIGHT = 220;

    private AttractionSection() {
    }

    static void write(FitFolder fit, StringBuilder out) {
        out.append("<section id=\"attraction\"><h2>6. Attraction to numbers</h2>\n");
        CsvTable table = fit.attraction();
        if (table == null) {
            String setting = fit.text("model.attraction", "none");
            out.append("<p>").append(setting.equals("none") || setting.equals("off")
                    ? "Number attraction was off in this model, so there is no attraction profile."
                    : "The attraction profile was not computed for this fit (no attraction.csv in the folder).").append("</p></section>\n");
            return;
        }
        // MODEL.md 4b: exp(a) is the odds multiplier of reporting j rather than the other numbers; the
        // probabilities are renormalised, so it is a ratio against a number without a term, not a change of one share
        out.append("<p class=\"note\">exp(a) is the odds multiplier of answering a number rather than another: 1 (dashed line) ")
                .append("is no pull; 1.5 means that, against a number with no pull, the number is chosen 1.5 times as often as the ")
                .append("respondent's latent level alone implies; 0.7 that it is avoided. ")
                .append("Points are posterior means, bars 90% intervals; \"").append(AttractionWords.COMMON)
                .append("\" holds the terms common to every group.</p>\n");
        words(terms(table), table.has("sd_ratio"), out);
        out.append("<div class=\"grid scroll\">\n");
        int g = 0;
        for (Map.Entry<String, List<Integer>> entry : GroupRows.of(table).entrySet()) {
            g++;
            YIntervalSeries series = new YIntervalSeries("exp(a)");
            for (int r : entry.getValue()) {
                series.add(table.number(r, "rating"), table.number(r, "exp_a_mean"), table.number(r, "exp_a_q5"),
                        table.number(r, "exp_a_q95"));
            }
            YIntervalSeriesCollection data = new YIntervalSeriesCollection();
            data.addSeries(series);
            XYErrorRenderer renderer = new XYErrorRenderer();
            renderer.setDrawXError(false);
            renderer.setDefaultLinesVisible(false);
            renderer.setSeriesPaint(0, Charts.BLUE);
            renderer.setErrorPaint(Charts.BLUE);
            renderer.setErrorStroke(new BasicStroke(1.6f));
            renderer.setSeriesShape(0, new Ellipse2D.Double(-3.5, -3.5, 7, 7));
            NumberAxis x = new NumberAxis("Rating (scale points)");
            x.setStandardTickUnits(NumberAxis.createIntegerTickUnits());
            x.setRange(series.getX(0).doubleValue() - 0.8, series.getX(series.getItemCount() - 1).doubleValue() + 0.8);
            NumberAxis y = new NumberAxis("exp(a) (1 = no pull)");
            y.setAutoRangeIncludesZero(true);
            XYPlot plot = new XYPlot(data, x, y, renderer);
            plot.addRangeMarker(new ValueMarker(1.0, Charts.BLACK,
                    new BasicStroke(1f, BasicStroke.CAP_BUTT, BasicStroke.JOIN_MITER, 1f, new float[] {4f, 4f}, 0f)));
            JFreeChart chart = Charts.styled(new JFreeChart(null, JFreeChart.DEFAULT_TITLE_FONT, plot, false));
            out.append("<figure><figcaption><b>").append(Html.escape(entry.getKey())).append("</b></figcaption>")
                    .append(Charts.svg(chart, "attraction-" + g, WIDTH, HEIGHT, "Attraction profile of " + entry.getKey()))
                    .append("</figure>\n");
        }
        out.append("</div></section>\n");
    }

    /**
     * Per group, the numbers credibly liked or avoided, as the console says them; the groups with
     * none share one line; then, as on the console, the terms the data hardly narrowed (when the
     * file has their sd ratios). With several groups the common terms are not spoken of in the
     * per-group lines, as on the console.
     */
    private static void words(List<AttractionWords.Term> terms, boolean sdRatios, StringBuilder out) {
        boolean single = terms.stream().allMatch(AttractionWords.Term::common);
        Set<String> labels = new LinkedHashSet<>();
        for (AttractionWords.Term t : terms) {
            if (single || !t.common()) {
                labels.add(t.group());
            }
        }
        out.append("<p>").append(Html.escape(AttractionWords.rule())).append("</p>\n<ul>\n");
        List<String> silent = new ArrayList<>();
        for (String label : labels) {
            List<String> said = AttractionWords.credible(terms, label, single);
            if (said.isEmpty()) {
                silent.add(Html.escape(label));
            } else {
                out.append("<li><b>").append(Html.escape(label)).append("</b>: ")
                        .append(Html.escape(String.join("; ", said))).append("</li>\n");
            }
        }
        if (!silent.isEmpty()) {
            out.append("<li>").append(String.join(", ", silent)).append(": ").append(AttractionWords.NONE).append("</li>\n");
        }
        out.append("</ul>\n");
        if (sdRatios) {
            out.append("<p>").append(Html.escape(AttractionWords.weak(terms, single, label -> label))).append("</p>\n");
        }
    }

    /**
     * attraction.csv's rows as the words read them. The common terms come first, one per number
     * of the attraction set in increasing order (AttractionProfile): the leading rows labelled
     * {@value AttractionWords#COMMON} whose numbers increase, so a group of that label after them stays a group.
     */
    static List<AttractionWords.Term> terms(CsvTable table) {
        List<AttractionWords.Term> terms = new ArrayList<>(table.size());
        boolean common = true;
        double previous = Double.NEGATIVE_INFINITY;
        for (int r = 0; r < table.size(); r++) {
            double rating = table.number(r, "rating");
            common &= table.text(r, "group").equals(AttractionWords.COMMON) && rating > previous;
            previous = rating;
            terms.add(new AttractionWords.Term(table.text(r, "group"), common, (int) rating, table.number(r, "exp_a_mean"),
                    table.number(r, "exp_a_q5"), table.number(r, "exp_a_q95"), table.number(r, "p_positive"),
                    table.number(r, "sd_ratio")));
        }
        return terms;
    }
}
