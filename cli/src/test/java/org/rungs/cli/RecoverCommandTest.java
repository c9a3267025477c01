package org.rungs.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * {@code rungs recover} through the picocli entry point, with tiny settings (2 regions of 60,
 * one chain of 20 + 20, 2 replications): only the plumbing is under test here; the statistics
 * are tested in the validation module.
 */
final class RecoverCommandTest {
    @TempDir
    Path dir;

    @Test
    void writesTheStudyFilesAndResumes() throws IOException {
        Path out = dir.resolve("study");
        String[] args = {"recover", "--groups", "2", "--respondents", "60", "--chains", "1", "--warmup", "20",
            "--draws", "20", "--replications", "2", "--threads", "2", "--seed", "5", "--out", out.toString()};
        CommandLineTest.Run run = CommandLineTest.rungs(args);
        assertEquals(0, run.exit(), run.err());
        for (String file : new String[] {"recovery.txt", "recovery.csv", "replications.csv", "summary.txt",
            "replications/r0000000.csv", "replications/r0000001.csv"}) {
            assertTrue(Files.isRegularFile(out.resolve(file)), file);
        }
        assertTrue(run.out().contains("Coverage of the central 50% intervals"), run.out());
        assertTrue(run.err().contains("recover: 2/2 replications"), run.err());
        String recovery = Files.readString(out.resolve("recovery.csv"));
        assertTrue(recovery.contains("\ncoarse_share.Eastmarch,2,"), "the default fit has the coarse class: " + recovery);

        CommandLineTest.Run again = CommandLineTest.rungs(args);
        assertEquals(0, again.exit(), again.err());
        assertFalse(again.err().contains("recover: 2/2"), "nothing left to fit: " + again.err());
        assertEquals(recovery, Files.readString(out.resolve("recovery.csv")));
    }

    @Test
    void refusesAnotherStudyInTheSameFolderAndBadOptions() {
        Path out = dir.resolve("study");
        String[] tiny = {"--groups", "2", "--respondents", "60", "--chains", "1", "--warmup", "20", "--draws", "20",
            "--replications", "1", "--style-classes", "none", "--out", out.toString()};
        assertEquals(0, CommandLineTest.rungs(CommandLineTest.concat(new String[] {"recover"}, tiny)).exit());
        CommandLineTest.Run other = CommandLineTest.rungs(CommandLineTest.concat(new String[] {"recover", "--seed", "9"}, tiny));
        assertEquals(Main.INPUT_ERROR, other.exit());
        assertTrue(other.err().contains("another configuration"), other.err());
        assertEquals(0, CommandLineTest.rungs(CommandLineTest.concat(new String[] {"recover", "--seed", "9", "--overwrite"},
                tiny)).exit());
        assertEquals(Main.INPUT_ERROR, CommandLineTest.rungs("recover", "--groups", "13", "--out", out.toString()).exit());
        assertEquals(Main.INPUT_ERROR, CommandLineTest.rungs("recover", "--truth", "other", "--out", out.toString()).exit());
    }

    @Test
    void refusesAnAttractionOffTheScaleBeforeWritingAnything() {
        Path out = dir.resolve("refused");
        CommandLineTest.Run r = CommandLineTest.rungs("recover", "--attraction", "11", "--replications", "1", "--out", out.toString());
        assertEquals(Main.INPUT_ERROR, r.exit(), r.err());
        assertTrue(r.err().contains("attraction number 11 is not on the scale 0..10"), r.err());
        assertFalse(Files.exists(out), "the study folder was created");
    }
}
