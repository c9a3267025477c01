package org.rungs.sampler;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * The progress line's phases and its estimate of the time left, on simulated fits whose
 * schedule is known: chains with a given cost per iteration, run by threads that take turns on
 * them as {@code Fitter.Turns} does (half a second on a chain, then the free chain with the
 * fewest iterations, a chain not yet begun first).
 */
class ConsoleProgressTest {
    private static final long SECOND = 1_000_000_000L;
    /** Our rule: the estimate is good enough when it is within 15% of the time truly left. */
    private static final double TOLERANCE = 0.15;

    private static ConsoleProgress progress(int chains, int threads) {
        ConsoleProgress p = new ConsoleProgress(new PrintStream(new ByteArrayOutputStream(), true, StandardCharsets.UTF_8), chains, 1.0, 0);
        p.threads(threads);
        return p;
    }

    /** One iteration's end: wall time, chain, iterations done, the chain's running time (nanoseconds). */
    private record Report(long wall, int chain, int iterations, long running) {
    }

    /** A simulated fit: every iteration's report in time order, and when the last chain ended. */
    private record Schedule(List<Report> reports, long end, int total, int warmup, int[] from) {
        /** Feeds {@code p} the resumed positions, then the reports up to {@code at}; returns the estimate there. */
        double secondsLeftAt(ConsoleProgress p, long at) {
            for (int c = 0; c < from.length; c++) {
                if (from[c] > 0) {
                    p.resumed(c, from[c], total, from[c] <= warmup);
                }
            }
            for (Report r : reports) {
                if (r.wall() > at) {
                    break;
                }
                p.record(r.chain(), r.iterations(), total, r.iterations() <= warmup, r.running());
            }
            return p.secondsLeft();
        }

        double trueSecondsLeft(long at) {
            return (end - at) / 1e9;
        }
    }

    /**
     * Chains with {@code cost[c][k]} seconds for iteration k of chain c, begun at iteration
     * {@code from[c]}, on {@code threads} threads taking turns in stretches of {@code stretch}
     * seconds as {@code Fitter.Turns} does.
     */
    private static Schedule turns(double[][] cost, int[] from, int warmup, int threads, double stretch) {
        int chains = cost.length;
        int total = cost[0].length;
        int[] done = from.clone();
        long[] running = new long[chains];
        boolean[] begun = new boolean[chains];
        boolean[] busy = new boolean[chains];
        long[] clock = new long[threads];
        long[] stretchStart = new long[threads];
        int[] on = new int[threads];
        java.util.Arrays.fill(on, -1);
        long[] next = new long[threads]; // when the thread's current iteration ends, or when it takes a chain
        List<Report> reports = new ArrayList<>();
        long end = 0;
        while (true) {
            int t = -1;
            for (int i = 0; i < threads; i++) {
                if (next[i] != Long.MAX_VALUE && (t < 0 || next[i] < next[t])) {
                    t = i;
                }
            }
            if (t < 0) {
                break;
            }
            clock[t] = next[t];
            int c = on[t];
            if (c >= 0) {
                long took = Math.round(cost[c][done[c]] * SECOND);
                done[c]++;
                running[c] += took;
                reports.add(new Report(clock[t], c, done[c], running[c]));
                end = Math.max(end, clock[t]);
                if (done[c] == total || clock[t] - stretchStart[t] >= stretch * SECOND) {
                    busy[c] = false;
                    on[t] = -1;
                }
            }
            if (on[t] < 0) {
                int fewest = Integer.MAX_VALUE;
                for (int o = 0; o < chains; o++) {
                    int d = begun[o] ? done[o] : -1;
                    if (!busy[o] && done[o] < total && d < fewest) {
                        on[t] = o;
                        fewest = d;
                    }
                }
                if (on[t] < 0) {
                    next[t] = Long.MAX_VALUE;
                    continue;
                }
                busy[on[t]] = true;
                begun[on[t]] = true;
                stretchStart[t] = clock[t];
            }
            next[t] = clock[t] + Math.round(cost[on[t]][done[on[t]]] * SECOND);
        }
        return new Schedule(reports, end, total, warmup, from);
    }

    /**
     * Costs per iteration of chains of {@code total} iterations: the first {@code cheapIterations}
     * (the first half of warm-up) at {@code cheap} seconds, the rest at {@code dear}, each chain
     * at its own pace (a factor of {@code pace[c]}), each iteration within 10% of its cost.
     */
    private static double[][] costs(double[] pace, int total, int cheapIterations, double cheap, double dear, long seed) {
        SplittableRandom random = new SplittableRandom(seed);
        double[][] cost = new double[pace.length][total];
        for (int c = 0; c < pace.length; c++) {
            for (int k = 0; k < total; k++) {
                cost[c][k] = pace[c] * (k < cheapIterations ? cheap : dear) * (0.9 + 0.2 * random.nextDouble());
            }
        }
        return cost;
    }

    /** The estimate at 10%, 50% and 90% of the schedule is within {@link #TOLERANCE} of the time truly left. */
    private static void assertEstimatesHold(Schedule s, int threads) {
        for (double share : new double[] {0.1, 0.5, 0.9}) {
            long at = Math.round(s.end() * share);
            double estimate = s.secondsLeftAt(progress(s.from().length, threads), at);
            double truth = s.trueSecondsLeft(at);
            assertEquals(1, estimate / truth, TOLERANCE, String.format("at %.0f%% of the run (%.1f s): about %.1f s left, truly %.1f s",
                    100 * share, at / 1e9, estimate, truth));
        }
    }

    /**
     * Four chains on two threads taking turns, the first half of warm-up at a quarter of the cost
     * of the rest (as the joint step makes it), chains at paces that differ by up to a third:
     * each chain runs half the wall time, so its pace in wall time would be half its own.
     */
    @Test
    void fourChainsTakingTurnsOnTwoThreadsAreTimedByTheirRunningTime() {
        double[][] cost = costs(new double[] {1.0, 1.2, 0.9, 1.1}, 1000, 250, 0.01, 0.04, 1L);
        assertEstimatesHold(turns(cost, new int[4], 500, 2, 0.5), 2);
    }

    @Test
    void fourChainsTakingTurnsOnOneThreadAreTimedByTheirRunningTime() {
        double[][] cost = costs(new double[] {1.0, 1.3, 0.9, 1.1}, 600, 150, 0.01, 0.04, 2L);
        assertEstimatesHold(turns(cost, new int[4], 300, 1, 0.5), 1);
    }

    /**
     * Chain 1 resumed half-way (its first half untimed, and already at the dear cost), chain 2
     * from the start, on two threads: chain 2's dear parts are priced from chain 1's.
     */
    @Test
    void aChainResumedPartWayIsTimedFromWhereItResumed() {
        double[][] cost = costs(new double[] {1.0, 1.1}, 1000, 250, 0.01, 0.04, 3L);
        assertEstimatesHold(turns(cost, new int[] {500, 0}, 500, 2, 0.5), 2);
    }

    @Test
    void theTimeLeftFollowsTheCurrentPaceNotTheAverageSinceTheStart() {
        // 1,000 iterations on one thread: 50 per second for 10 s, then 10 per second (the joint
        // step starting). At 40 s: 800 done, 200 left at 10 per second = 20 s. The pace since
        // the start (800 in 40 s) would say 10 s.
        Schedule s = turns(costs(new double[] {1}, 1000, 500, 0.02, 0.1, 4L), new int[1], 600, 1, 0.5);
        ConsoleProgress p = progress(1, 1);
        assertEquals(20, s.secondsLeftAt(p, 40 * SECOND), 20 * TOLERANCE);
        assertTrue(p.line().startsWith("chain 1 sampling "), p.line());
    }

    /**
     * One dear iteration (as the joint step's first fit of its metric, half-way through warm-up)
     * is not expected again in every part ahead: 1,000 iterations at 0.1 s, iteration 505 at 5 s.
     * At 510, the end of its part, 490 x 0.1 = 49 s are left; pricing the part's mean cost ahead
     * would say 289 s.
     */
    @Test
    void aOneOffDearIterationIsNotExpectedAgain() {
        ConsoleProgress p = progress(1, 1);
        long running = 0;
        for (int k = 1; k <= 510; k++) {
            running += k == 505 ? 5 * SECOND : SECOND / 10;
            p.record(0, k, 1000, true, running);
        }
        assertEquals("chain 1 warm-up 510/1000 | about 49 s left", p.line());
    }

    /**
     * The running time left of the slowest chain, not the threads' share of all chains', when it
     * is the larger: three chains on two threads, chain 1 done at 0.1 s an iteration, chain 2 at
     * 60 of 100 at twice that cost (8 s left), chain 3 at 90 at 0.1 s (1 s left). Shared by two
     * threads the 9 s would be 4.5; chain 2 alone needs 8.
     */
    @Test
    void theSlowestChainsTimeLeftBoundsTheEstimate() {
        ConsoleProgress p = progress(3, 2);
        for (int k = 1; k <= 100; k++) {
            p.record(0, k, 100, false, k * SECOND / 10);
        }
        for (int k = 1; k <= 60; k++) {
            p.record(1, k, 100, false, k * SECOND / 5);
        }
        for (int k = 1; k <= 90; k++) {
            p.record(2, k, 100, false, k * SECOND / 10);
        }
        assertEquals("chain 1 done 100/100 | chain 2 sampling 60/100 | chain 3 sampling 90/100 | about 8 s left", p.line());
    }

    /**
     * Waiting chains cost what the running ones cost for the same parts, and the running time
     * left is shared by the threads the fitter said it runs: 4 chains of 100 iterations, the
     * first 50 at 0.1 s and the rest at 0.5 s (30 s a chain); chains 1 and 2 at 80 have 10 s left
     * each, chains 3 and 4 30 s: 80 s of running time on two threads, 40 s; on one, 80 s.
     */
    @Test
    void theRunningTimeLeftIsSharedByTheThreadsAtWork() {
        for (int threads = 1; threads <= 2; threads++) {
            ConsoleProgress p = progress(4, threads);
            for (int c = 0; c < 2; c++) {
                for (int k = 1; k <= 80; k++) {
                    p.record(c, k, 100, true, Math.round((Math.min(k, 50) * 0.1 + Math.max(0, k - 50) * 0.5) * SECOND));
                }
            }
            assertTrue(p.line().endsWith("chain 3 waiting 0/100 | chain 4 waiting 0/100 | about " + 80 / threads + " s left"), p.line());
        }
    }

    @Test
    void aChainRestoredFinishedIsDoneAndOnlyTimedIterationsGiveAnEstimate() {
        ConsoleProgress p = progress(3, 2);
        p.resumed(0, 100, 100, false);
        p.resumed(1, 30, 100, true);
        // nothing has been timed in this fit yet: no estimate
        assertEquals("chain 1 done 100/100 | chain 2 warm-up 30/100 | chain 3 waiting 0/100", p.line());
        for (int k = 31; k <= 40; k++) {
            p.record(1, k, 100, true, (k - 30) * SECOND / 10);
        }
        // chain 2: 60 left at 0.1 s; chain 3 (no time of its own) 100 at the same: max(16 / 2, 10) s
        assertEquals("chain 1 done 100/100 | chain 2 warm-up 40/100 | chain 3 waiting 0/100 | about 10 s left", p.line());
    }

    @Test
    void everyChainRestoredFinishedPrintsOneLineOfDoneChains() {
        ByteArrayOutputStream bytes = new ByteArrayOutputStream();
        ConsoleProgress p = new ConsoleProgress(new PrintStream(bytes, true, StandardCharsets.UTF_8), 2, 1.0, 0);
        p.resumed(0, 100, 100, false);
        p.resumed(1, 100, 100, false);
        assertEquals("chain 1 done 100/100 | chain 2 done 100/100" + System.lineSeparator(), bytes.toString(StandardCharsets.UTF_8));
    }

    @Test
    void longTimesAreShownInMinutesAndHours() {
        assertEquals("89 s", ConsoleProgress.formatSeconds(89));
        assertEquals("2 min", ConsoleProgress.formatSeconds(100));
        assertEquals("1.5 h", ConsoleProgress.formatSeconds(5400));
    }

    /**
     * Until a chain has run a whole part of the dearer iterations the fitter announced, the
     * estimate cannot price them, and the line says "at least"; then "about". Without an
     * announcement it says "about" throughout.
     */
    @Test
    void theLineSaysAtLeastUntilTheDearerIterationsArePriced() {
        ConsoleProgress announced = progress(1, 1);
        ConsoleProgress silent = progress(1, 1);
        announced.dearerFrom(150);
        // 300 iterations in 100 parts of 3: iteration 150 (0-based) is in part 50, so part 51, iterations
        // 153 to 155, prices them once 156 are done
        for (int k = 1; k <= 156; k++) {
            long running = k * SECOND / 10;
            announced.record(0, k, 300, k <= 200, running);
            silent.record(0, k, 300, k <= 200, running);
            if (k == 100 || k == 155 || k == 156) {
                assertTrue(announced.line().contains(k < 156 ? " | at least " : " | about "), announced.line());
                assertTrue(silent.line().contains(" | about "), silent.line());
            }
        }
    }
}
