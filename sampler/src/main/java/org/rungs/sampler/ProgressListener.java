package org.rungs.sampler;

/** Receives the progress of each chain; called from the chains' threads. */
public interface ProgressListener {
    /**
     * @param chain     0-based chain
     * @param done      iterations finished, warm-up included
     * @param total     warm-up plus sampling iterations (thin per kept draw)
     * @param warmingUp true while in warm-up
     */
    void iterationDone(int chain, int done, int total, boolean warmingUp);

    /**
     * As {@link #iterationDone(int, int, int, boolean)}, with the time the chain has run in this
     * fit: the sum of the stretches a thread ran it, not the time it waited for a thread
     * ({@link Fitter} calls this one).
     *
     * @param runningNanos nanoseconds the chain has run since this fit began (or resumed it)
     */
    default void iterationDone(int chain, int done, int total, boolean warmingUp, long runningNanos) {
        iterationDone(chain, done, total, warmingUp);
    }

    /**
     * Chain {@code chain} resumes from a checkpoint with {@code done} iterations made by an
     * earlier run (no time of this fit went into them); called before the threads start.
     */
    default void resumed(int chain, int done, int total, boolean warmingUp) {
        iterationDone(chain, done, total, warmingUp);
    }

    /** The fit runs its chains on {@code threads} threads (at most one per chain); called before the threads start. */
    default void threads(int threads) {
    }

    /**
     * From iteration {@code iteration} (0-based) on, the chains' iterations cost more than before
     * (the joint step starts half-way through warm-up); called before the threads start.
     */
    default void dearerFrom(int iteration) {
    }

    /** A listener that ignores everything. */
    ProgressListener NONE = (chain, done, total, warmingUp) -> { };
}
