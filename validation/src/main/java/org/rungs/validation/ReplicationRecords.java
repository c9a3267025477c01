package org.rungs.validation;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.TreeMap;
import java.util.function.Consumer;
import java.util.stream.Stream;
import org.rungs.posteriors.AtomicFiles;

/**
 * What a calibration's and a recovery study's folders share: one CSV record per finished
 * replication under {@value #FOLDER}/, every file written whole (beside, then renamed), so that
 * a killed run leaves no half record and a rerun skips the replications on disk.
 */
public final class ReplicationRecords {
    /** The subfolder of the records. */
    public static final String FOLDER = "replications";
    /** Starts a line of a record that is not a row: a note about the whole fit. */
    public static final String NOTE = "# ";
    /** A record's file name: {@code r} and the replication's index in seven digits. */
    public static final String RECORD = "r\\d{7}\\.csv";

    private ReplicationRecords() {
    }

    /** The file name of replication {@code replication}'s record. */
    public static String fileName(int replication) {
        return String.format(Locale.ROOT, "r%07d.csv", replication);
    }

    /** Reads one record file into a replication's result. */
    @FunctionalInterface
    public interface Reader<T> {
        T read(Path file, int index) throws IOException;
    }

    /** The records in {@code dir}/{@value #FOLDER}, by index; none if the subfolder is missing. */
    public static <T> Map<Integer, T> finished(Path dir, Reader<T> reader) {
        Map<Integer, T> results = new TreeMap<>();
        Path folder = dir.resolve(FOLDER);
        if (!Files.isDirectory(folder)) {
            return results;
        }
        try (Stream<Path> files = Files.list(folder)) {
            for (Path f : files.sorted().toList()) {
                String name = f.getFileName().toString();
                if (name.matches(RECORD)) {
                    int index = Integer.parseInt(name.substring(1, 8));
                    results.put(index, reader.read(f, index));
                }
            }
        } catch (IOException e) {
            throw new UncheckedIOException("could not read " + folder + ": " + e.getMessage(), e);
        }
        return results;
    }

    /** As {@link #rows(Path, String, int, Consumer, Consumer)} for a record that has no notes: a note line is a damaged row. */
    public static void rows(Path file, String header, int fields, Consumer<String[]> row) throws IOException {
        rows(file, header, fields, row, null);
    }

    /**
     * Passes each row of a record after its header to {@code row}, split at commas. The record's
     * header must be {@code header} and each row have {@code fields} fields; a number that does
     * not parse in {@code row} is reported with the file and line. Lines starting with
     * {@value #NOTE} are notes about the whole fit and go to {@code note} without it.
     */
    public static void rows(Path file, String header, int fields, Consumer<String[]> row, Consumer<String> note) throws IOException {
        List<String> lines = Files.readAllLines(file, StandardCharsets.UTF_8);
        if (lines.isEmpty() || !lines.get(0).equals(header)) {
            throw new IOException(file + " is not a replication record (header " + header + ")");
        }
        for (int i = 1; i < lines.size(); i++) {
            if (note != null && lines.get(i).startsWith(NOTE)) {
                note.accept(lines.get(i).substring(NOTE.length()));
                continue;
            }
            String[] f = lines.get(i).split(",", -1);
            if (f.length != fields) {
                throw new IOException(file + ": line " + (i + 1) + " has " + f.length + " fields, not " + fields);
            }
            try {
                row.accept(f);
            } catch (NumberFormatException e) {
                throw new IOException(file + ": line " + (i + 1) + ": " + e.getMessage(), e);
            }
        }
    }

    /** Writes {@code dir}/{@code relative} atomically: to a temporary file in the same folder, then renamed. */
    public static void write(Path dir, String relative, String text) {
        Path target = dir.resolve(relative);
        try {
            Files.createDirectories(target.getParent());
            AtomicFiles.write(target, out -> out.write(text));
        } catch (IOException e) {
            throw new UncheckedIOException("could not write " + target + ": " + e.getMessage(), e);
        }
    }
}
