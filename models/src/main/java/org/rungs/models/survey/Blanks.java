package org.rungs.models.survey;

/**
 * What is cut from both ends of a label or a missing code before it is compared: ASCII space and
 * tab, and the characters a reader cannot see, Unicode spaces (U+00A0 no-break space and the rest
 * of the separators Zs, Zl, Zp), U+200B zero-width space, U+200C and U+200D zero-width
 * non-joiner and joiner, U+2060 word joiner and U+FEFF, the byte-order mark (our rule:
 * "Dunsellow " and "Dunsellow" look the same in every table, so they are one group). Control
 * characters other than tab are never cut, so that the reader still stops at them.
 *
 * <p>Works on valid UTF-8 bytes in place, allocation-free: only the bounds move.
 */
final class Blanks {
    private static final int ZERO_WIDTH_SPACE = 0x200B;
    private static final int ZERO_WIDTH_JOINER = 0x200D;
    private static final int WORD_JOINER = 0x2060;
    private static final int BYTE_ORDER_MARK = 0xFEFF;

    private Blanks() {
    }

    /** The first index of {@code bytes[from, to)} after its leading blanks. */
    static int start(byte[] bytes, int from, int to) {
        while (from < to) {
            int b = bytes[from];
            if (b >= 0) {
                if (b != ' ' && b != '\t') {
                    return from;
                }
                from++;
                continue;
            }
            int length = length(b);
            if (from + length > to || !isBlank(codePoint(bytes, from, length))) {
                return from;
            }
            from += length;
        }
        return from;
    }

    /** The end of {@code bytes[from, to)} before its trailing blanks; {@code from} must be {@link #start}'s. */
    static int end(byte[] bytes, int from, int to) {
        while (to > from) {
            int b = bytes[to - 1];
            if (b >= 0) {
                if (b != ' ' && b != '\t') {
                    return to;
                }
                to--;
                continue;
            }
            int first = to - 1;
            while (first > from && (bytes[first] & 0xC0) == 0x80) {
                first--;
            }
            int length = length(bytes[first]);
            if (first + length != to || !isBlank(codePoint(bytes, first, length))) {
                return to;
            }
            to = first;
        }
        return to;
    }

    /** {@code s} without the blanks at its ends. */
    static String strip(String s) {
        int from = 0;
        int to = s.length();
        while (from < to && isBlank(s.codePointAt(from))) {
            from += Character.charCount(s.codePointAt(from));
        }
        while (to > from && isBlank(s.codePointBefore(to))) {
            to -= Character.charCount(s.codePointBefore(to));
        }
        return s.substring(from, to);
    }

    static boolean isBlank(int codePoint) {
        return codePoint == ' ' || codePoint == '\t' || codePoint >= ZERO_WIDTH_SPACE && codePoint <= ZERO_WIDTH_JOINER
                || codePoint == WORD_JOINER || codePoint == BYTE_ORDER_MARK
                || codePoint >= 0x80 && Character.isSpaceChar(codePoint);
    }

    /** Bytes of the UTF-8 sequence led by {@code lead}; 1 for a stray continuation byte. */
    private static int length(int lead) {
        int b = lead & 0xFF;
        return b >= 0xF0 ? 4 : b >= 0xE0 ? 3 : b >= 0xC0 ? 2 : 1;
    }

    private static int codePoint(byte[] bytes, int at, int length) {
        int b = bytes[at] & 0xFF;
        return switch (length) {
            case 2 -> (b & 0x1F) << 6 | bytes[at + 1] & 0x3F;
            case 3 -> (b & 0x0F) << 12 | (bytes[at + 1] & 0x3F) << 6 | bytes[at + 2] & 0x3F;
            case 4 -> (b & 0x07) << 18 | (bytes[at + 1] & 0x3F) << 12 | (bytes[at + 2] & 0x3F) << 6 | bytes[at + 3] & 0x3F;
            default -> -1;
        };
    }
}
