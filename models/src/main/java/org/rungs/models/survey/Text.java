package org.rungs.models.survey;

import java.util.List;

/** Quoting of file text inside error messages, so that control characters stay visible. */
public final class Text {

    /** Longer values are cut in messages: a stray binary field must not flood the terminal. */
    private static final int MAX_SHOWN = 60;

    private Text() {
    }

    /** {@code s} in double quotes, with quotes, backslashes and control characters escaped. */
    public static String quote(String s) {
        return "\"" + escape(s) + "\"";
    }

    /** {@code "a", "b" and "c"}. */
    static String quoteAll(List<String> items) {
        StringBuilder out = new StringBuilder();
        for (int i = 0; i < items.size(); i++) {
            if (i > 0) {
                out.append(i == items.size() - 1 ? " and " : ", ");
            }
            out.append(quote(items.get(i)));
        }
        return out.toString();
    }

    public static String escape(String s) {
        StringBuilder out = new StringBuilder();
        int shown = Math.min(s.length(), MAX_SHOWN);
        for (int i = 0; i < shown; i++) {
            char c = s.charAt(i);
            switch (c) {
                case '"' -> out.append("\\\"");
                case '\\' -> out.append("\\\\");
                case '\t' -> out.append("\\t");
                case '\n' -> out.append("\\n");
                case '\r' -> out.append("\\r");
                default -> {
                    if (Character.isISOControl(c)) {
                        out.append(String.format("\\u%04x", (int) c));
                    } else {
                        out.append(c);
                    }
                }
            }
        }
        if (shown < s.length()) {
            out.append("...");
        }
        return out.toString();
    }
}
