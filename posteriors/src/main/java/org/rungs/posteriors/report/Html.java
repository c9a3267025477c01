package org.rungs.posteriors.report;

import java.util.List;
import java.util.Locale;
import org.rungs.posteriors.ProbabilityText;

/** Escaping and number formatting for the report page; every text from the data passes through {@link #escape}. */
final class Html {
    private Html() {
    }

    /** Text as HTML (and XML) character data or attribute value: a label {@code <b>x</b>} shows as text. */
    static String escape(String text) {
        StringBuilder sb = new StringBuilder(text.length() + 16);
        for (int i = 0; i < text.length(); i++) {
            char ch = text.charAt(i);
            switch (ch) {
                case '<' -> sb.append("&lt;");
                case '>' -> sb.append("&gt;");
                case '&' -> sb.append("&amp;");
                case '"' -> sb.append("&quot;");
                case '\'' -> sb.append("&#39;");
                default -> sb.append(ch);
            }
        }
        return sb.toString();
    }

    /** A number with the given decimals, or an en dash when it is not finite. */
    static String number(double value, int decimals) {
        if (!Double.isFinite(value)) {
            return "&ndash;";
        }
        return String.format(Locale.ROOT, "%." + decimals + "f", value);
    }

    /** A computed probability as {@link ProbabilityText#of} ("&gt; 0.99", never 1.00), or an en dash when it is not a number. */
    static String probability(double p, int decimals) {
        return Double.isFinite(p) ? escape(ProbabilityText.of(p, decimals)) : "&ndash;";
    }

    /** A share of posterior draws as {@link ProbabilityText#ofDraws} ("all draws", never 1.00), or an en dash. */
    static String drawShare(double share, int decimals) {
        return Double.isFinite(share) ? escape(ProbabilityText.ofDraws(share, decimals)) : "&ndash;";
    }

    /** {@code mean [q5, q95]}. */
    static String interval(double mean, double low, double high, int decimals) {
        return number(mean, decimals) + " <span class=\"int\">[" + number(low, decimals) + ", " + number(high, decimals)
                + "]</span>";
    }

    /** Opens a table with the given header cells (already HTML). */
    static void tableHead(StringBuilder out, String cssClass, List<String> headers) {
        out.append("<table class=\"").append(cssClass).append("\"><thead><tr>");
        for (String h : headers) {
            out.append("<th>").append(h).append("</th>");
        }
        out.append("</tr></thead><tbody>\n");
    }

    /** One table row of cells (already HTML). */
    static void row(StringBuilder out, String... cells) {
        out.append("<tr>");
        for (String cell : cells) {
            out.append("<td>").append(cell).append("</td>");
        }
        out.append("</tr>\n");
    }

    static void tableEnd(StringBuilder out) {
        out.append("</tbody></table>\n");
    }
}
