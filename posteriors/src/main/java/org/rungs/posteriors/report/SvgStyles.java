package org.rungs.posteriors.report;

import java.util.LinkedHashMap;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * Moves the inline {@code style='...'} attributes that the SVG renderer writes on every element
 * into one page style sheet of numbered classes. A chart repeats a handful of styles hundreds of
 * times, so this shrinks a page of 150 small charts severalfold; the look is unchanged.
 */
final class SvgStyles {
    /** An attribute in single quotes, as the SVG renderer writes them; the page's own HTML uses double quotes. */
    private static final Pattern STYLE = Pattern.compile(" style='([^']*)'");
    private static final Pattern TAG = Pattern.compile("<[a-zA-Z][^<>]*>");

    private SvgStyles() {
    }

    /** The page with styles replaced by classes, and the style sheet for them. */
    record Result(String html, String css) {
    }

    static Result extract(String html) {
        Map<String, String> classByStyle = new LinkedHashMap<>();
        StringBuilder out = new StringBuilder(html.length());
        Matcher tag = TAG.matcher(html);
        while (tag.find()) {
            String text = tag.group();
            Matcher style = STYLE.matcher(text);
            if (!style.find()) {
                continue;
            }
            String name = classByStyle.computeIfAbsent(style.group(1), s -> "s" + classByStyle.size());
            tag.appendReplacement(out, Matcher.quoteReplacement(
                    text.substring(0, style.start()) + " class='" + name + "'" + text.substring(style.end())));
        }
        tag.appendTail(out);
        StringBuilder css = new StringBuilder();
        for (Map.Entry<String, String> entry : classByStyle.entrySet()) {
            css.append("svg .").append(entry.getValue()).append('{').append(entry.getKey()).append("}\n");
        }
        return new Result(out.toString(), css.toString());
    }
}
