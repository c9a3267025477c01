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

    /**
     * Feeds per-iteration records in time order, chain c's iteration i (1-based) ending at
     * {@code ends[c][i - 1]} seconds, with a progress line each whole second; returns the line at
     * {@code at} seconds.
     */
    private static String lineAt(ConsoleProgress p, double[][] ends, int warmup, double at) {
        int[] next = new int[ends.length];
        String line = "";
        for (int second = 1; second <= at; second++) {
            while (true) {
                int chain = -1;
                for (int c = 0; c < ends.length; c++) {
                    if (next[c] < ends[c].length && ends[c][next[c]] <= second && (chain < 0 || ends[c][next[c]] < ends[chain][next[chain]])) {
                        chain = c;
                    }
                }
                if (chain < 0) {
                    break;
                }
                int done = ++next[chain];
                p.record(chain, done, ends[chain].length, done <= warmup, Math.round(ends[chain][done - 1] * SECOND));
            }
            line = p.line(second * SECOND);
        }
        return line;
    }

    /** The line at {@code at} seconds of chains with these iteration end times (see {@link #lineAt}) ends with {@code ending}. */
    private static void assertLineEnds(double[][] ends, int warmup, double at, String ending) {
        String line = lineAt(progress(ends.length), ends, warmup, at);
        assertTrue(line.endsWith(ending), line);
    }

    /** Iteration end times of a chain starting at {@code from} seconds: {@code cheap} iterations of {@code a} s, then of {@code b} s. */
    private static double[] chain(double from, int iterations, int cheap, double a, double b) {
        double[] ends = new double[iterations];
        double t = from;
        for (int i = 0; i < iterations; i++) {
            t += i < cheap ? a : b;
            ends[i] = Math.round(t * 1e6) / 1e6; // whole seconds stay whole despite the sums' rounding
        }
        return ends;
    }

    @Test
    void theTimeLeftFollowsTheCurrentPaceNotTheAverageSinceTheStart() {
        // 1,000 iterations: 50 per second for 10 s, then 10 per second (the joint step starting).
        // At 40 s: 800 done, 200 left at 10 per second = 20 s. The pace since the start (800 in
        // 40 s) would say 10 s.
        assertLineEnds(new double[][] {chain(0, 1000, 500, 0.02, 0.1)}, 600, 40, "chain 1 sampling 800/1000 | about 20 s left");
    }

    @Test
    void waitingChainsAreTimedLikeTheFirstOnesAndStartAsThreadsFreeUp() {
        // Four chains on two threads, 100 iterations each, the first 50 at 0.1 s and the rest at
        // 0.5 s (30 s a chain): chains 1 and 2 from 0 to 30 s, chains 3 and 4 from 30 to 60 s.
        double[][] ends = {chain(0, 100, 50, 0.1, 0.5), chain(0, 100, 50, 0.1, 0.5),
                chain(30, 100, 50, 0.1, 0.5), chain(30, 100, 50, 0.1, 0.5)};
        // At 20 s chains 1 and 2 are at 80 (20 x 0.5 s left): 10 s, then 30 s for chains 3 and 4.
        assertLineEnds(ends, 50, 20, "chain 3 waiting 0/100 | chain 4 waiting 0/100 | about 40 s left");
        // At 40 s chains 3 and 4 are at 60 after their cheap half: 40 x 0.5 = 20 s.
        assertLineEnds(ends, 50, 40, "chain 3 sampling 60/100 | chain 4 sampling 60/100 | about 20 s left");
    }

    @Test
    void aChainLeftAloneIsNotCountedAsGoingFaster() {
        // Three chains on two threads at 0.2 s an iteration: 1 and 2 from 0 to 20 s, 3 from 20 to
        // 40 s. At 10 s: 10 s for chains 1 and 2, then 20 s for chain 3; at 30 s chain 3 alone has
        // 10 s left (the pace of all iterations over the last 15 s would say 7.5).
        double[][] ends = {chain(0, 100, 0, 0, 0.2), chain(0, 100, 0, 0, 0.2), chain(20, 100, 0, 0, 0.2)};
        assertLineEnds(ends, 0, 10, "about 30 s left");
        assertLineEnds(ends, 0, 30, "chain 3 sampling 50/100 | about 10 s left");
    }

    @Test
    void aSlowerChainIsTimedAtItsOwnPace() {
        // Two chains on two threads, chain 1 at 0.1 s an iteration (done at 10 s), chain 2 at 0.2 s.
        // At 12 s chain 2 is at 60, twice as slow as chain 1 was: 40 x 0.2 = 8 s (chain 1's pace
        // alone would say 4).
        double[][] ends = {chain(0, 100, 0, 0, 0.1), chain(0, 100, 0, 0, 0.2)};
        assertLineEnds(ends, 0, 12, "chain 2 sampling 60/100 | about 8 s left");
    }

    @Test
    void beforeAnyPartIsTimedTheTimeLeftComesFromThePaceSinceTheStart() {
        ConsoleProgress p = progress(2);
        p.record(0, 30, 100, true, 3 * SECOND);
        String line = p.line(3 * SECOND);
        // 30 of 200 iterations in 3 s: 170 more at 10 per second
        assertEquals("chain 1 warm-up 30/100 | chain 2 waiting 0/100 | about 17 s left", line);
        p.record(0, 100, 100, false, 9 * SECOND);
        p.record(1, 100, 100, false, 10 * SECOND);
        assertEquals("chain 1 done 100/100 | chain 2 done 100/100", p.line(10 * SECOND));
    }

    @Test
    void longTimesAreShownInMinutesAndHours() {
        assertEquals("89 s", ConsoleProgress.formatSeconds(89));
        assertEquals("2 min", ConsoleProgress.formatSeconds(100));
        assertEquals("1.5 h", ConsoleProgress.formatSeconds(5400));
    }
}
