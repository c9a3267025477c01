package org.rungs.sampler.run;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.attribute.PosixFileAttributeView;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class OutputFolderTest {

    /** Results get the permissions of any file the user creates there (the umask), not owner-only ones. */
    @Test
    void resultsAreAsReadableAsTheUsersOtherFiles(@TempDir Path dir) throws Exception {
        assumeTrue(Files.getFileAttributeView(dir, PosixFileAttributeView.class) != null, "POSIX permissions");
        Path plain = Files.createFile(dir.resolve("plain.txt"));
        OutputFolder folder = OutputFolder.check(dir.resolve("out"), false);
        Path written = folder.writeText("summary.csv", "a,b\n");
        Files.createDirectories(dir.resolve("out"));
        assertEquals(Files.getPosixFilePermissions(plain), Files.getPosixFilePermissions(written));
        try (var files = Files.list(dir.resolve("out"))) {
            assertEquals(1, files.count(), "no temporary file left");
        }
    }

    @Test
    void resultNamesAndTheirTemporaryNamesAreTold() {
        assertTrue(OutputFolder.isResult("draws.csv"));
        assertTrue(OutputFolder.isResult("report.html"));
        assertTrue(OutputFolder.isResult(".draws.csv.812-4.partial"));
        assertTrue(OutputFolder.isResult("..draws.csv.812-4.partial.812-5.tmp"));
        assertFalse(OutputFolder.isResult("survey.csv"));
        assertFalse(OutputFolder.isResult(".draws.csv.812-4"));
        assertFalse(OutputFolder.isResult(".checkpoint"));
        assertFalse(OutputFolder.isResult("demo-survey.csv"));
    }
}
