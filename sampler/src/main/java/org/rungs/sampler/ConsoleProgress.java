package org.rungs.sampler;

import java.io.PrintStream;
import java.util.Locale;
import java.util.concurrent.atomic.AtomicIntegerArray;

/**
 * Prints one progress line per interval to a stream (stderr): per chain its phase and
 * iteration, and an estimate of the time left from the overall rate so far.
 */
public final class ConsoleProgress implements ProgressListener {
    private final PrintStream out;
    private final AtomicIntegerArray done;
    private final AtomicIntegerArray warming;
    private final long intervalNanos;
    private final long start = System.nanoTime();
    private volatile long lastPrint = System.nanoTime();
    private volatile int total = 1;

    public ConsoleProgress(PrintStream out, int chains, double intervalSeconds) {
        this.out = out;
        this.done = new AtomicIntegerArray(chains);
        this.warming = new AtomicIntegerArray(chains);
        this.intervalNanos = (long) (intervalSeconds * 1e9);
    }

    @Override
    public void iterationDone(int chain, int iterations, int totalIterations, boolean warmingUp) {
        done.set(chain, iterations);
        warming.set(chain, warmingUp ? 1 : 0);
        total = totalIterations;
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

    String line(long now) {
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
        if (sum > 0 && sum < all) {
            double left = elapsed * (all - sum) / sum;
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
