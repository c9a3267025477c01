package org.rungs.models.survey;

import java.util.ArrayList;
import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * Rows dropped for missing values. {@code missingByColumn} lists every used column in the order of
 * the specification with its number of missing values; a row missing several used columns is
 * counted under each, so the counts may add up to more than {@link #rowsExcluded()}.
 * {@code answersDeclaredMissing} counts, per rating of the scale, the answers that a missing code
 * of the rating column made missing (only ratings with some, in the scale's order).
 */
public record Exclusions(long rowsRead, long rowsUsed, Map<String, Long> missingByColumn,
        Map<Integer, Long> answersDeclaredMissing) {

    public Exclusions {
        if (rowsRead < 0 || rowsUsed < 0 || rowsUsed > rowsRead) {
            throw new IllegalArgumentException("rows used " + rowsUsed + " of rows read " + rowsRead);
        }
        missingByColumn = Collections.unmodifiableMap(new LinkedHashMap<>(missingByColumn));
        answersDeclaredMissing = Collections.unmodifiableMap(new LinkedHashMap<>(answersDeclaredMissing));
    }

    /** No answer on the scale declared missing. */
    public Exclusions(long rowsRead, long rowsUsed, Map<String, Long> missingByColumn) {
        this(rowsRead, rowsUsed, missingByColumn, Map.of());
    }

    /** Nothing excluded from {@code rows} rows. */
    public static Exclusions none(long rows) {
        return new Exclusions(rows, rows, Map.of());
    }

    public long rowsExcluded() {
        return rowsRead - rowsUsed;
    }

    /** One paragraph for stderr, e.g. "Read 1000 rows; used 950 and excluded 50 for missing values: ...". */
    public String describe() {
        if (rowsExcluded() == 0) {
            return "Read " + rows(rowsRead) + "; used all of them (no missing values in the columns used).";
        }
        List<String> parts = new ArrayList<>();
        for (Map.Entry<String, Long> e : missingByColumn.entrySet()) {
            if (e.getValue() > 0) {
                parts.add(e.getValue() + " missing " + Text.quote(e.getKey()));
            }
        }
        return "Read " + rows(rowsRead) + "; used " + rowsUsed + " and excluded " + rowsExcluded()
                + " for missing values (" + String.join(", ", parts)
                + "; a row missing several columns is counted under each).";
    }

    private static String rows(long n) {
        return n == 1 ? "1 row" : n + " rows";
    }
}
