package org.rungs.validation;

import java.io.OutputStream;
import java.io.PrintStream;
import java.util.Locale;

/**
 * One progress line per interval on a stream (stderr) for a run of replications (calibration,
 * recovery): replications done of the total, an estimate of the time left from this run's rate,
 * and the warnings gathered so far, each a count of fits (for example those that fail the
 * convergence rule of MODEL.md section 7). Warnings are counted, never hidden.
 */
public final class ReplicationProgress {
    private final PrintStream out;
    private final String command;
    private final String[] warnings;
    private final int[] counts;
    private final int total;
    private final long intervalNanos;
    private final long start = System.nanoTime();
    private long lastPrint = start;
    private int before;
    private int done;
    private int doneHere;

    /**
     * @param out      where the lines go; null for nowhere
     * @param command  the line's first word, e.g. {@code calibrate}
     * @param total    replications of the run, including those finished before it
     * @param warnings what each flag of {@link #finished} counts, e.g. {@code non-converged fits}
     */
    public ReplicationProgress(PrintStream out, String command, int total, double intervalSeconds, String... warnings) {
        this.out = out != null ? out : new PrintStream(OutputStream.nullOutputStream());
        this.command = command;
        this.total = total;
        this.intervalNanos = (long) (intervalSeconds * 1e9);
        this.warnings = warnings.clone();
        this.counts = new int[warnings.length];
    }

    /** A replication finished before this run (found in the folder): counted, not timed. */
    public synchronized void earlier(boolean... flags) {
        before++;
        done++;
        count(flags);
    }

    /** A replication of this run finished; prints a line when one is due or the run is complete. */
    public synchronized void finished(boolean... flags) {
        done++;
        doneHere++;
        count(flags);
        long now = System.nanoTime();
        if (now - lastPrint >= intervalNanos || doneHere == total - before) {
            lastPrint = now;
            out.println(line(now));
        }
    }

    private void count(boolean[] flags) {
        for (int w = 0; w < counts.length; w++) {
            counts[w] += flags[w] ? 1 : 0;
        }
    }

    synchronized String line(long now) {
        StringBuilder sb = new StringBuilder(command).append(": ").append(done).append('/').append(total).append(" replications");
        if (doneHere > 0 && done < total) {
            double left = (now - start) / 1e9 * (total - before - doneHere) / doneHere;
            sb.append(" | about ").append(duration(left)).append(" left");
        }
        for (int w = 0; w < counts.length; w++) {
            sb.append(" | ").append(counts[w]).append(' ').append(warnings[w]);
        }
        return sb.toString();
    }

    /** Seconds in words: "40 s", "12 min", "2.5 h". */
    public static String duration(double s) {
        if (s < 90) {
            return String.format(Locale.ROOT, "%.0f s", s);
        }
        if (s < 5400) {
            return String.format(Locale.ROOT, "%.0f min", s / 60);
        }
        return String.format(Locale.ROOT, "%.1f h", s / 3600);
    }
}
