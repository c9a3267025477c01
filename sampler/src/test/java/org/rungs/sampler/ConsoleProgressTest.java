package org.rungs.sampler;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import org.junit.jupiter.api.Test;

/** The progress line's phases and its estimate of the time left. */
class ConsoleProgressTest {
    private static final long SECOND = 1_000_000_000L;

    private static ConsoleProgress progress(int chains) {
        return new ConsoleProgress(new PrintStream(new ByteArrayOutputStream(), true, StandardCharsets.UTF_8), chains, 1.0, 0);
    }

    @Test
    void theTimeLeftFollowsTheCurrentPaceNotTheAverageSinceTheStart() {
        // 1,000 iterations: 50 per second for 10 s, then 10 per second (the joint step starting);
        // one line per second. At 40 s: 800 done, 200 left at 10 per second = 20 s. The pace since
        // the start (800 in 40 s) would say 10 s.
        ConsoleProgress p = progress(1);
        String line = "";
        for (int t = 1; t <= 40; t++) {
            int done = t <= 10 ? 50 * t : 500 + 10 * (t - 10);
            p.record(0, done, 1000, done < 600);
            line = p.line(t * SECOND);
        }
        assertTrue(line.endsWith("chain 1 sampling 800/1000 | about 20 s left"), line);
    }

    @Test
    void beforeAWindowOfLinesTheTimeLeftComesFromThePaceSinceTheStart() {
        ConsoleProgress p = progress(2);
        p.record(0, 30, 100, true);
        String line = p.line(3 * SECOND);
        // 30 of 200 iterations in 3 s: 170 more at 10 per second
        assertEquals("chain 1 warm-up 30/100 | chain 2 waiting 0/100 | about 17 s left", line);
        p.record(0, 100, 100, false);
        p.record(1, 100, 100, false);
        assertEquals("chain 1 done 100/100 | chain 2 done 100/100", p.line(10 * SECOND));
    }

    @Test
    void longTimesAreShownInMinutesAndHours() {
        assertEquals("89 s", ConsoleProgress.formatSeconds(89));
        assertEquals("2 min", ConsoleProgress.formatSeconds(100));
        assertEquals("1.5 h", ConsoleProgress.formatSeconds(5400));
    }
}
