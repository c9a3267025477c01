package org.rungs.validation.calibration;

import java.util.Locale;
import org.apache.commons.math3.distribution.BinomialDistribution;

/**
 * A self-contained SVG of one quantity's ranks: the binned rank histogram with the expected count
 * and its pointwise 99% binomial interval (Talts et al. 2018, figure 3 style), and the ECDF
 * difference ECDF(z) - z with the simultaneous band of {@link EcdfBand} (Sailynoja, Burkner &
 * Vehtari 2022, section 3).
 */
final class RankPlots {
    private static final int PANEL = 320;
    private static final int HEIGHT = 220;
    private static final int MARGIN = 36;

    private RankPlots() {
    }

    static String svg(Verdict verdict, int[] histogram, EcdfBand band) {
        StringBuilder s = new StringBuilder();
        int width = 2 * PANEL + 3 * MARGIN;
        s.append("<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"").append(width).append("\" height=\"")
                .append(HEIGHT + 2 * MARGIN).append("\" font-family=\"sans-serif\" font-size=\"11\">\n");
        s.append("<rect width=\"100%\" height=\"100%\" fill=\"white\"/>\n");
        s.append(text(MARGIN, 16, escape(verdict.parameter()) + ": " + verdict.word()
                + String.format(Locale.ROOT, " (N = %d, chi-square p = %.3g, band %s)", verdict.replications(),
                        verdict.chiSquare().p(), verdict.bandExceeded() ? "exceeded" : "kept")));
        histogram(s, verdict.chiSquare(), MARGIN, MARGIN);
        ecdf(s, histogram, band, 2 * MARGIN + PANEL, MARGIN);
        s.append("</svg>\n");
        return s.toString();
    }

    private static void histogram(StringBuilder s, ChiSquareUniformity chi, int x0, int y0) {
        int bins = chi.observed().length;
        int n = 0;
        for (int c : chi.observed()) {
            n += c;
        }
        int[] low = new int[bins];
        int[] high = new int[bins];
        double top = 1;
        for (int k = 0; k < bins; k++) {
            BinomialDistribution b = new BinomialDistribution(null, n, chi.expected()[k] / n);
            low[k] = b.inverseCumulativeProbability(0.005);
            high[k] = b.inverseCumulativeProbability(0.995);
            top = Math.max(top, Math.max(high[k], chi.observed()[k]));
        }
        top *= 1.1;
        double barWidth = (double) PANEL / bins;
        for (int k = 0; k < bins; k++) {
            s.append(rect(x0 + k * barWidth, y0 + HEIGHT * (1 - high[k] / top), barWidth, HEIGHT * (high[k] - low[k]) / top,
                    "#dddddd"));
        }
        for (int k = 0; k < bins; k++) {
            double h = HEIGHT * chi.observed()[k] / top;
            s.append(rect(x0 + k * barWidth + 1, y0 + HEIGHT - h, barWidth - 2, h, "#4a7ab7"));
        }
        for (int k = 0; k < bins; k++) {
            double e = y0 + HEIGHT * (1 - chi.expected()[k] / top);
            s.append(line(x0 + k * barWidth, e, x0 + (k + 1) * barWidth, e, "#333333"));
        }
        axes(s, x0, y0);
        s.append(text(x0, y0 + HEIGHT + 14, "rank bins (" + bins + "); grey: 99% interval of a bin count"));
    }

    private static void ecdf(StringBuilder s, int[] histogram, EcdfBand band, int x0, int y0) {
        int l = histogram.length - 1;
        int n = band.samples();
        int[] below = EcdfBand.countsBelow(histogram);
        double extent = 0;
        for (int k = 1; k <= l; k++) {
            double z = k / (l + 1.0);
            extent = Math.max(extent, Math.max(Math.abs((double) below[k] / n - z),
                    Math.max(Math.abs((double) band.lower(k) / n - z), Math.abs((double) band.upper(k) / n - z))));
        }
        extent *= 1.1;
        StringBuilder upper = new StringBuilder();
        StringBuilder lower = new StringBuilder();
        StringBuilder observed = new StringBuilder();
        for (int k = 1; k <= l; k++) {
            double z = k / (l + 1.0);
            double x = x0 + PANEL * z;
            upper.append(point(x, y(y0, (double) band.upper(k) / n - z, extent)));
            lower.insert(0, point(x, y(y0, (double) band.lower(k) / n - z, extent)));
            observed.append(point(x, y(y0, (double) below[k] / n - z, extent)));
        }
        s.append("<polygon points=\"").append(upper).append(lower).append("\" fill=\"#dddddd\"/>\n");
        s.append(line(x0, y(y0, 0, extent), x0 + PANEL, y(y0, 0, extent), "#333333"));
        s.append("<polyline points=\"").append(observed).append("\" fill=\"none\" stroke=\"#4a7ab7\" stroke-width=\"1.5\"/>\n");
        axes(s, x0, y0);
        s.append(text(x0, y0 + HEIGHT + 14, String.format(Locale.ROOT,
                "ECDF(z) - z; grey: simultaneous %.4g band", 1 - band.alpha())));
    }

    private static double y(int y0, double value, double extent) {
        return y0 + HEIGHT / 2.0 * (1 - value / extent);
    }

    private static void axes(StringBuilder s, int x0, int y0) {
        s.append("<rect x=\"").append(x0).append("\" y=\"").append(y0).append("\" width=\"").append(PANEL)
                .append("\" height=\"").append(HEIGHT).append("\" fill=\"none\" stroke=\"#888888\"/>\n");
    }

    private static String point(double x, double y) {
        return String.format(Locale.ROOT, "%.1f,%.1f ", x, y);
    }

    private static String rect(double x, double y, double w, double h, String fill) {
        return String.format(Locale.ROOT, "<rect x=\"%.1f\" y=\"%.1f\" width=\"%.1f\" height=\"%.1f\" fill=\"%s\"/>\n",
                x, y, Math.max(0, w), Math.max(0, h), fill);
    }

    private static String line(double x1, double y1, double x2, double y2, String stroke) {
        return String.format(Locale.ROOT, "<line x1=\"%.1f\" y1=\"%.1f\" x2=\"%.1f\" y2=\"%.1f\" stroke=\"%s\"/>\n",
                x1, y1, x2, y2, stroke);
    }

    private static String text(double x, double y, String content) {
        return String.format(Locale.ROOT, "<text x=\"%.1f\" y=\"%.1f\">%s</text>\n", x, y, content);
    }

    private static String escape(String text) {
        return text.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;");
    }
}
