package org.rungs.validation.calibration;

import java.io.PrintStream;
import java.util.Locale;

/**
 * One progress line per interval on a stream (stderr): replications done of the total, an
 * estimate of the time left from this run's rate, and the warnings gathered so far: fits that
 * fail the convergence rule of MODEL.md section 7 and fits whose bulk ESS is below the L thinned
 * draws (their ranks are not from nearly independent draws). Warnings are counted, never hidden.
 */
final class CalibrationProgress {
    private final PrintStream out;
    private final int total;
    private final int todo;
    private final long intervalNanos;
    private final long start = System.nanoTime();
    private long lastPrint = start;
    private int done;
    private int doneHere;
    private int nonConverged;
    private int thinnedTooLittle;

    /**
     * @param total   replications of this shard
     * @param already of them finished before this run (from the folder), counted in the warnings
     */
    CalibrationProgress(PrintStream out, int total, Iterable<ReplicationResult> already, double intervalSeconds) {
        this.out = out;
        this.total = total;
        int before = 0;
        for (ReplicationResult r : already) {
            before++;
            count(r);
        }
        this.done = before;
        this.todo = total - before;
        this.intervalNanos = (long) (intervalSeconds * 1e9);
    }

    synchronized void finished(ReplicationResult r) {
        done++;
        doneHere++;
        count(r);
        long now = System.nanoTime();
        if (now - lastPrint >= intervalNanos || doneHere == todo) {
            lastPrint = now;
            out.println(line(now));
        }
    }

    private void count(ReplicationResult r) {
        nonConverged += r.nonConverged() ? 1 : 0;
        thinnedTooLittle += r.thinnedTooLittle() ? 1 : 0;
    }

    synchronized String line(long now) {
        StringBuilder sb = new StringBuilder("calibrate: ").append(done).append('/').append(total).append(" replications");
        if (doneHere > 0 && done < total) {
            double left = (now - start) / 1e9 * (todo - doneHere) / doneHere;
            sb.append(" | about ").append(seconds(left)).append(" left");
        }
        sb.append(" | ").append(nonConverged).append(" non-converged fits | ").append(thinnedTooLittle)
                .append(" fits with bulk ESS below the rank draws");
        return sb.toString();
    }

    static String seconds(double s) {
        if (s < 90) {
            return String.format(Locale.ROOT, "%.0f s", s);
        }
        if (s < 5400) {
            return String.format(Locale.ROOT, "%.0f min", s / 60);
        }
        return String.format(Locale.ROOT, "%.1f h", s / 3600);
    }
}
