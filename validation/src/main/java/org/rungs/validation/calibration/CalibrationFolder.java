package org.rungs.validation.calibration;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.rungs.validation.ReplicationRecords;

/**
 * A calibration's folder: {@value CalibrationConfig#FILE} (the configuration), one file per
 * finished replication under {@code replications/}, and the summary files. Every file appears
 * only complete (written beside and renamed), so a killed run leaves no half record, a rerun
 * skips the replications on disk, and shards may share one folder or use their own.
 */
public final class CalibrationFolder {
    static final String REPLICATIONS = ReplicationRecords.FOLDER;
    private static final String HEADER = "parameter,truth,rank,draws,rhat,ess_bulk,ess_tail,flagged";
    /** The record's note of the spreads moved per chain, after {@link ReplicationRecords#NOTE}. */
    private static final String SPREAD_MOVES = "spread_moves_per_chain: ";

    private final Path dir;
    private final String description;

    private CalibrationFolder(Path dir, String description) {
        this.dir = dir;
        this.description = description;
    }

    /**
     * Opens {@code dir} for {@code config}, creating it; a folder of another configuration is refused.
     *
     * @throws IllegalArgumentException when the folder holds another calibration
     */
    public static CalibrationFolder open(Path dir, CalibrationConfig config) {
        return open(dir, config.describe());
    }

    static CalibrationFolder open(Path dir, String description) {
        CalibrationFolder folder = new CalibrationFolder(dir, description);
        String existing = readDescription(dir);
        if (existing == null) {
            folder.write(CalibrationConfig.FILE, description);
        } else if (!existing.equals(description)) {
            throw new IllegalArgumentException("folder " + dir + " holds a calibration of another configuration (see "
                    + dir.resolve(CalibrationConfig.FILE) + "); choose another folder");
        }
        return folder;
    }

    /** Opens an existing calibration folder. */
    public static CalibrationFolder existing(Path dir) {
        String description = readDescription(dir);
        if (description == null) {
            throw new IllegalArgumentException(dir + " is not a calibration folder: it has no " + CalibrationConfig.FILE);
        }
        return new CalibrationFolder(dir, description);
    }

    public Path dir() {
        return dir;
    }

    /** The text of {@value CalibrationConfig#FILE}. */
    public String description() {
        return description;
    }

    /** The value of one {@code key = value} line of the configuration. */
    public String value(String key) {
        for (String line : description.split("\n")) {
            if (line.startsWith(key + " = ")) {
                return line.substring(key.length() + 3);
            }
        }
        throw new IllegalArgumentException(dir.resolve(CalibrationConfig.FILE) + " has no " + key);
    }

    private static String readDescription(Path dir) {
        Path file = dir.resolve(CalibrationConfig.FILE);
        try {
            return Files.exists(file) ? Files.readString(file, StandardCharsets.UTF_8) : null;
        } catch (IOException e) {
            throw new UncheckedIOException("could not read " + file + ": " + e.getMessage(), e);
        }
    }

    static String fileName(int replication) {
        return ReplicationRecords.fileName(replication);
    }

    /** Records a finished replication. */
    public void write(ReplicationResult result) {
        StringBuilder sb = new StringBuilder(HEADER).append('\n');
        for (ParameterRank p : result.ranks()) {
            sb.append(p.parameter()).append(',').append(p.truth()).append(',').append(p.rank()).append(',')
                    .append(p.draws()).append(',').append(p.rhat()).append(',').append(p.essBulk()).append(',')
                    .append(p.essTail()).append(',').append(p.flagged()).append('\n');
        }
        if (result.spreadMoves() != null) {
            sb.append(ReplicationRecords.NOTE).append(SPREAD_MOVES).append(String.join("; ", result.spreadMoves())).append('\n');
        }
        write(REPLICATIONS + "/" + fileName(result.replication()), sb.toString());
    }

    /** The finished replications on disk, by index. */
    public Map<Integer, ReplicationResult> finished() {
        return ReplicationRecords.finished(dir, CalibrationFolder::read);
    }

    private static ReplicationResult read(Path file, int index) throws IOException {
        List<ParameterRank> ranks = new ArrayList<>();
        List<List<String>> moves = new ArrayList<>();
        ReplicationRecords.rows(file, HEADER, 8, f -> ranks.add(new ParameterRank(f[0], Double.parseDouble(f[1]),
                Integer.parseInt(f[2]), Integer.parseInt(f[3]), Double.parseDouble(f[4]), Double.parseDouble(f[5]),
                Double.parseDouble(f[6]), Boolean.parseBoolean(f[7]))), note -> {
                    if (note.startsWith(SPREAD_MOVES)) {
                        moves.add(List.of(note.substring(SPREAD_MOVES.length()).split("; ")));
                    }
                });
        return new ReplicationResult(index, ranks, moves.isEmpty() ? null : moves.get(0));
    }

    /** Copies a replication record of another folder into this one, unchanged. */
    void copyFrom(CalibrationFolder other, int replication) {
        Path from = other.dir.resolve(REPLICATIONS).resolve(fileName(replication));
        try {
            write(REPLICATIONS + "/" + fileName(replication), Files.readString(from, StandardCharsets.UTF_8));
        } catch (IOException e) {
            throw new UncheckedIOException("could not read " + from + ": " + e.getMessage(), e);
        }
    }

    /** Writes {@code relative} atomically: to a temporary file in the same folder, then renamed. */
    public void write(String relative, String text) {
        ReplicationRecords.write(dir, relative, text);
    }
}
