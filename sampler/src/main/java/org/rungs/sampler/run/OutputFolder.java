package org.rungs.sampler.run;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.stream.Stream;

/**
 * The folder a run writes to. Files appear only complete: each is written to a temporary file
 * in the same folder and then renamed over its final name. A folder holding another run, or
 * anything else, is refused unless overwriting was asked for.
 */
public final class OutputFolder {
    /** The file whose presence marks a folder as holding a run. */
    public static final String RUN_RECORD = "run.json";

    private final Path dir;

    private OutputFolder(Path dir) {
        this.dir = dir;
    }

    /**
     * Checks that {@code dir} may be written to, without creating anything yet.
     *
     * @throws IllegalArgumentException with a sentence saying why not
     */
    public static OutputFolder check(Path dir, boolean overwrite) {
        if (Files.exists(dir)) {
            if (!Files.isDirectory(dir)) {
                throw new IllegalArgumentException("output " + dir + " exists and is not a folder");
            }
            if (!overwrite && SavedFit.existsIn(dir)) {
                throw new IllegalArgumentException("output folder " + dir + " holds an unfinished fit; continue it with"
                        + " 'rungs fit --resume " + dir + "', choose another folder or add --overwrite to replace it");
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
            Path tmp = Files.createTempFile(dir, "." + name, ".partial");
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
