package org.rungs.posteriors.report;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;

/** A small CSV file (RFC 4180 quoting) held in memory with its header, read by column name. */
final class CsvTable {
    private final Map<String, Integer> columnByName = new HashMap<>();
    private final List<String> header;
    private final List<String[]> rows;

    private CsvTable(List<String> header, List<String[]> rows) {
        this.header = header;
        this.rows = rows;
        for (int c = 0; c < header.size(); c++) {
            columnByName.putIfAbsent(header.get(c), c);
        }
    }

    /** The table, or null when the file does not exist. */
    static CsvTable readIfPresent(Path file) throws IOException {
        return Files.isRegularFile(file) ? read(file) : null;
    }

    static CsvTable read(Path file) throws IOException {
        List<List<String>> records = records(Files.readString(file, StandardCharsets.UTF_8), file);
        if (records.isEmpty()) {
            throw new IOException(file + ": the file is empty; expected a header line");
        }
        List<String> header = records.get(0);
        List<String[]> rows = new ArrayList<>();
        for (int r = 1; r < records.size(); r++) {
            List<String> record = records.get(r);
            if (record.size() == 1 && record.get(0).isEmpty()) {
                continue;
            }
            if (record.size() != header.size()) {
                throw new IOException(file + ": record " + (r + 1) + " has " + record.size() + " fields, the header "
                        + header.size());
            }
            rows.add(record.toArray(new String[0]));
        }
        return new CsvTable(List.copyOf(header), rows);
    }

    int size() {
        return rows.size();
    }

    boolean has(String column) {
        return columnByName.containsKey(column);
    }

    List<String> header() {
        return header;
    }

    String text(int row, String column) {
        Integer c = columnByName.get(column);
        if (c == null) {
            throw new IllegalArgumentException("no column '" + column + "'");
        }
        return rows.get(row)[c];
    }

    /** The entry as a number; NaN when the column is absent, the entry empty or not a number. */
    double number(int row, String column) {
        Integer c = columnByName.get(column);
        if (c == null) {
            return Double.NaN;
        }
        try {
            return Double.parseDouble(rows.get(row)[c].trim());
        } catch (NumberFormatException e) {
            return Double.NaN;
        }
    }

    private static List<List<String>> records(String text, Path file) throws IOException {
        List<List<String>> records = new ArrayList<>();
        List<String> record = new ArrayList<>();
        StringBuilder field = new StringBuilder();
        boolean quoted = false;
        boolean any = false;
        for (int i = 0; i < text.length(); i++) {
            char ch = text.charAt(i);
            any = true;
            if (quoted) {
                if (ch != '"') {
                    field.append(ch);
                } else if (i + 1 < text.length() && text.charAt(i + 1) == '"') {
                    field.append('"');
                    i++;
                } else {
                    quoted = false;
                }
            } else if (ch == '"') {
                quoted = true;
            } else if (ch == ',') {
                record.add(field.toString());
                field.setLength(0);
            } else if (ch == '\n' || ch == '\r') {
                if (ch == '\r' && i + 1 < text.length() && text.charAt(i + 1) == '\n') {
                    i++;
                }
                record.add(field.toString());
                field.setLength(0);
                records.add(record);
                record = new ArrayList<>();
                any = false;
            } else {
                field.append(ch);
            }
        }
        if (quoted) {
            throw new IOException(file + ": a quoted field is not closed before the end of the file");
        }
        if (any) {
            record.add(field.toString());
            records.add(record);
        }
        return records;
    }
}
