package org.rungs.posteriors.report;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Font;
import java.awt.Paint;
import java.awt.Rectangle;
import java.awt.Stroke;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.StandardChartTheme;
import org.jfree.chart.plot.DefaultDrawingSupplier;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.StandardXYBarPainter;
import org.jfree.chart.renderer.xy.XYItemRenderer;
import org.jfree.chart.ui.RectangleInsets;
import org.jfree.svg.SVGGraphics2D;
import org.jfree.svg.ViewBox;

/**
 * Look of every chart and its rendering to inline SVG. Colours are the Okabe and Ito (2008)
 * palette, "Color Universal Design", chosen to stay distinct under the common colour-vision
 * deficiencies; series also differ by shape or dash so that a grey print still separates them.
 */
final class Charts {
    static final Color BLACK = new Color(0x000000);
    static final Color ORANGE = new Color(0xE69F00);
    static final Color SKY_BLUE = new Color(0x56B4E9);
    static final Color GREEN = new Color(0x009E73);
    static final Color BLUE = new Color(0x0072B2);
    static final Color VERMILLION = new Color(0xD55E00);
    static final Color PURPLE = new Color(0xCC79A7);
    static final Color GREY = new Color(0x999999);
    /** Series colours in order: chains, or the series of one chart. */
    static final Color[] SERIES = {BLUE, ORANGE, GREEN, VERMILLION, PURPLE, SKY_BLUE, BLACK, GREY};

    private static final String FONT = "SansSerif";
    /** Series per chart whose paint and stroke survive the theme; charts here have at most a few. */
    private static final int MAX_SERIES = 16;

    static {
        // Charts are drawn without a display; must be set before the first AWT class loads.
        System.setProperty("java.awt.headless", "true");
    }

    private Charts() {
    }

    /** Applies the report's fonts, palette and plain white background, keeping the series' own paints and strokes. */
    static JFreeChart styled(JFreeChart chart) {
        StandardChartTheme theme = (StandardChartTheme) StandardChartTheme.createJFreeTheme();
        theme.setExtraLargeFont(new Font(FONT, Font.BOLD, 15));
        theme.setLargeFont(new Font(FONT, Font.BOLD, 13));
        theme.setRegularFont(new Font(FONT, Font.PLAIN, 12));
        theme.setSmallFont(new Font(FONT, Font.PLAIN, 11));
        theme.setChartBackgroundPaint(Color.WHITE);
        theme.setPlotBackgroundPaint(Color.WHITE);
        theme.setDomainGridlinePaint(new Color(0xDDDDDD));
        theme.setRangeGridlinePaint(new Color(0xDDDDDD));
        theme.setAxisLabelPaint(BLACK);
        theme.setTickLabelPaint(BLACK);
        theme.setXYBarPainter(new StandardXYBarPainter());
        theme.setShadowVisible(false);
        theme.setDrawingSupplier(new DefaultDrawingSupplier(SERIES, SERIES, SERIES,
                DefaultDrawingSupplier.DEFAULT_STROKE_SEQUENCE, DefaultDrawingSupplier.DEFAULT_OUTLINE_STROKE_SEQUENCE,
                DefaultDrawingSupplier.DEFAULT_SHAPE_SEQUENCE));
        XYPlot plot = chart.getPlot() instanceof XYPlot xy ? xy : null;
        int renderers = plot == null ? 0 : plot.getRendererCount();
        Paint[][] paints = new Paint[renderers][MAX_SERIES];
        Stroke[][] strokes = new Stroke[renderers][MAX_SERIES];
        for (int r = 0; r < renderers; r++) {
            XYItemRenderer renderer = plot.getRenderer(r);
            for (int s = 0; renderer != null && s < MAX_SERIES; s++) {
                paints[r][s] = renderer.getSeriesPaint(s);
                strokes[r][s] = renderer.getSeriesStroke(s);
            }
        }
        // The theme clears the series' paints and strokes; put back those the chart set.
        theme.apply(chart);
        for (int r = 0; r < renderers; r++) {
            XYItemRenderer renderer = plot.getRenderer(r);
            for (int s = 0; renderer != null && s < MAX_SERIES; s++) {
                if (paints[r][s] != null) {
                    renderer.setSeriesPaint(s, paints[r][s]);
                }
                if (strokes[r][s] != null) {
                    renderer.setSeriesStroke(s, strokes[r][s]);
                }
            }
        }
        chart.setAntiAlias(true);
        chart.setPadding(new RectangleInsets(4, 4, 4, 8));
        if (plot != null) {
            plot.setOutlineVisible(false);
            plot.setDomainGridlineStroke(new BasicStroke(0.5f));
            plot.setRangeGridlineStroke(new BasicStroke(0.5f));
        }
        return chart;
    }

    /** Shortest text of the value rounded to one decimal. */
    static String tenths(double value) {
        long scaled = Math.round(value * 10);
        return scaled % 10 == 0 ? Long.toString(scaled / 10) : Double.toString(scaled / 10.0);
    }

    /** The chart as an {@code <svg>} element with the given id, scaling to its container's width. */
    static String svg(JFreeChart chart, String id, int width, int height, String title) {
        SVGGraphics2D g = new SVGGraphics2D(width, height);
        // Many charts share one page: keep the ids of their clip paths apart.
        g.setDefsKeyPrefix(id + "-");
        // A tenth of a pixel is finer than any screen or printer shows; full doubles triple the file.
        g.setGeomDoubleConverter(Charts::tenths);
        chart.draw(g, new Rectangle(0, 0, width, height));
        String element = g.getSVGElement(id, false, new ViewBox(0, 0, width, height), null, null);
        // The first clip is the whole chart and cuts nothing; dropping its use on every element saves a fifth of the size.
        String wholeChart = "<clipPath id='" + id + "-clip-0'><path d='M0,0L" + width + ",0L" + width + "," + height + "L0,"
                + height + "L0,0Z'/></clipPath>";
        if (element.contains(wholeChart)) {
            element = element.replace(" clip-path='url(#" + id + "-clip-0)'", "");
        }
        String open = "<svg role=\"img\" aria-label=\"" + Html.escape(title) + "\" style=\"max-width:" + width + "px\"";
        return element.replaceFirst("^<svg", open);
    }
}
