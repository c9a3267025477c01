package org.rungs.models.survey;

import java.io.EOFException;
import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.zip.ZipException;

/**
 * Splits delimited text into records and fields, streaming over a byte buffer: RFC 4180 quoting
 * (doubled quotes, delimiters and line breaks inside quotes), CRLF, LF or CR line ends, a UTF-8
 * byte-order mark, and UTF-8 validation of every byte. The delimiter is read off the header line:
 * tab if it has one, else comma, else semicolon if it has one. Empty lines are skipped. The bytes
 * of the kept fields of the current record are copied into {@link #data}; field {@code k} spans
 * {@code data[start[k], end[k])}.
 *
 * <p>A record (a line, or several when a quoted field holds line breaks) longer than
 * {@link SurveyReader#MAX_RECORD_BYTES} stops the reading as soon as it passes that length, and
 * a header of more than {@link SurveyReader#MAX_COLUMNS} columns stops it too, so a hostile file
 * costs bounded memory and time per record.
 */
final class DelimitedTokenizer {
    private static final int EOF = -1;

    private final InputStream in;
    private final Path file;
    private final boolean gzip;
    private byte[] buffer = new byte[1 << 16];
    private int position;
    private int limit;
    /** Offset in the content of {@code buffer[0]}. */
    private long bufferOffset;
    /** Offset in the content where the current record starts, while one is being read. */
    private long recordOffset;
    private boolean inRecord;
    private boolean exhausted;
    private byte delimiter;
    private long line = 1;
    private int utf8Pending;
    private int utf8Low = 0x80;
    private int utf8High = 0xBF;
    private int utf8Lead;

    private boolean[] keep;
    /** Bytes of the kept fields of the current record. */
    byte[] data = new byte[1 << 10];
    private int dataLength;
    /** Start and end in {@link #data} of each field of the current record, by column. */
    int[] start = new int[16];
    int[] end = new int[16];
    /** Number of fields in the current record. */
    int fieldCount;
    /** Line of the file on which the current record starts (the header is line 1). */
    long recordLine;

    DelimitedTokenizer(InputStream in, Path file, boolean gzip) {
        this.in = in;
        this.file = file;
        this.gzip = gzip;
    }

    /** The header's column names, or null when the content has no non-empty line. */
    List<String> readHeader() throws SurveyInputException, IOException {
        int lineEnd = bufferFirstLine();
        if (limit - position >= 2 && ((buffer[position] & 0xFF) == 0xFE && (buffer[position + 1] & 0xFF) == 0xFF
                || (buffer[position] & 0xFF) == 0xFF && (buffer[position + 1] & 0xFF) == 0xFE)) {
            throw new SurveyInputException(file, 1, null, "the file starts with a UTF-16 byte-order mark",
                    "a UTF-8 text file (save it as UTF-8)");
        }
        if (limit - position >= 3 && (buffer[position] & 0xFF) == 0xEF && (buffer[position + 1] & 0xFF) == 0xBB
                && (buffer[position + 2] & 0xFF) == 0xBF) {
            position += 3;
        }
        delimiter = detectDelimiter(position, lineEnd);
        if (!next()) {
            return null;
        }
        List<String> names = new ArrayList<>(fieldCount);
        for (int k = 0; k < fieldCount; k++) {
            names.add(new String(data, start[k], end[k] - start[k], StandardCharsets.UTF_8));
        }
        return names;
    }

    /** The delimiter read off the header, in words: "commas", "tabs" or "semicolons". */
    String delimiterName() {
        return delimiter == '\t' ? "tabs" : delimiter == ';' ? "semicolons" : "commas";
    }

    /** Which columns to copy from now on; the others are only counted. */
    void keep(boolean[] columns) {
        keep = columns.clone();
        if (start.length < columns.length + 1) {
            start = new int[columns.length + 1];
            end = new int[columns.length + 1];
        }
    }

    /** Reads the next non-empty record; false at the end of the content. */
    boolean next() throws SurveyInputException, IOException {
        int c = peek();
        while (c == '\n' || c == '\r') {
            read();
            if (c == '\r' && peek() == '\n') {
                read();
            }
            line++;
            c = peek();
        }
        if (c == EOF) {
            return false;
        }
        recordLine = line;
        recordOffset = bufferOffset + position;
        inRecord = true;
        fieldCount = 0;
        dataLength = 0;
        while (true) {
            boolean kept = keep == null || fieldCount < keep.length && keep[fieldCount];
            int fieldStart = dataLength;
            c = read();
            if (c == '"') {
                c = quotedField(kept);
            } else {
                while (c != delimiter && c != '\n' && c != '\r' && c != EOF) {
                    if (kept) {
                        append(c);
                    }
                    copyPlain(kept, delimiter);
                    c = read();
                }
            }
            if (keep == null && fieldCount == SurveyReader.MAX_COLUMNS) {
                throw new SurveyInputException(file, recordLine, null, "the header has more than "
                        + SurveyReader.MAX_COLUMNS + " columns", "at most " + SurveyReader.MAX_COLUMNS
                        + " columns (is this a survey file with a header row?)");
            }
            if (fieldCount < start.length) {
                start[fieldCount] = fieldStart;
                end[fieldCount] = dataLength;
            } else if (keep == null) {
                start = Arrays.copyOf(start, 2 * start.length);
                end = Arrays.copyOf(end, 2 * end.length);
                start[fieldCount] = fieldStart;
                end[fieldCount] = dataLength;
            }
            fieldCount++;
            if (c != delimiter) {
                break;
            }
        }
        checkRecordLength(bufferOffset + position - (c == EOF ? 0 : 1));
        inRecord = false;
        if (c == '\r' && peek() == '\n') {
            read();
        }
        if (c != EOF) {
            line++;
        }
        return true;
    }

    /** Reads a quoted field after its opening quote; returns the byte that follows the closing quote. */
    private int quotedField(boolean kept) throws SurveyInputException, IOException {
        long opened = line;
        while (true) {
            copyPlain(kept, (byte) '"');
            int c = read();
            if (c == EOF) {
                throw new SurveyInputException(file, opened, null, "a quote opened on this row is never closed",
                        "a closing quote (a quote inside a quoted field is written twice: \"\")");
            }
            if (c == '"') {
                if (peek() != '"') {
                    break;
                }
                read();
            } else if (c == '\n' || c == '\r' && peek() != '\n') {
                line++;
            }
            if (kept) {
                append(c);
            }
        }
        int c = read();
        if (c != delimiter && c != '\n' && c != '\r' && c != EOF) {
            String shown = c < 0x80 ? Text.quote(String.valueOf((char) c)) : String.format("the byte 0x%02X", c);
            throw new SurveyInputException(file, recordLine, null, "a quoted field is followed by "
                    + shown + " instead of a delimiter or the end of the line",
                    "a delimiter or line end right after a closing quote (a quote inside a quoted field is written twice: \"\")");
        }
        return c;
    }

    /**
     * Fast path: consumes the buffered ASCII bytes up to the next {@code stop}, line break or
     * non-ASCII byte, which are left for {@link #read()}. ASCII bytes need no UTF-8 check when no
     * multi-byte character is pending.
     */
    private void copyPlain(boolean kept, byte stop) {
        if (utf8Pending > 0) {
            return;
        }
        byte[] b = buffer;
        int from = position;
        int p = from;
        int end = limit;
        while (p < end) {
            byte x = b[p];
            if (x == stop || x == '\n' || x == '\r' || x < 0) {
                break;
            }
            p++;
        }
        if (kept && p > from) {
            int length = p - from;
            if (dataLength + length > data.length) {
                data = Arrays.copyOf(data, Math.max(2 * data.length, dataLength + length));
            }
            System.arraycopy(b, from, data, dataLength, length);
            dataLength += length;
        }
        position = p;
    }

    private void append(int c) {
        if (dataLength == data.length) {
            data = Arrays.copyOf(data, 2 * data.length);
        }
        data[dataLength++] = (byte) c;
    }

    private int read() throws SurveyInputException, IOException {
        if (position == limit && !refill()) {
            if (utf8Pending > 0) {
                throw invalidUtf8("the content ends inside a multi-byte character");
            }
            return EOF;
        }
        int b = buffer[position++] & 0xFF;
        if (b >= 0x80 || utf8Pending > 0) {
            checkUtf8(b);
        }
        return b;
    }

    private int peek() throws SurveyInputException, IOException {
        if (position == limit && !refill()) {
            return EOF;
        }
        return buffer[position] & 0xFF;
    }

    /** UTF-8 well-formedness (Unicode 15, table 3-7): no overlong forms, surrogates or values above U+10FFFF. */
    private void checkUtf8(int b) throws SurveyInputException {
        if (utf8Pending > 0) {
            if (b < utf8Low || b > utf8High) {
                throw invalidUtf8(String.format("byte 0x%02X is not followed by a valid continuation byte (found 0x%02X)",
                        utf8Lead, b));
            }
            utf8Pending--;
            utf8Low = 0x80;
            utf8High = 0xBF;
            return;
        }
        utf8Lead = b;
        if (b >= 0xC2 && b <= 0xDF) {
            utf8Pending = 1;
        } else if (b == 0xE0) {
            utf8Pending = 2;
            utf8Low = 0xA0;
        } else if (b >= 0xE1 && b <= 0xEF) {
            utf8Pending = 2;
            utf8High = b == 0xED ? 0x9F : 0xBF;
        } else if (b == 0xF0) {
            utf8Pending = 3;
            utf8Low = 0x90;
        } else if (b >= 0xF1 && b <= 0xF3) {
            utf8Pending = 3;
        } else if (b == 0xF4) {
            utf8Pending = 3;
            utf8High = 0x8F;
        } else {
            throw invalidUtf8(String.format("byte 0x%02X cannot start a character", b));
        }
    }

    private SurveyInputException invalidUtf8(String detail) {
        return new SurveyInputException(file, line, null, "the text is not valid UTF-8 (" + detail + ")",
                "a UTF-8 text file (a file saved as Latin-1 or Windows-1252 must be converted to UTF-8)");
    }

    private boolean refill() throws SurveyInputException, IOException {
        if (exhausted) {
            return false;
        }
        // every buffered byte has been consumed, and those since recordOffset belong to the record
        checkRecordLength(bufferOffset + limit);
        int n = fill(0);
        if (n < 0) {
            exhausted = true;
            return false;
        }
        bufferOffset += limit;
        position = 0;
        limit = n;
        return true;
    }

    /** Stops when the current record, which has reached content offset {@code to}, is too long. */
    private void checkRecordLength(long to) throws SurveyInputException {
        if (inRecord && to - recordOffset > SurveyReader.MAX_RECORD_BYTES) {
            throw recordTooLong(recordLine);
        }
    }

    private SurveyInputException recordTooLong(long row) {
        long mib = SurveyReader.MAX_RECORD_BYTES >> 20;
        return new SurveyInputException(file, row, null, "the row is longer than " + mib + " MiB"
                + " (reading stops there; a quote that is never closed or a file that is not delimited text can cause"
                + " this)", "rows of at most " + mib + " MiB (" + SurveyReader.MAX_RECORD_BYTES + " bytes)");
    }

    /** Reads into {@code buffer} from {@code offset}; the number of bytes read, or -1 at the end. */
    private int fill(int offset) throws SurveyInputException, IOException {
        try {
            int n;
            do {
                n = in.read(buffer, offset, buffer.length - offset);
            } while (n == 0);
            return n;
        } catch (EOFException | ZipException e) {
            if (!gzip) {
                throw e;
            }
            throw new SurveyInputException(file, 0, null, "the gzip stream is truncated or corrupt ("
                    + gzipDetail(e) + ") after line " + line + " of its content",
                    "a complete gzip file (compress the file again)", e);
        }
    }

    /** What the gzip decoder said, or that the data ended when it said nothing. */
    static String gzipDetail(IOException e) {
        return e.getMessage() != null ? e.getMessage() : "the data end too early";
    }

    /** Buffers at least the first line (or all content when shorter); returns the index of its end. */
    private int bufferFirstLine() throws SurveyInputException, IOException {
        int scanned = 0;
        while (true) {
            for (int i = scanned; i < limit; i++) {
                if (buffer[i] == '\n' || buffer[i] == '\r') {
                    return i;
                }
            }
            scanned = limit;
            if (exhausted) {
                return limit;
            }
            if (limit > SurveyReader.MAX_RECORD_BYTES) {
                throw recordTooLong(1);
            }
            if (limit == buffer.length) {
                buffer = Arrays.copyOf(buffer, Math.min(2 * buffer.length, SurveyReader.MAX_RECORD_BYTES + 1));
            }
            int n = fill(limit);
            if (n < 0) {
                exhausted = true;
            } else {
                limit += n;
            }
        }
    }

    private byte detectDelimiter(int from, int to) {
        boolean comma = false;
        boolean semicolon = false;
        boolean quoted = false;
        for (int i = from; i < to; i++) {
            byte b = buffer[i];
            if (b == '"') {
                quoted = !quoted;
            } else if (!quoted) {
                if (b == '\t') {
                    return '\t';
                }
                comma |= b == ',';
                semicolon |= b == ';';
            }
        }
        return !comma && semicolon ? (byte) ';' : (byte) ',';
    }
}
