package org.rungs.sampler;

import java.nio.file.Path;

/**
 * Where and how often a fit saves its chains, so that a killed or interrupted fit can be resumed
 * with draws identical, bit for bit, to those of an uninterrupted one. Each chain saves at its
 * first finished iteration after the interval has passed, when stopped and when done.
 */
public final class Checkpoints {
    private static final Checkpoints NONE = new Checkpoints(null, 0, false);

    private final Path dir;
    private final long intervalNanos;
    private final boolean resume;

    private Checkpoints(Path dir, long intervalNanos, boolean resume) {
        this.dir = dir;
        this.intervalNanos = intervalNanos;
        this.resume = resume;
    }

    /** No checkpoints: the draws live in memory only. */
    public static Checkpoints none() {
        return NONE;
    }

    /** A new fit saving into {@code dir} every {@code seconds}; earlier chain files there are replaced. */
    public static Checkpoints start(Path dir, double seconds) {
        return new Checkpoints(dir, nanos(seconds), false);
    }

    /**
     * Continues the fit saved in {@code dir}, then keeps saving every {@code seconds}; a chain
     * with no saved state starts from the beginning.
     */
    public static Checkpoints resume(Path dir, double seconds) {
        return new Checkpoints(dir, nanos(seconds), true);
    }

    private static long nanos(double seconds) {
        if (!(seconds >= 0)) {
            throw new IllegalArgumentException("the checkpoint interval must be >= 0 seconds, got " + seconds);
        }
        return (long) (seconds * 1e9);
    }

    /** The chain's checkpoint, or null when there are none. */
    ChainCheckpoint open(int chain, SamplerSettings settings, int parameters) {
        return dir == null ? null : new ChainCheckpoint(dir, chain, settings, parameters, intervalNanos, resume);
    }
}
