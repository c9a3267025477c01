package org.rungs.posteriors;

/** A text field as every file of a fit writes it (RFC 4180). */
public final class CsvField {
    private CsvField() {
    }

    /** The field as written: quoted, with quotes doubled, when it holds a comma, quote or line break. */
    public static String quote(String value) {
        for (int i = 0; i < value.length(); i++) {
            char ch = value.charAt(i);
            if (ch == ',' || ch == '"' || ch == '\n' || ch == '\r') {
                return '"' + value.replace("\"", "\"\"") + '"';
            }
        }
        return value;
    }
}
