package org.rungs.posteriors;

import java.io.Closeable;
import java.io.IOException;
import java.io.Reader;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;

/** RFC 4180 records: quoting for writing, a record reader that reports the line of a fault. */
final class Csv implements Closeable {
    private final Reader in;
    private final String source;
    private final List<String> fields = new ArrayList<>();
    private final StringBuilder field = new StringBuilder();
    private int line = 1;
    private int recordLine;
    private int pushedBack = -2;

    private Csv(Reader in, String source) {
        this.in = in;
        this.source = source;
    }

    static Csv open(Path file) throws IOException {
        return new Csv(Files.newBufferedReader(file), file.toString());
    }

    /** The fields of the next record (reused between calls), or null at the end of the input. */
    List<String> next() throws IOException {
        int ch = read();
        if (ch == -1) {
            return null;
        }
        fields.clear();
        recordLine = line;
        while (true) {
            field.setLength(0);
            if (ch == '"') {
                ch = readQuoted();
                if (ch != ',' && ch != '\n' && ch != '\r' && ch != -1) {
                    throw fault("unexpected character '" + (char) ch + "' after a closing quote");
                }
            } else {
                while (ch != ',' && ch != '\n' && ch != '\r' && ch != -1) {
                    if (ch == '"') {
                        throw fault("a quote inside an unquoted field");
                    }
                    field.append((char) ch);
                    ch = read();
                }
            }
            fields.add(field.toString());
            if (ch != ',') {
                break;
            }
            ch = read();
        }
        if (ch == '\r') {
            int after = read();
            if (after != '\n' && after != -1) {
                pushedBack = after;
            }
        }
        if (ch != -1) {
            line++;
        }
        return fields;
    }

    /** Physical line (1-based) where the record last returned by {@link #next()} starts. */
    int recordLine() {
        return recordLine;
    }

    /** An IOException naming the file and line of the current record. */
    IOException fault(String message) {
        return new IOException(source + ": line " + recordLine + ": " + message);
    }

    @Override
    public void close() throws IOException {
        in.close();
    }

    /** Reads a quoted field after its opening quote; returns the character after the closing quote. */
    private int readQuoted() throws IOException {
        while (true) {
            int ch = read();
            if (ch == -1) {
                throw fault("a quoted field is not closed before the end of the file");
            }
            if (ch == '"') {
                int after = read();
                if (after != '"') {
                    return after;
                }
            } else if (ch == '\n') {
                line++;
            }
            field.append((char) ch);
        }
    }

    private int read() throws IOException {
        if (pushedBack != -2) {
            int ch = pushedBack;
            pushedBack = -2;
            return ch;
        }
        return in.read();
    }
}
