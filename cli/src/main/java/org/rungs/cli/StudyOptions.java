package org.rungs.cli;

import java.nio.file.Path;
import picocli.CommandLine.Option;

/** The options of a study of many simulated fits ({@code calibrate}, {@code recover}): each fit's chains, how many fits, where they go. */
final class StudyOptions {
    @Option(names = "--chains", paramLabel = "N", defaultValue = "2", description = "Chains per fit. Default: ${DEFAULT-VALUE}.")
    int chains;

    @Option(names = "--warmup", paramLabel = "N", defaultValue = "500", description = "Warm-up iterations per chain. Default: ${DEFAULT-VALUE}.")
    int warmup;

    @Option(names = "--draws", paramLabel = "N", defaultValue = "1000", description = "Kept iterations per chain. Default: ${DEFAULT-VALUE}.")
    int draws;

    @Option(names = "--replications", paramLabel = "N", defaultValue = "100",
            description = "Simulated data sets, each fitted once (calibrate --shard: over all shards). Default: ${DEFAULT-VALUE}.")
    int replications;

    @Option(names = "--seed", paramLabel = "SEED", defaultValue = "1", description = "Base seed; replication r depends on (seed, r) only. Default: ${DEFAULT-VALUE}.")
    long seed;

    @Option(names = "--threads", paramLabel = "N", description = "Replications fitted at once, each fit on one thread. Default: the number of cores.")
    Integer threads;

    @Option(names = "--out", paramLabel = "DIR", description = "Output folder (required); a rerun with the same folder resumes.")
    Path out;

    /** True when --out is given; otherwise says so on stderr for {@code rungs command}. */
    boolean hasOut(String command) {
        if (out == null) {
            System.err.println("rungs " + command + ": --out DIR is required");
        }
        return out != null;
    }
}
