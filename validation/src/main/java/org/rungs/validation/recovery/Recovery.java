package org.rungs.validation.recovery;

import java.io.PrintStream;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.concurrent.atomic.AtomicBoolean;
import org.rungs.validation.ReplicationPool;
import org.rungs.validation.ReplicationProgress;

/**
 * A recovery and coverage study: R surveys drawn from one fixed truth, each fitted, and every
 * posterior summary set beside the value that made the data; bias, RMSE and interval coverage
 * per quantity with their Monte Carlo standard errors (Morris, White & Crowther 2019, Statistics
 * in Medicine 38). Where simulation-based calibration averages over the prior, this holds the
 * truth fixed, so it shows how the engine does on data like the demo's. Replications are seeded
 * from (base seed, index) alone and recorded one file each, so the result does not depend on the
 * thread count and an interrupted study resumes.
 */
public final class Recovery {
    private Recovery() {
    }

    /**
     * Runs the replications {@code out} does not hold yet, then summarises them all and writes
     * {@value RecoveryReport#RECOVERY}, {@value RecoveryReport#REPLICATIONS} and
     * {@value RecoveryReport#SUMMARY} into {@code out}.
     *
     * @param overwrite start afresh in a folder holding another study or other files
     * @param threads   replications fitted at the same time, each fit on one thread; with fewer
     *                  replications left than threads, each fit runs its chains on its share
     *                  (the draws do not depend on it)
     * @param progress  receives progress lines (stderr), or null for none
     * @param stop      set it to stop: running fits are abandoned and not recorded
     * @return the summary, or null when stopped before every replication finished
     * @throws IllegalArgumentException when the folder cannot be used (see {@link RecoveryFolder#open})
     */
    public static RecoverySummary run(RecoveryConfig config, Path out, boolean overwrite, int threads,
            PrintStream progress, AtomicBoolean stop) {
        if (threads < 1) {
            throw new IllegalArgumentException("at least one thread is needed, got " + threads);
        }
        RecoveryFolder folder = RecoveryFolder.open(out, config, overwrite);
        Map<Integer, ReplicationEstimates> finished = folder.finished();
        List<Integer> todo = new ArrayList<>();
        for (int r = 0; r < config.replications(); r++) {
            if (!finished.containsKey(r)) {
                todo.add(r);
            }
        }
        ReplicationProgress lines = new ReplicationProgress(progress, "recover", config.replications(), 5, "non-converged fits");
        for (ReplicationEstimates r : finished.values()) {
            lines.earlier(r.nonConverged());
        }
        int fits = Math.max(1, Math.min(threads, todo.size()));
        int chainThreads = Math.max(1, threads / fits);
        boolean complete = ReplicationPool.run(todo, fits, "rungs-recovery", stop, r -> {
            ReplicationEstimates result = RecoveryReplication.run(config, r, chainThreads, stop);
            if (result == null) {
                return false;
            }
            folder.write(result);
            lines.finished(result.nonConverged());
            return true;
        });
        if (!complete) {
            return null;
        }
        RecoverySummary summary = RecoverySummary.of(new ArrayList<>(folder.finished().values()));
        RecoveryReport.write(folder, config, summary);
        return summary;
    }
}
