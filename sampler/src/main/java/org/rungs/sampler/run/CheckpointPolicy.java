package org.rungs.sampler.run;

import java.util.List;

/**
 * How a fit from a file keeps the checkpoint in {@code OUT/.checkpoint} that lets it be resumed.
 *
 * @param resume    continue the fit saved in the output folder instead of starting one
 * @param seconds   wall time between saves of each chain (when, never what, depends on the clock)
 * @param arguments the command-line arguments that started the fit, kept so that a resume needs
 *                  no options; ignored when resuming
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
        return new CheckpointPolicy(true, seconds, List.of());
    }
}
