package org.rungs.sampler;

import java.io.PrintStream;
import java.util.Locale;
import java.util.concurrent.atomic.AtomicIntegerArray;

/**
 * Prints one progress line per interval to a stream (stderr): per chain its phase and
 * iteration, and an estimate of the time left from the pace over the last {@link #WINDOW} lines.
 */
public final class ConsoleProgress implements ProgressListener {
    /**
     * Progress lines over which the pace is measured. Iterations do not all cost the same (the
     * first half of warm-up runs without the joint step, whose sweeps cost several times more), so
     * the pace since the start would promise too little time left once the joint step runs.
     */
    static final int WINDOW = 15;

    private final PrintStream out;
    private final AtomicIntegerArray done;
    private final AtomicIntegerArray warming;
    private final long intervalNanos;
    private final long start;
    private volatile long lastPrint;
    private volatile int total = 1;
    /** (time, iterations done over all chains) at the last {@link #WINDOW} lines, oldest at {@code lines % WINDOW}. */
    private final long[] lineTime = new long[WINDOW];
    private final long[] lineDone = new long[WINDOW];
    private int lines;

    public ConsoleProgress(PrintStream out, int chains, double intervalSeconds) {
        this(out, chains, intervalSeconds, System.nanoTime());
    }

    /** Starting the clock at {@code startNanos} (tests). */
    ConsoleProgress(PrintStream out, int chains, double intervalSeconds, long startNanos) {
        this.out = out;
        this.done = new AtomicIntegerArray(chains);
        this.warming = new AtomicIntegerArray(chains);
        this.intervalNanos = (long) (intervalSeconds * 1e9);
        this.start = startNanos;
        this.lastPrint = startNanos;
    }

    @Override
    public void iterationDone(int chain, int iterations, int totalIterations, boolean warmingUp) {
        record(chain, iterations, totalIterations, warmingUp);
        long now = System.nanoTime();
        if (now - lastPrint >= intervalNanos || iterations == totalIterations) {
            synchronized (this) {
                if (now - lastPrint >= intervalNanos || iterations == totalIterations) {
                    lastPrint = now;
                    out.println(line(now));
                }
            }
        }
    }

    void record(int chain, int iterations, int totalIterations, boolean warmingUp) {
        done.set(chain, iterations);
        warming.set(chain, warmingUp ? 1 : 0);
        total = totalIterations;
    }

    /** The progress line at time {@code now}; each call counts as one line of the pace's window. */
    synchronized String line(long now) {
        StringBuilder sb = new StringBuilder();
        long sum = 0;
        for (int c = 0; c < done.length(); c++) {
            int d = done.get(c);
            sum += d;
            if (c > 0) {
                sb.append(" | ");
            }
            sb.append("chain ").append(c + 1).append(' ')
                    .append(d == total ? "done" : d == 0 ? "waiting" : warming.get(c) == 1 ? "warm-up" : "sampling")
                    .append(' ').append(d).append('/').append(total);
        }
        long all = (long) total * done.length();
        double elapsed = (now - start) / 1e9;
        int oldest = lines % WINDOW;
        long since = lines < WINDOW ? start : lineTime[oldest];
        long doneSince = lines < WINDOW ? 0 : lineDone[oldest];
        lineTime[oldest] = now;
        lineDone[oldest] = sum;
        lines++;
        if (sum > 0 && sum < all) {
            double left = sum > doneSince && now > since
                    ? (now - since) / 1e9 * (all - sum) / (sum - doneSince)
                    : elapsed * (all - sum) / sum;
            sb.append(" | about ").append(formatSeconds(left)).append(" left");
        }
        return sb.toString();
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
