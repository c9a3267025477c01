package org.rungs.sampler.run;

/** Text from a data file made safe for a terminal: control characters become visible escapes. */
final class Printable {
    private Printable() {
    }

    static String of(String text) {
        StringBuilder sb = new StringBuilder(text.length());
        for (int i = 0; i < text.length(); i++) {
            char c = text.charAt(i);
            if (c < 0x20 || c == 0x7f) {
                sb.append(String.format("\\u%04x", (int) c));
            } else {
                sb.append(c);
            }
        }
        return sb.toString();
    }
}
