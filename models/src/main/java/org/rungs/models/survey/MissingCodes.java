package org.rungs.models.survey;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;

/**
 * The values meaning "missing" in one column: an empty cell, {@code NA}, and the declared codes.
 * Values and codes are compared without the {@link Blanks} at their ends, so a cell of only spaces
 * is empty. In a column of numbers a code that is a number also matches the same number written
 * otherwise ({@code 98} matches {@code 98.0}); in a column of text (group labels, categorical
 * covariates) a code matches only the same text, so the code {@code 1} leaves the labels
 * {@code 01} and {@code 1.0} alone (our rule: labels are names, not numbers).
 */
final class MissingCodes {
    private final byte[][] texts;
    private final double[] numbers;

    MissingCodes(List<String> codes) {
        List<byte[]> t = new ArrayList<>();
        t.add("NA".getBytes(StandardCharsets.UTF_8));
        List<Double> n = new ArrayList<>();
        DecimalScanner scanner = new DecimalScanner();
        for (String code : codes) {
            byte[] bytes = Blanks.strip(code).getBytes(StandardCharsets.UTF_8);
            t.add(bytes);
            if (scanner.scan(bytes, 0, bytes.length) == DecimalScanner.Kind.NUMBER) {
                n.add(scanner.value());
            }
        }
        texts = t.toArray(new byte[0][]);
        numbers = n.stream().mapToDouble(Double::doubleValue).toArray();
    }

    /** Whether {@code bytes[from, to)} is missing in a column of text: empty, NA or a code as written. */
    boolean matchesText(byte[] bytes, int from, int to) {
        from = Blanks.start(bytes, from, to);
        to = Blanks.end(bytes, from, to);
        if (from == to) {
            return true;
        }
        for (byte[] text : texts) {
            if (Arrays.equals(text, 0, text.length, bytes, from, to)) {
                return true;
            }
        }
        return false;
    }

    /**
     * Whether {@code bytes[from, to)} is a number equal to a code that is a number; with
     * {@link #matchesText}, whether it is missing in a column of numbers.
     */
    boolean matchesAsNumber(byte[] bytes, int from, int to, DecimalScanner scanner) {
        if (numbers.length == 0) {
            return false;
        }
        from = Blanks.start(bytes, from, to);
        to = Blanks.end(bytes, from, to);
        if (scanner.scan(bytes, from, to) == DecimalScanner.Kind.NUMBER) {
            double v = scanner.value();
            for (double code : numbers) {
                if (v == code) {
                    return true;
                }
            }
        }
        return false;
    }

    /** Whether a code that is a number lies in {@code [lowest, highest]}. */
    boolean anyNumberWithin(double lowest, double highest) {
        for (double code : numbers) {
            if (code >= lowest && code <= highest) {
                return true;
            }
        }
        return false;
    }
}
