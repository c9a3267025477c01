package org.rungs.cli;

import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;
import picocli.CommandLine;

class DemoOptionsTest {

    private static boolean overwrite(String... args) {
        DemoCommand demo = new DemoCommand();
        new CommandLine(demo).parseArgs(args);
        return demo.overwrite;
    }

    /** Picocli sets a negatable option that is true by default to false when it is given, unless told otherwise. */
    @Test
    void overwriteMeansOverwrite() {
        assertTrue(overwrite());
        assertTrue(overwrite("--overwrite"));
        assertFalse(overwrite("--no-overwrite"));
    }
}
