package org.rungs.sampler.run;

import java.util.List;

/**
 * How a fit from a file keeps the checkpoint in {@code OUT/.checkpoint} that lets it be resumed.
 *
 * @param resume    continue the fit saved in the output folder instead of starting one
 * @param seconds   wall time between saves of each chain (when, never what, depends on the clock)
 * @param arguments the command-line arguments that started the fit, kept so that a resume needs
 *                  no options; when resuming, empty, or the saved ones with a new --thin, which
 *                  replace them
 */
public record CheckpointPolicy(boolean resume, double seconds, List<String> arguments) {
    /** Seconds between saves unless asked otherwise. */
    public static final double DEFAULT_SECONDS = 5;

    public CheckpointPolicy {
        if (!(seconds >= 0)) {
            throw new IllegalArgumentException("the checkpoint interval must be >= 0 seconds, got " + seconds);
        }
        arguments = List.copyOf(arguments);
    }

    /** A new fit started by {@code arguments}, saving every {@code seconds}. */
    public static CheckpointPolicy start(List<String> arguments, double seconds) {
        return new CheckpointPolicy(false, seconds, arguments);
    }

    /** Continues the fit saved in the output folder, saving every {@code seconds}. */
    public static CheckpointPolicy resume(double seconds) {
        return resume(seconds, List.of());
    }

    /**
     * Continues the fit saved in the output folder with the saved arguments replaced by
     * {@code arguments} (unless empty): the same fit with more thinning.
     */
    public static CheckpointPolicy resume(double seconds, List<String> arguments) {
        return new CheckpointPolicy(true, seconds, arguments);
    }
}
