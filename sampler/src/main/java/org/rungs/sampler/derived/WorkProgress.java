package org.rungs.sampler.derived;

/** Receives how far a computation over draws or respondents has come; called from its worker threads. */
@FunctionalInterface
public interface WorkProgress {
    /** {@code done} of {@code total} units (draws, respondents) are finished. */
    void done(int done, int total);

    /** A listener that ignores everything. */
    WorkProgress NONE = (done, total) -> { };
}
