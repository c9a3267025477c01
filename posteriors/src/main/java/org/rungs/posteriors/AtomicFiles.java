package org.rungs.posteriors;

import java.io.BufferedWriter;
import java.io.IOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.FileAlreadyExistsException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.concurrent.atomic.AtomicLong;

/** Writes a file through a temporary file in the same folder and an atomic rename, so readers never see half a file. */
public final class AtomicFiles {
    /** The suffix of the temporary files. */
    public static final String TEMPORARY = ".tmp";
    private static final AtomicLong NEXT = new AtomicLong();

    /** Writes a file's whole content. */
    public interface Content {
        void writeTo(Writer out) throws IOException;
    }

    private AtomicFiles() {
    }

    /** Writes {@code file} through a temporary file in the same folder and a rename, so readers never see half a file. */
    public static void write(Path file, Content content) throws IOException {
        Path target = file.toAbsolutePath();
        Path folder = target.getParent();
        Path temporary = createBeside(target, TEMPORARY);
        try {
            try (BufferedWriter out = Files.newBufferedWriter(temporary, StandardCharsets.UTF_8)) {
                content.writeTo(out);
            }
            try {
                Files.move(temporary, target, StandardCopyOption.ATOMIC_MOVE, StandardCopyOption.REPLACE_EXISTING);
            } catch (AtomicMoveNotSupportedException e) {
                Files.move(temporary, target, StandardCopyOption.REPLACE_EXISTING);
            }
        } finally {
            Files.deleteIfExists(temporary);
        }
    }

    /**
     * Creates an empty hidden file beside {@code target} with a name no other writer uses, with the
     * permissions of the user's umask (a file made by {@link Files#createTempFile} is readable by
     * its owner only, and a rename keeps that, so results would be hidden from the user's group).
     */
    public static Path createBeside(Path target, String suffix) throws IOException {
        Path folder = target.toAbsolutePath().getParent();
        String stem = "." + target.getFileName() + "." + ProcessHandle.current().pid() + "-";
        while (true) {
            try {
                return Files.createFile(folder.resolve(stem + NEXT.incrementAndGet() + suffix));
            } catch (FileAlreadyExistsException taken) {
                // left by a killed process of the same pid: take the next number
            }
        }
    }
}
