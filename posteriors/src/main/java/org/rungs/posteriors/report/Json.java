package org.rungs.posteriors.report;

import java.io.IOException;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * A small reader of RFC 8259 JSON, enough for run.json: objects become ordered maps, arrays
 * lists, numbers doubles, and true/false/null Boolean and null. Hand-written so that the report
 * needs no JSON library for one file of a few dozen keys.
 */
final class Json {
    /** Longer values are cut in messages: a stray binary value must not flood the terminal. */
    private static final int MAX_SHOWN = 60;

    private final String source;
    private final String text;
    private int at;

    private Json(String source, String text) {
        this.source = source;
        this.text = text;
    }

    /**
     * Reads and parses a file (run.json).
     *
     * @throws IOException when it cannot be read or is malformed; the message names the file by its
     *                     full path, and the row and column where the text goes wrong
     */
    static Object read(Path file) throws IOException {
        Path path = file.toAbsolutePath();
        String text;
        try {
            text = Files.readString(file, StandardCharsets.UTF_8);
        } catch (CharacterCodingException e) {
            throw new IOException(path + ": expected JSON text in UTF-8, found bytes that are not UTF-8", e);
        }
        return parse(path.toString(), text);
    }

    static Object parse(String text) throws IOException {
        return parse("JSON text", text);
    }

    private static Object parse(String source, String text) throws IOException {
        Json json = new Json(source, text);
        Object value = json.value();
        json.skipSpace();
        if (json.at != text.length()) {
            throw json.fault("unexpected text after the value");
        }
        return value;
    }

    /** The value at a dotted path of object keys ({@code "input.rows_used"}), or null when absent. */
    static Object at(Object root, String path) {
        Object node = root;
        for (String key : path.split("\\.")) {
            if (!(node instanceof Map<?, ?> map)) {
                return null;
            }
            node = map.get(key);
        }
        return node;
    }

    private Object value() throws IOException {
        skipSpace();
        if (at >= text.length()) {
            throw fault("a value is missing");
        }
        char ch = text.charAt(at);
        switch (ch) {
            case '{':
                return object();
            case '[':
                return array();
            case '"':
                return string();
            case 't':
                return literal("true", Boolean.TRUE);
            case 'f':
                return literal("false", Boolean.FALSE);
            case 'n':
                return literal("null", null);
            default:
                return number();
        }
    }

    private Map<String, Object> object() throws IOException {
        Map<String, Object> map = new LinkedHashMap<>();
        at++;
        skipSpace();
        if (peek() == '}') {
            at++;
            return map;
        }
        while (true) {
            skipSpace();
            if (peek() != '"') {
                throw fault("an object key must be a string");
            }
            String key = string();
            skipSpace();
            expect(':');
            map.put(key, value());
            skipSpace();
            if (peek() == ',') {
                at++;
            } else {
                expect('}');
                return map;
            }
        }
    }

    private List<Object> array() throws IOException {
        List<Object> list = new ArrayList<>();
        at++;
        skipSpace();
        if (peek() == ']') {
            at++;
            return list;
        }
        while (true) {
            list.add(value());
            skipSpace();
            if (peek() == ',') {
                at++;
            } else {
                expect(']');
                return list;
            }
        }
    }

    private String string() throws IOException {
        StringBuilder sb = new StringBuilder();
        at++;
        while (at < text.length()) {
            char ch = text.charAt(at++);
            if (ch == '"') {
                return sb.toString();
            }
            if (ch != '\\') {
                sb.append(ch);
                continue;
            }
            if (at >= text.length()) {
                break;
            }
            char escape = text.charAt(at++);
            switch (escape) {
                case 'n' -> sb.append('\n');
                case 't' -> sb.append('\t');
                case 'r' -> sb.append('\r');
                case 'b' -> sb.append('\b');
                case 'f' -> sb.append('\f');
                case 'u' -> {
                    if (at + 4 > text.length()) {
                        throw fault("a \\u escape needs four hex digits");
                    }
                    try {
                        sb.append((char) Integer.parseInt(text.substring(at, at + 4), 16));
                    } catch (NumberFormatException e) {
                        throw fault("a \\u escape needs four hex digits");
                    }
                    at += 4;
                }
                default -> sb.append(escape);
            }
        }
        throw fault("a string is not closed");
    }

    private Object literal(String word, Object value) throws IOException {
        if (!text.startsWith(word, at)) {
            throw fault("unexpected character " + quote(String.valueOf(text.charAt(at))));
        }
        at += word.length();
        return value;
    }

    private Double number() throws IOException {
        int start = at;
        while (at < text.length() && "+-0123456789.eE".indexOf(text.charAt(at)) >= 0) {
            at++;
        }
        try {
            return Double.valueOf(text.substring(start, at));
        } catch (NumberFormatException e) {
            at = start;
            throw fault("expected a value, found " + quote(String.valueOf(text.charAt(at))));
        }
    }

    private void expect(char ch) throws IOException {
        if (peek() != ch) {
            throw fault("expected '" + ch + "'");
        }
        at++;
    }

    private char peek() {
        return at < text.length() ? text.charAt(at) : '\0';
    }

    private void skipSpace() {
        while (at < text.length() && Character.isWhitespace(text.charAt(at))) {
            at++;
        }
    }

    /** The source, then the row and column (1-based, counted in characters) of {@code at}. */
    private IOException fault(String message) {
        int end = Math.min(at, text.length());
        int row = 1;
        int rowStart = 0;
        for (int i = 0; i < end; i++) {
            if (text.charAt(i) == '\n') {
                row++;
                rowStart = i + 1;
            }
        }
        return new IOException(source + ", row " + row + ", column " + (end - rowStart + 1) + ": " + message);
    }

    /**
     * {@code s} as a JSON string, quotes included, for a message: quotes, backslashes and control
     * characters escaped, so that text read from a file never sends raw control characters to the
     * terminal; cut after 60 characters.
     */
    static String quote(String s) {
        return "\"" + escape(s) + "\"";
    }

    /** {@code s} with quotes, backslashes and control characters escaped as in JSON; cut after 60 characters. */
    static String escape(String s) {
        return escape(s, MAX_SHOWN);
    }

    /** {@code s} with quotes, backslashes and control characters escaped as in JSON; cut after {@code longest} characters. */
    static String escape(String s, int longest) {
        StringBuilder out = new StringBuilder();
        int shown = Math.min(s.length(), longest);
        for (int i = 0; i < shown; i++) {
            char c = s.charAt(i);
            switch (c) {
                case '"' -> out.append("\\\"");
                case '\\' -> out.append("\\\\");
                case '\t' -> out.append("\\t");
                case '\n' -> out.append("\\n");
                case '\r' -> out.append("\\r");
                default -> out.append(Character.isISOControl(c) ? String.format(Locale.ROOT, "\\u%04x", (int) c)
                        : String.valueOf(c));
            }
        }
        return shown < s.length() ? out.append("...").toString() : out.toString();
    }
}
