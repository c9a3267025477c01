package org.rungs.posteriors.report;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Shape;
import java.awt.geom.Ellipse2D;
import java.awt.geom.Rectangle2D;
import java.util.ArrayList;
import java.util.List;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.axis.SymbolAxis;
import org.jfree.chart.plot.PlotOrientation;
import org.jfree.chart.plot.ValueMarker;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.XYErrorRenderer;
import org.jfree.chart.title.LegendTitle;
import org.jfree.chart.ui.RectangleEdge;
import org.jfree.data.xy.YIntervalSeries;
import org.jfree.data.xy.YIntervalSeriesCollection;

/**
 * Labelled rows (groups, levels, covariates), each with one point and 90% interval per series,
 * drawn horizontally so that long labels stay readable; the chart grows with the rows, so 150
 * groups get 150 separate lines of text.
 */
final class DotPlot {
    /** Height of one labelled row in pixels: room for the label text and the series' offsets. */
    static final int ROW_HEIGHT = 22;

    record Series(String name, double[] mean, double[] low, double[] high) {
    }

    private final List<String> labels;
    private final List<Series> series = new ArrayList<>();
    private final String valueLabel;
    private Double reference;

    private DotPlot(List<String> labels, String valueLabel) {
        this.labels = labels;
        this.valueLabel = valueLabel;
    }

    /** Rows bottom to top in the order given. */
    static DotPlot of(List<String> labels, String valueLabel) {
        return new DotPlot(labels, valueLabel);
    }

    DotPlot series(String name, double[] mean, double[] low, double[] high) {
        series.add(new Series(name, mean, low, high));
        return this;
    }

    /** A dashed vertical line at this value (no effect, no attraction). */
    DotPlot reference(double value) {
        reference = value;
        return this;
    }

    String svg(String id, int width, String title) {
        YIntervalSeriesCollection data = new YIntervalSeriesCollection();
        int count = series.size();
        for (int s = 0; s < count; s++) {
            Series one = series.get(s);
            YIntervalSeries points = new YIntervalSeries(one.name());
            // Series side by side within a row so that their intervals do not overlap.
            double offset = count == 1 ? 0 : (s - (count - 1) / 2.0) * 0.6 / (count - 1);
            for (int r = 0; r < labels.size(); r++) {
                double mean = one.mean()[r];
                if (!Double.isFinite(mean)) {
                    continue;
                }
                double low = Double.isFinite(one.low()[r]) ? one.low()[r] : mean;
                double high = Double.isFinite(one.high()[r]) ? one.high()[r] : mean;
                points.add(r + offset, mean, low, high);
            }
            data.addSeries(points);
        }
        SymbolAxis rows = new SymbolAxis(null, labels.toArray(new String[0]));
        rows.setGridBandsVisible(false);
        rows.setRange(-0.7, labels.size() - 0.3);
        NumberAxis values = new NumberAxis(valueLabel);
        values.setAutoRangeIncludesZero(false);
        XYErrorRenderer renderer = new XYErrorRenderer();
        renderer.setDrawXError(false);
        renderer.setDefaultLinesVisible(false);
        renderer.setErrorStroke(new BasicStroke(1.6f));
        renderer.setCapLength(5);
        Shape[] shapes = {new Ellipse2D.Double(-4, -4, 8, 8), new Rectangle2D.Double(-3.5, -3.5, 7, 7),
            diamond(5), new Ellipse2D.Double(-3, -3, 6, 6)};
        for (int s = 0; s < count; s++) {
            Color colour = Charts.SERIES[s % Charts.SERIES.length];
            renderer.setSeriesPaint(s, colour);
            renderer.setSeriesShape(s, shapes[s % shapes.length]);
        }
        renderer.setErrorPaint(null);
        XYPlot plot = new XYPlot(data, rows, values, renderer);
        plot.setOrientation(PlotOrientation.HORIZONTAL);
        if (reference != null) {
            ValueMarker marker = new ValueMarker(reference, Charts.BLACK,
                    new BasicStroke(1f, BasicStroke.CAP_BUTT, BasicStroke.JOIN_MITER, 1f, new float[] {4f, 4f}, 0f));
            plot.addRangeMarker(marker);
        }
        JFreeChart chart = new JFreeChart(null, JFreeChart.DEFAULT_TITLE_FONT, plot, count > 1);
        Charts.styled(chart);
        LegendTitle legend = chart.getLegend();
        if (legend != null) {
            legend.setPosition(RectangleEdge.TOP);
        }
        int height = 90 + (count > 1 ? 30 : 0) + ROW_HEIGHT * labels.size();
        return Charts.svg(chart, id, width, height, title);
    }

    static Shape diamond(double r) {
        java.awt.geom.Path2D.Double path = new java.awt.geom.Path2D.Double();
        path.moveTo(0, -r);
        path.lineTo(r, 0);
        path.lineTo(0, r);
        path.lineTo(-r, 0);
        path.closePath();
        return path;
    }
}
