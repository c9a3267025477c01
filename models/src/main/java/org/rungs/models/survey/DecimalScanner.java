package org.rungs.models.survey;

import java.nio.charset.StandardCharsets;

/**
 * Reads a decimal number from bytes without creating a String in the common case. Numbers with at
 * most 2^53 as significand and a power of ten within 10^±22 are converted exactly by one
 * correctly rounded multiplication or division (Clinger 1990, "How to read floating point numbers
 * accurately", PLDI, the fast path); the rest go to {@link Double#parseDouble}, so every result is
 * the correctly rounded double. One instance is reused for every field.
 */
final class DecimalScanner {

    /** What a field holds. */
    enum Kind {
        /** A finite number of magnitude at most {@link Covariates#MAX_MAGNITUDE}. */
        NUMBER,
        /** NaN, Inf, Infinity, or a number that overflows a double. */
        NOT_FINITE,
        /** Finite but larger in magnitude than {@link Covariates#MAX_MAGNITUDE}. */
        TOO_LARGE,
        /** Digits with a comma, such as {@code 3,5} or {@code 1,234.5}: a decimal comma or thousands separator. */
        DECIMAL_COMMA,
        /** Anything else, including an empty field. */
        TEXT
    }

    private static final double[] POWERS_OF_TEN = {
        1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11,
        1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22,
    };
    private static final long EXACT_SIGNIFICAND = 1L << 53;
    private static final int MAX_DIGITS = 18;

    private double value;
    private long significand;
    private int significantDigits;
    private int exponent;
    private boolean truncated;

    /** The value of the last field scanned as {@link Kind#NUMBER} or {@link Kind#TOO_LARGE}. */
    double value() {
        return value;
    }

    /** Classifies {@code bytes[from, to)}, ignoring spaces and tabs around it. */
    Kind scan(byte[] bytes, int from, int to) {
        while (from < to && isBlank(bytes[from])) {
            from++;
        }
        while (to > from && isBlank(bytes[to - 1])) {
            to--;
        }
        if (from == to) {
            return Kind.TEXT;
        }
        int i = from;
        boolean negative = bytes[i] == '-';
        if (negative || bytes[i] == '+') {
            i++;
        }
        significand = 0;
        significantDigits = 0;
        exponent = 0;
        truncated = false;
        boolean anyDigit = false;
        while (i < to && isDigit(bytes[i])) {
            addDigit(bytes[i] - '0', false);
            anyDigit = true;
            i++;
        }
        if (i < to && bytes[i] == '.') {
            i++;
            while (i < to && isDigit(bytes[i])) {
                addDigit(bytes[i] - '0', true);
                anyDigit = true;
                i++;
            }
        }
        if (anyDigit && i < to && (bytes[i] == 'e' || bytes[i] == 'E')) {
            i++;
            boolean negativeExponent = i < to && bytes[i] == '-';
            if (i < to && (bytes[i] == '-' || bytes[i] == '+')) {
                i++;
            }
            int start = i;
            int e = 0;
            while (i < to && isDigit(bytes[i])) {
                e = Math.min(e * 10 + (bytes[i] - '0'), 100_000);
                i++;
            }
            if (i == start) {
                return classifyWord(bytes, from, to);
            }
            exponent += negativeExponent ? -e : e;
        }
        if (!anyDigit || i != to) {
            return classifyWord(bytes, from, to);
        }
        double v;
        if (significand == 0) {
            v = 0;
        } else if (!truncated && significand < EXACT_SIGNIFICAND && Math.abs(exponent) <= 22) {
            v = exponent >= 0 ? significand * POWERS_OF_TEN[exponent] : significand / POWERS_OF_TEN[-exponent];
        } else {
            v = Math.abs(Double.parseDouble(new String(bytes, from, to - from, StandardCharsets.ISO_8859_1)));
        }
        value = negative ? -v : v;
        if (Double.isInfinite(v)) {
            return Kind.NOT_FINITE;
        }
        return v > Covariates.MAX_MAGNITUDE ? Kind.TOO_LARGE : Kind.NUMBER;
    }

    private void addDigit(int digit, boolean fraction) {
        if (significand == 0 && digit == 0) {
            if (fraction) {
                exponent--;
            }
            return;
        }
        if (significantDigits < MAX_DIGITS) {
            significand = significand * 10 + digit;
            significantDigits++;
            if (fraction) {
                exponent--;
            }
        } else {
            truncated = true;
            if (!fraction) {
                exponent++;
            }
        }
    }

    private static Kind classifyWord(byte[] bytes, int from, int to) {
        int i = from;
        if (bytes[i] == '-' || bytes[i] == '+') {
            i++;
        }
        if (equalsIgnoreCase(bytes, i, to, "nan") || equalsIgnoreCase(bytes, i, to, "inf")
                || equalsIgnoreCase(bytes, i, to, "infinity")) {
            return Kind.NOT_FINITE;
        }
        if (i < to && isDigit(bytes[i]) && isDigit(bytes[to - 1])) {
            boolean comma = false;
            for (int k = i; k < to; k++) {
                byte b = bytes[k];
                if (b == ',') {
                    comma = true;
                } else if (b != '.' && !isDigit(b)) {
                    return Kind.TEXT;
                }
            }
            if (comma) {
                return Kind.DECIMAL_COMMA;
            }
        }
        return Kind.TEXT;
    }

    private static boolean equalsIgnoreCase(byte[] bytes, int from, int to, String word) {
        if (to - from != word.length()) {
            return false;
        }
        for (int k = 0; k < word.length(); k++) {
            if (Character.toLowerCase((char) bytes[from + k]) != word.charAt(k)) {
                return false;
            }
        }
        return true;
    }

    private static boolean isDigit(byte b) {
        return b >= '0' && b <= '9';
    }

    static boolean isBlank(byte b) {
        return b == ' ' || b == '\t';
    }
}
