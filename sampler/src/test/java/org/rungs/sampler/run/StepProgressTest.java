package org.rungs.sampler.run;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.util.List;
import org.junit.jupiter.api.Test;

/** The lines of a long step after sampling, on a clock the test moves. */
class StepProgressTest {
    private static final long SECOND = 1_000_000_000L;

    @Test
    void aLineEveryTwoSecondsWithTheTimeLeftAtThePaceSoFar() {
        ByteArrayOutputStream bytes = new ByteArrayOutputStream();
        long[] now = {100 * SECOND};
        StepProgress progress = new StepProgress(new PrintStream(bytes, true, StandardCharsets.UTF_8), "corrected quantities, draws",
                () -> now[0]);
        // one draw a second, 4,000 draws in all
        for (int done = 1; done <= 4000; done++) {
            now[0] += SECOND;
            progress.done(done, 4000);
            if (done == 5) {
                break;
            }
        }
        List<String> lines = bytes.toString(StandardCharsets.UTF_8).lines().toList();
        // at 2 s (2 done, 3,998 left at 1 s each) and at 4 s
        assertEquals(List.of("rungs: corrected quantities, draws 2/4,000 | about 67 min left",
                "rungs: corrected quantities, draws 4/4,000 | about 67 min left"), lines);
        // the last unit ends the step without a line
        now[0] += 10 * SECOND;
        progress.done(4000, 4000);
        assertEquals(2, bytes.toString(StandardCharsets.UTF_8).lines().count());
    }

    @Test
    void aStepShorterThanTwoSecondsPrintsNothing() {
        ByteArrayOutputStream bytes = new ByteArrayOutputStream();
        long[] now = {0};
        StepProgress progress = new StepProgress(new PrintStream(bytes, true, StandardCharsets.UTF_8), "x", () -> now[0]);
        for (int done = 1; done <= 100; done++) {
            now[0] += SECOND / 100;
            progress.done(done, 100);
        }
        assertEquals("", bytes.toString(StandardCharsets.UTF_8));
    }
}
