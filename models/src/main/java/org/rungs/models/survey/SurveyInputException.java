package org.rungs.models.survey;

import java.nio.file.Path;

/**
 * A survey file that cannot be read as specified. The message has the form
 * {@code FILE, row R, column "C": <what is wrong>; expected <what was expected>}, leaving out the
 * row and column when the problem is not about one.
 */
public final class SurveyInputException extends Exception {
    private static final long serialVersionUID = 1L;

    private final transient Path file;
    private final long row;
    private final String column;
    private final String problem;
    private final String expected;

    /**
     * @param row the 1-based line of the file, the header being row 1: where the record starts
     *     (a quoted field may span lines), where an unterminated quote opened, or where invalid
     *     UTF-8 was met; 0 when the problem is not about a row
     * @param column the column concerned, or null
     */
    public SurveyInputException(Path file, long row, String column, String problem, String expected) {
        this(file, row, column, problem, expected, null);
    }

    public SurveyInputException(Path file, long row, String column, String problem, String expected, Throwable cause) {
        super(message(file, row, column, problem, expected), cause);
        this.file = file;
        this.row = row;
        this.column = column;
        this.problem = problem;
        this.expected = expected;
    }

    private static String message(Path file, long row, String column, String problem, String expected) {
        StringBuilder out = new StringBuilder(String.valueOf(file));
        if (row > 0) {
            out.append(", row ").append(row);
        }
        if (column != null) {
            out.append(", column ").append(Text.quote(column));
        }
        return out.append(": ").append(problem).append("; expected ").append(expected).toString();
    }

    public Path file() {
        return file;
    }

    /** The 1-based line of the file (header = 1) the problem is on, or 0 when not about a row. */
    public long row() {
        return row;
    }

    /** The column concerned, or null. */
    public String column() {
        return column;
    }

    /** What is wrong, without file, row and column. */
    public String problem() {
        return problem;
    }

    /** What was expected instead. */
    public String expected() {
        return expected;
    }
}
