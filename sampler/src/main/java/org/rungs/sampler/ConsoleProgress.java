package org.rungs.sampler;

import java.io.PrintStream;
import java.util.Locale;

/**
 * Prints one progress line per interval to a stream (stderr): per chain its phase and
 * iteration, and an estimate of the time left.
 *
 * <p>The estimate reads each chain's running time ({@link ProgressListener#iterationDone(int,
 * int, int, boolean, long)}: the stretches a thread ran it, not its waits for a thread, which
 * depend on how the threads take turns) and splits its run into {@link #PARTS} equal parts.
 * Iterations do not all cost the same (the first half of warm-up runs without the joint step,
 * whose sweeps cost several times more), so the iterations of a part still ahead of a chain are
 * priced at the mean cost per iteration of the other chains that have run that part whole,
 * scaled by the chain's own pace against theirs over the last {@link #RECENT} parts both ran
 * (chains differ by a fifth and more, with their own adapted step sizes); where no other chain
 * has, at the chain's own recent cost (its last whole part, its dearest iteration left out as a
 * one-off, else its current part). A chain resumed from a checkpoint has no time for the parts
 * an earlier run made. Costs that change in parts no chain has reached (the dearer second half
 * of warm-up, seen from the first) cannot be foreseen: until a chain has run a whole part past
 * the iteration where the fitter said they rise ({@link #dearerFrom}), the line says "at least".
 *
 * <p>The time left is then the running time left of all chains shared by the threads at work
 * (as many as the fitter runs, fewer when fewer chains are left), but never less than the
 * running time left of the slowest chain, which no thread can share: with the threads taking
 * turns on the chains in short stretches, the fitter's schedule is close to the preemptive one
 * whose length is exactly the larger of the two (McNaughton 1959, Management Science 6, 1-12).
 */
public final class ConsoleProgress implements ProgressListener {
    /** Parts of a chain's run that are timed. */
    static final int PARTS = 100;
    /** Parts over which a chain's pace is compared with the others'. */
    private static final int RECENT = 10;

    private final PrintStream out;
    private final int chains;
    private final long intervalNanos;
    private long lastPrint;
    private int total = 1;
    private int threads = 1;
    /** The iteration from which iterations cost more, as the fitter said; none by default. */
    private int dearerFrom = Integer.MAX_VALUE;
    private final int[] done;
    private final boolean[] warming;
    /** Per chain and part: nanoseconds of running time timed, and the iterations they cover. */
    private final long[][] spent;
    private final int[][] timed;
    /** Per chain and part: the running time of its dearest iteration and of its second dearest. */
    private final long[][] dearest;
    private final long[][] secondDearest;
    /** Per chain, the iterations and running time of its last record: where the next timing starts. */
    private final int[] timedFrom;
    private final long[] runningAt;

    public ConsoleProgress(PrintStream out, int chains, double intervalSeconds) {
        this(out, chains, intervalSeconds, System.nanoTime());
    }

    /** Starting the clock of the printing interval at {@code startNanos} (tests). */
    ConsoleProgress(PrintStream out, int chains, double intervalSeconds, long startNanos) {
        this.out = out;
        this.chains = chains;
        this.intervalNanos = (long) (intervalSeconds * 1e9);
        this.lastPrint = startNanos;
        this.done = new int[chains];
        this.warming = new boolean[chains];
        this.spent = new long[chains][PARTS];
        this.timed = new int[chains][PARTS];
        this.dearest = new long[chains][PARTS];
        this.secondDearest = new long[chains][PARTS];
        this.timedFrom = new int[chains];
        this.runningAt = new long[chains];
    }

    /** Without a running time the iterations are shown but not timed. */
    @Override
    public synchronized void iterationDone(int chain, int iterations, int totalIterations, boolean warmingUp) {
        untimed(chain, iterations, totalIterations, warmingUp);
        maybePrint(System.nanoTime(), iterations == totalIterations);
    }

    @Override
    public synchronized void iterationDone(int chain, int iterations, int totalIterations, boolean warmingUp, long runningNanos) {
        record(chain, iterations, totalIterations, warmingUp, runningNanos);
        maybePrint(System.nanoTime(), iterations == totalIterations);
    }

    @Override
    public synchronized void resumed(int chain, int iterations, int totalIterations, boolean warmingUp) {
        untimed(chain, iterations, totalIterations, warmingUp);
        boolean allDone = true;
        for (int d : done) {
            allDone &= d == total;
        }
        if (allDone) {
            out.println(line());
        }
    }

    @Override
    public synchronized void threads(int threads) {
        this.threads = Math.max(1, threads);
    }

    @Override
    public synchronized void dearerFrom(int iteration) {
        this.dearerFrom = iteration;
    }

    private void maybePrint(long now, boolean chainEnded) {
        if (now - lastPrint >= intervalNanos || chainEnded) {
            lastPrint = now;
            out.println(line());
        }
    }

    /** Chain {@code chain} is at {@code iterations} of {@code totalIterations}, made without a timing. */
    synchronized void untimed(int chain, int iterations, int totalIterations, boolean warmingUp) {
        total = totalIterations;
        done[chain] = iterations;
        warming[chain] = warmingUp;
        timedFrom[chain] = iterations;
    }

    /**
     * Chain {@code chain} has finished {@code iterations} of {@code totalIterations} after
     * {@code runningNanos} of running time; the time since its last record is shared evenly by
     * the iterations made since (one, as {@link ChainRun} reports).
     */
    synchronized void record(int chain, int iterations, int totalIterations, boolean warmingUp, long runningNanos) {
        total = totalIterations;
        int from = timedFrom[chain];
        int n = iterations - from;
        if (n > 0) {
            long nanos = runningNanos - runningAt[chain];
            for (int k = from; k < iterations; k++) {
                int p = part(k);
                // the iteration's share, so that the shares sum to the whole
                long share = nanos * (k - from + 1) / n - nanos * (k - from) / n;
                spent[chain][p] += share;
                timed[chain][p]++;
                if (share > dearest[chain][p]) {
                    secondDearest[chain][p] = dearest[chain][p];
                    dearest[chain][p] = share;
                } else if (share > secondDearest[chain][p]) {
                    secondDearest[chain][p] = share;
                }
            }
        }
        done[chain] = iterations;
        warming[chain] = warmingUp;
        timedFrom[chain] = iterations;
        runningAt[chain] = runningNanos;
    }

    /** The progress line. */
    synchronized String line() {
        StringBuilder sb = new StringBuilder();
        long sum = 0;
        for (int c = 0; c < chains; c++) {
            int d = done[c];
            sum += d;
            if (c > 0) {
                sb.append(" | ");
            }
            sb.append("chain ").append(c + 1).append(' ')
                    .append(d == total ? "done" : d == 0 ? "waiting" : warming[c] ? "warm-up" : "sampling")
                    .append(' ').append(d).append('/').append(total);
        }
        double left = secondsLeft();
        if (sum < (long) total * chains && !Double.isNaN(left)) {
            sb.append(foreseen() ? " | about " : " | at least ").append(formatSeconds(left)).append(" left");
        }
        return sb.toString();
    }

    /** Whether the dearer iterations are priced: none ahead, or some chain has run a whole part of them. */
    private boolean foreseen() {
        if (dearerFrom >= total) {
            return true;
        }
        int priced = start(Math.min(PARTS, part(dearerFrom) + 2));
        for (int d : done) {
            if (d >= priced) {
                return true;
            }
        }
        return false;
    }

    /** The estimated wall time left in seconds (see the class comment); NaN before any iteration is timed. */
    synchronized double secondsLeft() {
        double fallback = recentMean();
        if (Double.isNaN(fallback)) {
            return Double.NaN;
        }
        double all = 0;
        double longest = 0;
        int unfinished = 0;
        for (int c = 0; c < chains; c++) {
            if (done[c] < total) {
                double left = nanosLeft(c, fallback);
                all += left;
                longest = Math.max(longest, left);
                unfinished++;
            }
        }
        return Math.max(all / Math.max(1, Math.min(threads, unfinished)), longest) / 1e9;
    }

    /**
     * Running nanoseconds chain c needs for the iterations it has left: each at the others' cost
     * for its part times the chain's relative pace, or at the chain's own recent cost (for a
     * chain that has not run in this fit, {@code fallback}: the chains' mean recent cost).
     */
    private double nanosLeft(int c, double fallback) {
        double ratio = pace(c);
        double own = recent(c);
        if (Double.isNaN(own)) {
            own = fallback;
        }
        double left = 0;
        for (int p = part(done[c]); p < PARTS; p++) {
            int iterations = start(p + 1) - Math.max(start(p), done[c]);
            if (iterations > 0) {
                double theirs = others(c, p);
                left += iterations * (Double.isNaN(theirs) ? own : theirs * ratio);
            }
        }
        return left;
    }

    /** Chain c's cost over the other chains' on the last {@link #RECENT} parts it and they ran whole; 1 if none. */
    private double pace(int c) {
        double own = 0;
        double theirs = 0;
        int n = 0;
        for (int p = PARTS - 1; p >= 0 && n < RECENT; p--) {
            double mine = whole(c, p);
            double others = Double.isNaN(mine) ? Double.NaN : others(c, p);
            if (!Double.isNaN(others)) {
                own += mine;
                theirs += others;
                n++;
            }
        }
        return n > 0 ? own / theirs : 1;
    }

    /**
     * Chain c's cost per iteration in its last part run whole, its dearest iteration counted at
     * the cost of its second dearest (in parts of 3 iterations or more): a one-off such as the
     * joint step's first fit of its metric belongs to its part, not to every part ahead. Else in
     * the part it is in; NaN if neither is timed.
     */
    private double recent(int c) {
        for (int p = PARTS - 1; p >= 0; p--) {
            if (!Double.isNaN(whole(c, p))) {
                long oneOff = timed[c][p] >= 3 ? dearest[c][p] - secondDearest[c][p] : 0;
                return (double) (spent[c][p] - oneOff) / timed[c][p];
            }
        }
        int current = Math.min(part(done[c]), PARTS - 1);
        return timed[c][current] > 0 ? (double) spent[c][current] / timed[c][current] : Double.NaN;
    }

    /** The mean of the chains' recent costs per iteration; NaN if no chain has one. */
    private double recentMean() {
        double sum = 0;
        int n = 0;
        for (int c = 0; c < chains; c++) {
            double r = recent(c);
            if (!Double.isNaN(r)) {
                sum += r;
                n++;
            }
        }
        return n > 0 ? sum / n : Double.NaN;
    }

    /** The mean cost per iteration of part p over the chains other than c that ran it whole; NaN if none did. */
    private double others(int c, int p) {
        double sum = 0;
        int n = 0;
        for (int o = 0; o < chains; o++) {
            double cost = o == c ? Double.NaN : whole(o, p);
            if (!Double.isNaN(cost)) {
                sum += cost;
                n++;
            }
        }
        return n > 0 ? sum / n : Double.NaN;
    }

    /** Chain c's cost per iteration of part p when it timed the whole part in this fit; NaN otherwise (empty parts too). */
    private double whole(int c, int p) {
        int width = start(p + 1) - start(p);
        return width > 0 && timed[c][p] == width ? (double) spent[c][p] / width : Double.NaN;
    }

    /** The part that iteration k (0-based) belongs to. */
    private int part(int k) {
        return (int) ((long) k * PARTS / total);
    }

    /** The first iteration (0-based) of part p; {@code total} for p = PARTS. */
    private int start(int p) {
        return (int) (((long) p * total + PARTS - 1) / PARTS);
    }

    /** Seconds as "42 s", "7 min" or "1.5 h". */
    public static String formatSeconds(double seconds) {
        if (seconds < 90) {
            return String.format(Locale.ROOT, "%.0f s", seconds);
        }
        if (seconds < 5400) {
            return String.format(Locale.ROOT, "%.0f min", seconds / 60);
        }
        return String.format(Locale.ROOT, "%.1f h", seconds / 3600);
    }
}
