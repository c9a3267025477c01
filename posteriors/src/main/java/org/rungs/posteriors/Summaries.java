package org.rungs.posteriors;

import java.util.List;
import java.util.stream.IntStream;

/** Posterior summaries with the convergence diagnostics of {@link Convergence}, one per parameter. */
public final class Summaries {
    private Summaries() {
    }

    /** Summary of one parameter's draws, {@code draws[chain][iteration]}. */
    public static ParameterSummary of(String name, double[][] draws) {
        return Convergence.diagnosticsFor(draws).summarize(name, Convergence.flatten(draws));
    }

    /**
     * Summaries of every parameter, in column order. Parameters are spread in contiguous blocks
     * over the common fork-join pool, each block with its own work buffers; the result does not
     * depend on the scheduling.
     */
    public static List<ParameterSummary> of(Draws draws) {
        if (draws.iterations() == 0) {
            throw new IllegalArgumentException("no draws to summarise: every chain has 0 iterations");
        }
        int parameters = draws.parameterCount();
        ParameterSummary[] summaries = new ParameterSummary[parameters];
        int blocks = Math.min(parameters, 4 * Runtime.getRuntime().availableProcessors());
        IntStream.range(0, blocks).parallel().forEach(block -> {
            ChainDiagnostics diagnostics = new ChainDiagnostics(draws.chains(), draws.iterations());
            int from = (int) ((long) block * parameters / blocks);
            int to = (int) ((long) (block + 1) * parameters / blocks);
            for (int p = from; p < to; p++) {
                summaries[p] = diagnostics.summarize(draws.names().get(p), draws.column(p));
            }
        });
        return List.of(summaries);
    }
}
