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

    /** A listener that ignores everything. */
    ProgressListener NONE = (chain, done, total, warmingUp) -> { };
}
