package org.rungs.sampler.run;

import java.io.IOException;
import java.io.Reader;
import java.io.UncheckedIOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.Files;
import java.nio.file.InvalidPathException;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.ArrayList;
import java.util.List;
import java.util.Properties;
import org.rungs.models.survey.Text;

/**
 * What a resume needs beyond the chains' states, kept in {@code OUT/.checkpoint/fit.properties}:
 * the input file and its SHA-256 (a resume refuses a changed file), the seed actually used and
 * the arguments that started the fit.
 *
 * @param file      the survey file, absolute
 * @param sha256    its SHA-256 when the fit started
 * @param seed      the base seed used
 * @param arguments the command-line arguments of the fit
 */
public record SavedFit(Path file, String sha256, long seed, List<String> arguments) {
    /** The folder, inside an output folder, holding a fit's checkpoint. */
    public static final String FOLDER = ".checkpoint";
    private static final String NAME = "fit.properties";

    public SavedFit {
        arguments = List.copyOf(arguments);
    }

    /** Whether {@code out} holds the checkpoint of a fit. */
    public static boolean existsIn(Path out) {
        return Files.exists(out.resolve(FOLDER).resolve(NAME));
    }

    /**
     * Reads the saved fit of output folder {@code out}.
     *
     * @throws IllegalArgumentException when {@code out} holds no checkpoint, or its file lacks a key or
     *     holds a value that is not what this class writes; the message names the file and the key
     */
    public static SavedFit read(Path out) {
        Path path = out.resolve(FOLDER).resolve(NAME);
        if (!Files.exists(path)) {
            throw new IllegalArgumentException(out + " holds no checkpoint of a fit to continue (no " + FOLDER + "/" + NAME
                    + "); a fit leaves none once it has finished and converged");
        }
        Properties p = new Properties();
        try (Reader r = Files.newBufferedReader(path, StandardCharsets.UTF_8)) {
            p.load(r);
        } catch (IOException e) {
            throw new UncheckedIOException("could not read " + path + ": " + e.getMessage(), e);
        } catch (IllegalArgumentException e) {
            // Properties.load refuses a malformed unicode escape this way
            throw new IllegalArgumentException(path.toAbsolutePath() + ": expected the properties a fit writes; " + e.getMessage()
                    + "; the checkpoint is damaged: start the fit again, with --overwrite to replace it",
                    e);
        }
        int count = (int) number(path, p, "arguments", "the number of the fit's arguments, a whole number 0 or more", 0,
                Integer.MAX_VALUE);
        List<String> arguments = new ArrayList<>();
        for (int i = 0; i < count; i++) {
            arguments.add(text(path, p, "argument." + i, "the fit's argument " + (i + 1) + " of " + count));
        }
        Path file;
        try {
            file = Path.of(text(path, p, "file", "the path of the survey file"));
        } catch (InvalidPathException e) {
            throw damaged(path, "file", "the path of the survey file", "holds " + Text.quote(p.getProperty("file")));
        }
        String sha256 = text(path, p, "sha256", "the survey file's SHA-256");
        long seed = number(path, p, "seed", "the seed, a whole number", Long.MIN_VALUE, Long.MAX_VALUE);
        return new SavedFit(file, sha256, seed, arguments);
    }

    private static String text(Path path, Properties p, String key, String expected) {
        String value = p.getProperty(key);
        if (value == null) {
            throw damaged(path, key, expected, "is missing");
        }
        return value;
    }

    private static long number(Path path, Properties p, String key, String expected, long lowest, long highest) {
        String value = text(path, p, key, expected);
        try {
            long n = Long.parseLong(value.strip());
            if (n >= lowest && n <= highest) {
                return n;
            }
        } catch (NumberFormatException e) {
            // reported below with the value
        }
        throw damaged(path, key, expected, "holds " + Text.quote(value));
    }

    private static IllegalArgumentException damaged(Path path, String key, String expected, String found) {
        return new IllegalArgumentException(path.toAbsolutePath() + ": the key " + Text.quote(key) + " " + found
                + "; expected " + expected + "; the checkpoint is damaged: start the fit again, with --overwrite to replace it");
    }

    /** Writes this record into {@code out}'s checkpoint folder atomically. */
    void write(Path out) {
        Properties p = new Properties();
        p.setProperty("file", file.toString());
        p.setProperty("sha256", sha256);
        p.setProperty("seed", Long.toString(seed));
        p.setProperty("arguments", Integer.toString(arguments.size()));
        for (int i = 0; i < arguments.size(); i++) {
            p.setProperty("argument." + i, arguments.get(i));
        }
        Path dir = out.resolve(FOLDER);
        try {
            Files.createDirectories(dir);
            Path tmp = dir.resolve(NAME + ".partial");
            try (Writer w = Files.newBufferedWriter(tmp, StandardCharsets.UTF_8)) {
                p.store(w, "rungs fit checkpoint");
            }
            try {
                Files.move(tmp, dir.resolve(NAME), StandardCopyOption.ATOMIC_MOVE, StandardCopyOption.REPLACE_EXISTING);
            } catch (AtomicMoveNotSupportedException e) {
                Files.move(tmp, dir.resolve(NAME), StandardCopyOption.REPLACE_EXISTING);
            }
        } catch (IOException e) {
            throw new UncheckedIOException("could not write " + dir.resolve(NAME) + ": " + e.getMessage(), e);
        }
    }

    /** Deletes the checkpoint folder of {@code out}, if any. */
    static void delete(Path out) {
        Path dir = out.resolve(FOLDER);
        if (!Files.exists(dir)) {
            return;
        }
        try (var files = Files.list(dir)) {
            for (Path f : (Iterable<Path>) files::iterator) {
                Files.delete(f);
            }
            Files.delete(dir);
        } catch (IOException e) {
            throw new UncheckedIOException("could not delete " + dir + ": " + e.getMessage(), e);
        }
    }
}
