package org.rungs.validation.calibration;

import java.io.PrintStream;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import java.util.concurrent.atomic.AtomicBoolean;
import org.rungs.validation.ReplicationPool;
import org.rungs.validation.ReplicationProgress;

/**
 * Simulation-based calibration of the engine (Talts, Betancourt, Simpson, Vehtari & Gelman 2018,
 * "Validating Bayesian inference algorithms with simulation-based calibration",
 * arXiv:1804.06788). Replications are independent and seeded from (base seed, index) alone, so
 * they run on any number of threads, in shards on many machines, and resume after an
 * interruption, always giving the same records; the summary depends on the records alone.
 */
public final class Calibration {
    private Calibration() {
    }

    /**
     * Runs the replications of {@code shard} that {@code out} does not hold yet, then summarises
     * every replication in {@code out} (all shards' when they share the folder).
     *
     * @param threads  replications fitted at the same time, each fit on one thread
     * @param progress receives progress lines (stderr), or null for none
     * @param stop     set it to stop: running fits are abandoned and not recorded
     * @return the summary, or null when stopped before this shard finished
     */
    public static CalibrationSummary run(CalibrationConfig config, Path out, Shard shard, int threads,
            PrintStream progress, AtomicBoolean stop) {
        if (threads < 1) {
            throw new IllegalArgumentException("at least one thread is needed, got " + threads);
        }
        CalibrationFolder folder = CalibrationFolder.open(out, config);
        Map<Integer, ReplicationResult> finished = folder.finished();
        List<ReplicationResult> already = new ArrayList<>();
        List<Integer> todo = new ArrayList<>();
        int total = 0;
        for (int r = 0; r < config.replications(); r++) {
            if (shard.contains(r)) {
                total++;
                if (finished.containsKey(r)) {
                    already.add(finished.get(r));
                } else {
                    todo.add(r);
                }
            }
        }
        ReplicationProgress lines = new ReplicationProgress(progress, "calibrate", total, 5, "non-converged fits",
                "fits with bulk ESS below the rank draws");
        for (ReplicationResult r : already) {
            lines.earlier(r.nonConverged(), r.thinnedTooLittle());
        }
        boolean complete = ReplicationPool.run(todo, threads, "rungs-calibration", stop, r -> {
            ReplicationResult result = Replication.run(config, r, stop);
            if (result == null) {
                return false;
            }
            folder.write(result);
            lines.finished(result.nonConverged(), result.thinnedTooLittle());
            return true;
        });
        return complete ? summarise(folder) : null;
    }

    /** Summarises the replications recorded in a folder and writes the summary files into it. */
    public static CalibrationSummary summarise(CalibrationFolder folder) {
        CalibrationSummary summary = CalibrationSummary.of(new ArrayList<>(folder.finished().values()),
                Integer.parseInt(folder.value("rank_draws")), Double.parseDouble(folder.value("alpha")));
        CalibrationReport.write(folder, summary);
        return summary;
    }

    /**
     * Gathers the replication records of shard folders of one calibration into {@code out} and
     * summarises them: the files equal those of a single run over the same replications.
     *
     * @throws IllegalArgumentException when the folders hold different configurations, or one
     *     replication differs between two folders
     */
    public static CalibrationSummary merge(List<Path> inputs, Path out) {
        if (inputs.isEmpty()) {
            throw new IllegalArgumentException("name at least one calibration folder to merge");
        }
        List<CalibrationFolder> folders = new ArrayList<>();
        for (Path in : inputs) {
            folders.add(CalibrationFolder.existing(in));
        }
        String description = folders.get(0).description();
        for (CalibrationFolder f : folders) {
            if (!f.description().equals(description)) {
                throw new IllegalArgumentException(f.dir() + " holds another configuration than " + folders.get(0).dir()
                        + "; compare their " + CalibrationConfig.FILE);
            }
        }
        CalibrationFolder target = CalibrationFolder.open(out, description);
        Map<Integer, ReplicationResult> seen = new TreeMap<>(target.finished());
        for (CalibrationFolder f : folders) {
            for (Map.Entry<Integer, ReplicationResult> e : f.finished().entrySet()) {
                ReplicationResult before = seen.putIfAbsent(e.getKey(), e.getValue());
                if (before == null) {
                    target.copyFrom(f, e.getKey());
                } else if (!before.equals(e.getValue())) {
                    throw new IllegalArgumentException("replication " + e.getKey() + " differs between folders; "
                            + "one of them was not run with this configuration");
                }
            }
        }
        return summarise(target);
    }

    /** The replications of a configuration that a folder lacks. */
    public static List<Integer> missing(CalibrationFolder folder) {
        int replications = Integer.parseInt(folder.value("replications"));
        Map<Integer, ReplicationResult> finished = folder.finished();
        List<Integer> missing = new ArrayList<>();
        for (int r = 0; r < replications; r++) {
            if (!finished.containsKey(r)) {
                missing.add(r);
            }
        }
        return missing;
    }
}
