package org.rungs.sampler;

import java.io.PrintStream;
import java.util.Arrays;
import java.util.Locale;
import java.util.concurrent.atomic.AtomicIntegerArray;
import java.util.concurrent.atomic.AtomicLongArray;

/**
 * Prints one progress line per interval to a stream (stderr): per chain its phase and
 * iteration, and an estimate of the time left.
 *
 * <p>The estimate times each chain's run in {@link #PARTS} equal parts. Iterations do not all
 * cost the same (the first half of warm-up runs without the joint step, whose sweeps cost
 * several times more), so a part still ahead of a chain is given the mean time the chains that
 * have run it took (scaled to a running chain's own pace), or, where none has, the time of the
 * part finished last (a running chain's own recent pace). The chains still waiting then start,
 * in order, as the running ones finish, on as many threads as ran at once so far; the time left
 * is when the last one ends. A chain that runs on alone after the others have finished is
 * thereby not counted as going faster.
 */
public final class ConsoleProgress implements ProgressListener {
    /** Parts of a chain's run that are timed. */
    static final int PARTS = 100;
    /** Parts over which a chain's pace is compared with the others'. */
    private static final int RECENT = 5;
    private static final long UNSET = Long.MIN_VALUE;

    private final PrintStream out;
    private final int chains;
    private final AtomicIntegerArray done;
    private final AtomicIntegerArray warming;
    /** Per chain, the time it reached the start of each part (part PARTS: its end), or UNSET. */
    private final AtomicLongArray reached;
    private final long intervalNanos;
    private final long start;
    private volatile long lastPrint;
    private volatile int total = 1;
    private int threads = 1;

    public ConsoleProgress(PrintStream out, int chains, double intervalSeconds) {
        this(out, chains, intervalSeconds, System.nanoTime());
    }

    /** Starting the clock at {@code startNanos} (tests). */
    ConsoleProgress(PrintStream out, int chains, double intervalSeconds, long startNanos) {
        this.out = out;
        this.chains = chains;
        this.done = new AtomicIntegerArray(chains);
        this.warming = new AtomicIntegerArray(chains);
        this.reached = new AtomicLongArray(chains * (PARTS + 1));
        for (int i = 0; i < reached.length(); i++) {
            reached.set(i, UNSET);
        }
        this.intervalNanos = (long) (intervalSeconds * 1e9);
        this.start = startNanos;
        this.lastPrint = startNanos;
    }

    @Override
    public void iterationDone(int chain, int iterations, int totalIterations, boolean warmingUp) {
        long now = System.nanoTime();
        record(chain, iterations, totalIterations, warmingUp, now);
        if (now - lastPrint >= intervalNanos || iterations == totalIterations) {
            synchronized (this) {
                if (now - lastPrint >= intervalNanos || iterations == totalIterations) {
                    lastPrint = now;
                    out.println(line(now));
                }
            }
        }
    }

    /** Chain {@code chain} has finished {@code iterations} of {@code totalIterations} at time {@code now}. */
    void record(int chain, int iterations, int totalIterations, boolean warmingUp, long now) {
        done.set(chain, iterations);
        warming.set(chain, warmingUp ? 1 : 0);
        total = totalIterations;
        // Only the chain's own thread writes its row; parts crossed in one call share one time.
        int at = chain * (PARTS + 1);
        int part = (int) ((long) iterations * PARTS / totalIterations);
        for (int p = part; p >= 0 && reached.get(at + p) == UNSET; p--) {
            reached.set(at + p, now);
        }
    }

    /** The progress line at time {@code now}. */
    synchronized String line(long now) {
        StringBuilder sb = new StringBuilder();
        long sum = 0;
        int running = 0;
        for (int c = 0; c < chains; c++) {
            int d = done.get(c);
            sum += d;
            running += d > 0 && d < total ? 1 : 0;
            if (c > 0) {
                sb.append(" | ");
            }
            sb.append("chain ").append(c + 1).append(' ')
                    .append(d == total ? "done" : d == 0 ? "waiting" : warming.get(c) == 1 ? "warm-up" : "sampling")
                    .append(' ').append(d).append('/').append(total);
        }
        threads = Math.max(threads, running);
        long all = (long) total * chains;
        if (sum > 0 && sum < all) {
            sb.append(" | about ").append(formatSeconds(secondsLeft(now, sum, all))).append(" left");
        }
        return sb.toString();
    }

    private double secondsLeft(long now, long sum, long all) {
        double[] part = partSeconds();
        if (part == null) {
            // No part timed yet: the pace since the start.
            return (now - start) / 1e9 * (all - sum) / sum;
        }
        double whole = 0;
        for (double p : part) {
            whole += p;
        }
        double[] free = new double[threads];
        int slot = 0;
        for (int c = 0; c < chains; c++) {
            int d = done.get(c);
            if (d > 0 && d < total) {
                free[Math.min(slot++, threads - 1)] += left(c, d, now, part);
            }
        }
        for (int c = 0; c < chains; c++) {
            if (done.get(c) == 0) {
                Arrays.sort(free);
                free[0] += whole;
            }
        }
        return Arrays.stream(free).max().orElse(0);
    }

    /**
     * Seconds left for chain c at iteration d: the rest of its current part, then the parts ahead,
     * each the other chains' mean for it scaled by how much slower or faster than them chain c ran
     * its last {@link #RECENT} parts (chains differ by a fifth and more, with their own adapted
     * step sizes), or at chain c's own recent pace where no other chain has run it yet.
     */
    private double left(int c, int d, long now, double[] part) {
        int current = (int) ((long) d * PARTS / total);
        double own = 0;
        double others = 0;
        int n = 0;
        for (int p = current - 1; p >= 0 && n < RECENT; p--) {
            double mine = seconds(c, p);
            if (Double.isNaN(mine)) {
                break;
            }
            own += mine;
            others += otherMean(c, p);
            n++;
        }
        double ratio = n > 0 && !Double.isNaN(others) ? own / others : 1;
        double seconds = -(now - reached.get(c * (PARTS + 1) + current)) / 1e9;
        for (int p = current; p < PARTS; p++) {
            double theirs = otherMean(c, p);
            seconds += !Double.isNaN(theirs) ? theirs * ratio : n > 0 ? own / n : part[p];
            if (p == current) {
                seconds = Math.max(0, seconds);
            }
        }
        return seconds;
    }

    /** Seconds chain c took for part p, NaN if it has not run it (or crossed it in one record). */
    private double seconds(int c, int p) {
        long from = reached.get(c * (PARTS + 1) + p);
        long to = reached.get(c * (PARTS + 1) + p + 1);
        return from != UNSET && to != UNSET && to > from ? (to - from) / 1e9 : Double.NaN;
    }

    /** The mean seconds of part p over the chains other than c (all, for c = -1) that have run it; NaN if none has. */
    private double otherMean(int c, int p) {
        double sum = 0;
        int n = 0;
        for (int o = 0; o < chains; o++) {
            double s = o == c ? Double.NaN : seconds(o, p);
            if (!Double.isNaN(s)) {
                sum += s;
                n++;
            }
        }
        return n > 0 ? sum / n : Double.NaN;
    }

    /**
     * Per part, the mean seconds the chains that ran it took; where none has, the seconds of the
     * part finished last. Null if no part has been timed.
     */
    private double[] partSeconds() {
        double[] seconds = new double[PARTS];
        double latest = Double.NaN;
        long latestEnd = UNSET;
        for (int p = 0; p < PARTS; p++) {
            seconds[p] = otherMean(-1, p);
            for (int c = 0; c < chains; c++) {
                long to = reached.get(c * (PARTS + 1) + p + 1);
                if (!Double.isNaN(seconds(c, p)) && to > latestEnd) {
                    latestEnd = to;
                    latest = seconds(c, p);
                }
            }
        }
        if (latestEnd == UNSET) {
            return null;
        }
        for (int p = 0; p < PARTS; p++) {
            if (Double.isNaN(seconds[p])) {
                seconds[p] = latest;
            }
        }
        return seconds;
    }

    static String formatSeconds(double seconds) {
        if (seconds < 90) {
            return String.format(Locale.ROOT, "%.0f s", seconds);
        }
        if (seconds < 5400) {
            return String.format(Locale.ROOT, "%.0f min", seconds / 60);
        }
        return String.format(Locale.ROOT, "%.1f h", seconds / 3600);
    }
}
