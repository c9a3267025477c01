package org.rungs.sampler.run;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.ArrayList;
import java.util.List;
import java.util.stream.Stream;
import org.rungs.posteriors.AtomicFiles;
import org.rungs.posteriors.report.CrossValidationComparison;
import org.rungs.posteriors.report.Report;

/**
 * The folder a run writes to. Files appear only complete: each is written to a temporary file
 * in the same folder and then renamed over its final name. A folder holding another run, or
 * anything else, is refused unless overwriting was asked for; a run then first removes the
 * earlier run's result files ({@link #clearResults}), so that one run's files never stand beside
 * another's, and writes {@link #RUN_RECORD} last.
 */
public final class OutputFolder {
    /** The file whose presence marks a folder as holding a run. */
    public static final String RUN_RECORD = "run.json";

    /** Every result file a run (or the report written after it) may leave in its folder. */
    static final List<String> RESULT_FILES = List.of("draws.csv", "summary.csv", "attraction.csv", "derived_draws.csv",
            "derived_summary.csv", "groups.csv", "distributions.csv", "coarse_shares.csv", "coefficients.csv",
            CrossValidationComparison.FILE, RUN_RECORD, Report.FILE_NAME);

    private static final String PARTIAL = ".partial";

    private final Path dir;
    private final List<String> written = new ArrayList<>();

    private OutputFolder(Path dir) {
        this.dir = dir;
    }

    /**
     * Checks that {@code dir} may be written to, without creating anything yet.
     *
     * @throws IllegalArgumentException with a sentence saying why not
     */
    public static OutputFolder check(Path dir, boolean overwrite) {
        return check(dir, overwrite, null);
    }

    /**
     * As {@link #check(Path, boolean)}, and refuses a folder in which the run would replace its
     * own input file {@code input} (a survey saved as {@code groups.csv} beside the results).
     */
    public static OutputFolder check(Path dir, boolean overwrite, Path input) {
        if (input != null) {
            Path in = input.toAbsolutePath().normalize();
            if (in.getParent() != null && in.getParent().equals(dir.toAbsolutePath().normalize())
                    && isResult(in.getFileName().toString())) {
                throw new IllegalArgumentException("the input file " + input + " has the name of a file the fit writes"
                        + " into " + dir + "; choose another output folder");
            }
        }
        if (Files.exists(dir)) {
            if (!Files.isDirectory(dir)) {
                throw new IllegalArgumentException("output " + dir + " exists and is not a folder");
            }
            if (!overwrite && SavedFit.existsIn(dir)) {
                throw new IllegalArgumentException("output folder " + dir + " holds the checkpoint of a fit that was"
                        + " interrupted or has not converged; continue it with 'rungs fit --resume " + dir + "' (with --thin K"
                        + " to run its chains on), choose another folder or add --overwrite to replace it");
            }
            if (!overwrite && !isEmpty(dir)) {
                String what = Files.exists(dir.resolve(RUN_RECORD)) ? "holds another run" : "is not empty";
                throw new IllegalArgumentException("output folder " + dir + " " + what
                        + "; choose another folder or add --overwrite to replace its files");
            }
        }
        return new OutputFolder(dir);
    }

    /**
     * The folder of an unfinished fit being resumed, whose files it will replace.
     *
     * @throws IllegalArgumentException when {@code dir} holds no checkpoint
     */
    public static OutputFolder resuming(Path dir) {
        if (!SavedFit.existsIn(dir)) {
            SavedFit.read(dir);
        }
        return new OutputFolder(dir);
    }

    public Path dir() {
        return dir;
    }

    public Path resolve(String name) {
        return dir.resolve(name);
    }

    /** The names of the files this run has written so far, in order. */
    public List<String> written() {
        return List.copyOf(written);
    }

    /**
     * Deletes the result files of an earlier run, and the temporary files of a run killed while
     * writing, so that the files this run writes never stand beside another run's. Other files
     * (the demo's survey, the checkpoint, the user's own) are left alone.
     */
    public void clearResults() {
        if (!Files.isDirectory(dir)) {
            return;
        }
        try (Stream<Path> s = Files.list(dir)) {
            for (Path file : (Iterable<Path>) s::iterator) {
                if (isResult(file.getFileName().toString()) && Files.isRegularFile(file)) {
                    Files.delete(file);
                }
            }
        } catch (IOException e) {
            throw new UncheckedIOException("could not remove the earlier results in " + dir + ": " + e.getMessage(), e);
        }
    }

    /** A result file's name, or a temporary name derived from one (".draws.csv123.partial", "..draws.csv1.partial2.tmp"). */
    static boolean isResult(String name) {
        if (RESULT_FILES.contains(name)) {
            return true;
        }
        if (!name.startsWith(".") || !(name.endsWith(PARTIAL) || name.endsWith(AtomicFiles.TEMPORARY))) {
            return false;
        }
        String stem = name.startsWith("..") ? name.substring(2) : name.substring(1);
        return RESULT_FILES.stream().anyMatch(stem::startsWith);
    }

    /** Writes text to {@code name} atomically. */
    public Path writeText(String name, String text) {
        return write(name, tmp -> Files.writeString(tmp, text, StandardCharsets.UTF_8));
    }

    /** A writer of one file's content to a given (temporary) path. */
    public interface Content {
        void writeTo(Path file) throws IOException;
    }

    /** Writes {@code name} through {@code content} to a temporary file, then renames it into place. */
    public Path write(String name, Content content) {
        try {
            Files.createDirectories(dir);
            Path target = dir.resolve(name);
            // a file of the user's umask, as createTempFile's owner-only files are not
            Path tmp = AtomicFiles.createBeside(target, PARTIAL);
            try {
                content.writeTo(tmp);
                try {
                    Files.move(tmp, target, StandardCopyOption.ATOMIC_MOVE, StandardCopyOption.REPLACE_EXISTING);
                } catch (AtomicMoveNotSupportedException e) {
                    Files.move(tmp, target, StandardCopyOption.REPLACE_EXISTING);
                }
            } finally {
                Files.deleteIfExists(tmp);
            }
            written.add(name);
            return target;
        } catch (IOException e) {
            throw new UncheckedIOException("could not write " + dir.resolve(name) + ": " + e.getMessage(), e);
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
