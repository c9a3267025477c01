package org.rungs.sampler;

import java.io.IOException;
import java.util.concurrent.atomic.AtomicBoolean;
import org.rungs.models.ParameterLayout;
import org.rungs.posteriors.Draws;

/**
 * One chain's run of warm-up then sampling, taken in stretches, so that a few threads can take
 * turns on more chains ({@link Fitter}). After warm-up every thin-th iteration is kept. With a
 * checkpoint, the run starts from its saved position, kept draws are appended to it as they are
 * made, and the state is saved when the checkpoint is due and at {@link #end()}. Where the
 * stretches fall never changes a draw: the chain's sweeps and random stream are its own.
 */
final class ChainRun {
    private final Chain chain;
    private final int index;
    private final SamplerSettings settings;
    private final ParameterLayout layout;
    private final Draws draws;
    private final ProgressListener progress;
    private final ChainCheckpoint checkpoint;
    private final double[] row;
    private final int total;
    private int it;
    private int kept;
    /** Nanoseconds this run has advanced the chain (its stretches, not its waits for a thread). */
    private long runningNanos;

    /**
     * Restores the checkpoint's position, when it saved one (the fitter has already reported it,
     * {@link ProgressListener#resumed}).
     */
    ChainRun(Chain chain, int index, SamplerSettings settings, ParameterLayout layout, Draws draws,
             ProgressListener progress, ChainCheckpoint checkpoint) throws IOException {
        this.chain = chain;
        this.index = index;
        this.settings = settings;
        this.layout = layout;
        this.draws = draws;
        this.progress = progress;
        this.checkpoint = checkpoint;
        this.row = new double[layout.size()];
        this.total = settings.iterations();
        if (checkpoint != null) {
            ChainCheckpoint.Position at = checkpoint.restore(chain, draws);
            it = at.iterations();
            kept = at.kept();
        }
    }

    /**
     * Runs iterations until the run is complete, {@code stop} is set, or {@code nanos} have passed
     * (checked after each iteration, so at least one runs when any is left).
     *
     * @return whether iterations are left
     */
    boolean advance(AtomicBoolean stop, long nanos) throws IOException {
        long start = System.nanoTime();
        long before = runningNanos;
        while (it < total && !stop.get()) {
            boolean warmingUp = it < settings.warmup();
            chain.sweepOnce(warmingUp);
            if (!warmingUp && (it + 1 - settings.warmup()) % settings.thin() == 0) {
                chain.writeRow(layout, row);
                draws.putRow(index, kept++, row);
                if (checkpoint != null) {
                    checkpoint.append(row);
                }
            }
            it++;
            // a save's time falls into the next iteration's, as the thread spends it on this chain
            runningNanos = before + System.nanoTime() - start;
            progress.iterationDone(index, it, total, warmingUp, runningNanos);
            if (checkpoint != null && checkpoint.due()) {
                checkpoint.save(chain, it, kept);
            }
            if (System.nanoTime() - start >= nanos) {
                break;
            }
        }
        return it < total;
    }

    /** Saves the checkpoint at the position reached (complete, or stopped). */
    void end() throws IOException {
        if (checkpoint != null) {
            checkpoint.save(chain, it, kept);
        }
    }

    /** Iterations done, warm-up included. */
    int iterations() {
        return it;
    }

    /** Draws kept so far. */
    int kept() {
        return kept;
    }

    Chain chain() {
        return chain;
    }
}
