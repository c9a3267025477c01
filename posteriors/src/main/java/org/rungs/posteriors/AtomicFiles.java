package org.rungs.posteriors;

import java.io.BufferedWriter;
import java.io.IOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;

/** Writes a file through a temporary file in the same folder and an atomic rename, so readers never see half a file. */
public final class AtomicFiles {
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
        Path temporary = Files.createTempFile(folder, "." + target.getFileName(), ".tmp");
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
}
