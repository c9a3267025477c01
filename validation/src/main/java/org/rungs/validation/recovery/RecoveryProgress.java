package org.rungs.validation.recovery;

import java.io.PrintStream;
import java.util.Locale;

/**
 * One progress line per interval on a stream (stderr): replications done of the total, the time
 * left at this run's rate, and the fits so far that fail the convergence rule of MODEL.md
 * section 7 (counted, never hidden).
 */
final class RecoveryProgress {
    private final PrintStream out;
    private final int total;
    private final int todo;
    private final long intervalNanos;
    private final long start = System.nanoTime();
    private long lastPrint = start;
    private int done;
    private int doneHere;
    private int nonConverged;

    /**
     * @param total   replications of the study
     * @param already those finished before this run (from the folder), counted in the warnings
     */
    RecoveryProgress(PrintStream out, int total, Iterable<ReplicationEstimates> already, double intervalSeconds) {
        this.out = out;
        this.total = total;
        int before = 0;
        for (ReplicationEstimates r : already) {
            before++;
            nonConverged += r.nonConverged() ? 1 : 0;
        }
        this.done = before;
        this.todo = total - before;
        this.intervalNanos = (long) (intervalSeconds * 1e9);
    }

    synchronized void finished(ReplicationEstimates r) {
        done++;
        doneHere++;
        nonConverged += r.nonConverged() ? 1 : 0;
        long now = System.nanoTime();
        if (now - lastPrint >= intervalNanos || doneHere == todo) {
            lastPrint = now;
            out.println(line(now));
        }
    }

    synchronized String line(long now) {
        StringBuilder sb = new StringBuilder("recover: ").append(done).append('/').append(total).append(" replications");
        if (doneHere > 0 && done < total) {
            double left = (now - start) / 1e9 * (todo - doneHere) / doneHere;
            sb.append(" | about ").append(duration(left)).append(" left");
        }
        return sb.append(" | ").append(nonConverged).append(" non-converged fits").toString();
    }

    static String duration(double s) {
        if (s < 90) {
            return String.format(Locale.ROOT, "%.0f s", s);
        }
        if (s < 5400) {
            return String.format(Locale.ROOT, "%.0f min", s / 60);
        }
        return String.format(Locale.ROOT, "%.1f h", s / 3600);
    }
}
