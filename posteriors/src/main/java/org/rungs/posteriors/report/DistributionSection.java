package org.rungs.posteriors.report;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.geom.Ellipse2D;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.plot.DatasetRenderingOrder;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.StandardXYBarPainter;
import org.jfree.chart.renderer.xy.XYBarRenderer;
import org.jfree.chart.renderer.xy.XYErrorRenderer;
import org.jfree.data.xy.XYSeries;
import org.jfree.data.xy.XYSeriesCollection;
import org.jfree.data.xy.YIntervalSeries;
import org.jfree.data.xy.YIntervalSeriesCollection;

/**
 * Section 3: per group, the reported ratings as bars, the 90% posterior predictive interval of
 * each rating's share, and the intended distribution (MODEL.md section 6) as a second series.
 * A bar above the intended line at a round number is a heap; one below, an avoided number.
 */
final class DistributionSection {
    static final Color BAR = new Color(0xA6CEE3);
    private static final int WIDTH = 340;
    private static final int HEIGHT = 230;

    private DistributionSection() {
    }

    static void write(FitFolder fit, StringBuilder out) {
        out.append("<section id=\"distributions\"><h2>3. Rating distributions per group</h2>\n");
        CsvTable table = fit.distributions();
        if (table == null) {
            out.append("<p>Rating distributions were not computed for this fit (no distributions.csv in the folder).</p></section>\n");
            return;
        }
        out.append("<p class=\"legend\"><span class=\"sw\" style=\"background:#A6CEE3\"></span> reported share ")
                .append("<span class=\"sw line\" style=\"border-color:#000\"></span> 90% predictive interval of the reported share ")
                .append("<span class=\"sw dot\" style=\"background:#D55E00\"></span> intended share with 90% interval</p>\n");
        int ratings = table.size();
        int outside = 0;
        for (int r = 0; r < ratings; r++) {
            outside += outsideInterval(table, r) ? 1 : 0;
        }
        // a 90% interval leaves out at most about one count in ten by chance: fewer, as its ends are counts and
        // the fit has seen the counts it predicts (a posterior predictive check is conservative)
        out.append("<p class=\"note\">Shares in percent of the group's respondents. Bars that stand above the intended series at round ")
                .append("numbers show heaping; a rating marked &#9888; lies outside its 90% predictive interval. ")
                .append(String.format(Locale.ROOT, "%,d of the %,d ratings of all groups do so. By chance alone at most about one "
                        + "in ten (%,.0f here) would, and fewer, as the fit has seen these counts; so only more marks than that, ",
                        outside, ratings, 0.1 * ratings))
                .append("or a rating far outside, point to what the model misses.</p>\n");
        Map<String, List<Integer>> byGroup = GroupRows.of(table);
        out.append("<div class=\"grid scroll\">\n");
        int g = 0;
        for (Map.Entry<String, List<Integer>> entry : byGroup.entrySet()) {
            g++;
            figure(table, entry.getKey(), entry.getValue(), "dist-" + g, out);
        }
        out.append("</div></section>\n");
    }

    private static void figure(CsvTable table, String group, List<Integer> rows, String id, StringBuilder out) {
        double respondents = 0;
        for (int r : rows) {
            respondents += table.number(r, "observed_count");
        }
        XYSeries reported = new XYSeries("reported");
        YIntervalSeries replicated = new YIntervalSeries("predictive");
        YIntervalSeries intended = new YIntervalSeries("intended");
        StringBuilder outside = new StringBuilder();
        double scale = respondents > 0 ? 100.0 / respondents : Double.NaN;
        for (int r : rows) {
            double rating = table.number(r, "rating");
            double share = table.has("reported_share") ? 100 * table.number(r, "reported_share")
                    : table.number(r, "observed_count") * scale;
            reported.add(rating, share);
            double mean = table.number(r, "replicated_mean") * scale;
            if (Double.isFinite(mean)) {
                replicated.add(rating - 0.18, mean, table.number(r, "replicated_q5") * scale,
                        table.number(r, "replicated_q95") * scale);
            }
            double intendedMean = 100 * table.number(r, "intended_share_mean");
            if (Double.isFinite(intendedMean)) {
                intended.add(rating + 0.18, intendedMean, 100 * table.number(r, "intended_share_q5"),
                        100 * table.number(r, "intended_share_q95"));
            }
            if (outsideInterval(table, r)) {
                outside.append(outside.length() == 0 ? "" : ", ").append(Html.escape(table.text(r, "rating")));
            }
        }
        XYPlot plot = new XYPlot();
        NumberAxis x = new NumberAxis("Rating (scale points)");
        x.setStandardTickUnits(NumberAxis.createIntegerTickUnits());
        x.setRange(reported.getMinX() - 0.6, reported.getMaxX() + 0.6);
        NumberAxis y = new NumberAxis("Share of respondents (%)");
        plot.setDomainAxis(x);
        plot.setRangeAxis(y);
        XYBarRenderer bars = new XYBarRenderer(0.1);
        bars.setBarPainter(new StandardXYBarPainter());
        bars.setShadowVisible(false);
        bars.setSeriesPaint(0, BAR);
        plot.setDataset(0, new XYSeriesCollection(reported));
        plot.setRenderer(0, bars);
        YIntervalSeriesCollection replicatedData = new YIntervalSeriesCollection();
        replicatedData.addSeries(replicated);
        plot.setDataset(1, replicatedData);
        plot.setRenderer(1, errors(Charts.BLACK, false));
        YIntervalSeriesCollection intendedData = new YIntervalSeriesCollection();
        intendedData.addSeries(intended);
        plot.setDataset(2, intendedData);
        plot.setRenderer(2, errors(Charts.VERMILLION, true));
        plot.setDatasetRenderingOrder(DatasetRenderingOrder.FORWARD);
        JFreeChart chart = Charts.styled(new JFreeChart(null, JFreeChart.DEFAULT_TITLE_FONT, plot, false));
        String n = String.format(Locale.ROOT, "%,.0f", respondents);
        out.append("<figure><figcaption><b>").append(Html.escape(group)).append("</b> (").append(n).append(" respondents)");
        if (outside.length() > 0) {
            out.append(" &#9888; outside: ").append(outside);
        }
        out.append("</figcaption>").append(Charts.svg(chart, id, WIDTH, HEIGHT, "Rating distribution of " + group))
                .append("</figure>\n");
    }

    /** distributions.csv's outside_90: the observed count lies outside its replicated 90% interval. */
    private static boolean outsideInterval(CsvTable table, int row) {
        String flag = table.has("outside_90") ? table.text(row, "outside_90").trim().toLowerCase(Locale.ROOT) : "";
        return flag.equals("true") || flag.equals("1") || flag.equals("yes");
    }

    private static XYErrorRenderer errors(Color colour, boolean line) {
        XYErrorRenderer renderer = new XYErrorRenderer();
        renderer.setDrawXError(false);
        renderer.setDefaultLinesVisible(line);
        renderer.setSeriesLinesVisible(0, line);
        renderer.setSeriesPaint(0, colour);
        renderer.setErrorPaint(colour);
        renderer.setErrorStroke(new BasicStroke(1.4f));
        renderer.setCapLength(4);
        renderer.setSeriesStroke(0, new BasicStroke(1.4f));
        renderer.setSeriesShape(0, line ? new Ellipse2D.Double(-3, -3, 6, 6) : DotPlot.diamond(2.5));
        return renderer;
    }
}
