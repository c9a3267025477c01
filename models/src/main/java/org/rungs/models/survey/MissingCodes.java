package org.rungs.models.survey;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;

/**
 * The values meaning "missing" in one column: an empty cell, {@code NA}, and the declared codes,
 * each matching textually or, when it is a number, numerically ({@code 98} matches {@code 98.0}).
 * Spaces and tabs around a value are ignored.
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
            byte[] bytes = code.strip().getBytes(StandardCharsets.UTF_8);
            t.add(bytes);
            if (scanner.scan(bytes, 0, bytes.length) == DecimalScanner.Kind.NUMBER) {
                n.add(scanner.value());
            }
        }
        texts = t.toArray(new byte[0][]);
        numbers = n.stream().mapToDouble(Double::doubleValue).toArray();
    }

    boolean matches(byte[] bytes, int from, int to, DecimalScanner scanner) {
        while (from < to && DecimalScanner.isBlank(bytes[from])) {
            from++;
        }
        while (to > from && DecimalScanner.isBlank(bytes[to - 1])) {
            to--;
        }
        if (from == to) {
            return true;
        }
        for (byte[] text : texts) {
            if (Arrays.equals(text, 0, text.length, bytes, from, to)) {
                return true;
            }
        }
        if (numbers.length > 0 && scanner.scan(bytes, from, to) == DecimalScanner.Kind.NUMBER) {
            double v = scanner.value();
            for (double code : numbers) {
                if (v == code) {
                    return true;
                }
            }
        }
        return false;
    }
}
