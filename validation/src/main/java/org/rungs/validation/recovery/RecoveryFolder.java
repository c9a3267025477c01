package org.rungs.validation.recovery;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.stream.Stream;
import org.rungs.validation.ReplicationRecords;

/**
 * A recovery study's folder: {@value RecoveryConfig#FILE} (the configuration), one file per
 * finished replication under {@code replications/}, and the summary files. Every file appears only
 * complete (written beside and renamed), so a killed run leaves no half record and a rerun with
 * the same configuration skips the replications on disk.
 */
public final class RecoveryFolder {
    static final String REPLICATIONS = ReplicationRecords.FOLDER;
    /** Files the summary writes. */
    static final List<String> SUMMARY_FILES = List.of(RecoveryReport.RECOVERY, RecoveryReport.REPLICATIONS,
            RecoveryReport.SUMMARY);
    private static final String HEADER = "quantity,truth,estimated,mean,q5,q25,q75,q95,flagged";

    private final Path dir;

    private RecoveryFolder(Path dir) {
        this.dir = dir;
    }

    /**
     * Opens {@code dir} for {@code config}, creating it. A folder of the same configuration is
     * resumed; a folder of another study, or holding anything else, is refused unless
     * {@code overwrite}, which deletes the study files found there and starts afresh.
     *
     * @throws IllegalArgumentException with a sentence saying why the folder cannot be used
     */
    public static RecoveryFolder open(Path dir, RecoveryConfig config, boolean overwrite) {
        RecoveryFolder folder = new RecoveryFolder(dir);
        String description = config.describe();
        if (Files.exists(dir) && !Files.isDirectory(dir)) {
            throw new IllegalArgumentException("output " + dir + " exists and is not a folder");
        }
        Path file = dir.resolve(RecoveryConfig.FILE);
        if (overwrite) {
            folder.clear();
        } else if (Files.exists(file)) {
            if (!read(file).equals(description)) {
                throw new IllegalArgumentException("folder " + dir + " holds a recovery study of another configuration (see "
                        + file + "); choose another folder or add --overwrite to replace it");
            }
            return folder;
        } else if (Files.isDirectory(dir) && !isEmpty(dir)) {
            throw new IllegalArgumentException("output folder " + dir + " is not empty; choose another folder or add "
                    + "--overwrite to replace its files");
        }
        folder.write(RecoveryConfig.FILE, description);
        return folder;
    }

    public Path dir() {
        return dir;
    }

    static String fileName(int replication) {
        return ReplicationRecords.fileName(replication);
    }

    /** Records a finished replication. */
    void write(ReplicationEstimates result) {
        StringBuilder sb = new StringBuilder(HEADER).append('\n');
        for (QuantityEstimate e : result.estimates()) {
            sb.append(e.quantity()).append(',').append(e.truth()).append(",true,").append(e.mean()).append(',')
                    .append(e.q05()).append(',').append(e.q25()).append(',').append(e.q75()).append(',')
                    .append(e.q95()).append(',').append(e.flagged()).append('\n');
        }
        for (String name : result.unmatched()) {
            sb.append(name).append(",,false,,,,,,\n");
        }
        write(REPLICATIONS + "/" + fileName(result.replication()), sb.toString());
    }

    /** The finished replications on disk, by index. */
    Map<Integer, ReplicationEstimates> finished() {
        return ReplicationRecords.finished(dir, RecoveryFolder::read);
    }

    private static ReplicationEstimates read(Path file, int index) throws IOException {
        List<QuantityEstimate> estimates = new ArrayList<>();
        List<String> unmatched = new ArrayList<>();
        ReplicationRecords.rows(file, HEADER, 9, f -> {
            if (!Boolean.parseBoolean(f[2])) {
                unmatched.add(f[0]);
                return;
            }
            estimates.add(new QuantityEstimate(f[0], Double.parseDouble(f[1]), Double.parseDouble(f[3]),
                    Double.parseDouble(f[4]), Double.parseDouble(f[5]), Double.parseDouble(f[6]),
                    Double.parseDouble(f[7]), Boolean.parseBoolean(f[8])));
        });
        return new ReplicationEstimates(index, estimates, unmatched);
    }

    /** Writes {@code relative} atomically: to a temporary file in the same folder, then renamed. */
    void write(String relative, String text) {
        ReplicationRecords.write(dir, relative, text);
    }

    /** Deletes the files of a study (configuration, records, summaries); other files stay. */
    private void clear() {
        try {
            Files.deleteIfExists(dir.resolve(RecoveryConfig.FILE));
            for (String name : SUMMARY_FILES) {
                Files.deleteIfExists(dir.resolve(name));
            }
            Path records = dir.resolve(REPLICATIONS);
            if (Files.isDirectory(records)) {
                try (Stream<Path> files = Files.list(records)) {
                    for (Path f : files.toList()) {
                        if (f.getFileName().toString().matches(ReplicationRecords.RECORD)) {
                            Files.delete(f);
                        }
                    }
                }
            }
        } catch (IOException e) {
            throw new UncheckedIOException("could not clear " + dir + ": " + e.getMessage(), e);
        }
    }

    private static String read(Path file) {
        try {
            return Files.readString(file, StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new UncheckedIOException("could not read " + file + ": " + e.getMessage(), e);
        }
    }

    private static boolean isEmpty(Path dir) {
        try (Stream<Path> s = Files.list(dir)) {
            return s.findAny().isEmpty();
        } catch (IOException e) {
            throw new UncheckedIOException("could not list " + dir + ": " + e.getMessage(), e);
        }
    }
}
