package org.rungs.sampler;

/**
 * How the posterior is sampled.
 *
 * @param chains  independent chains, each with its own random stream derived from {@code seed}
 * @param warmup  warm-up iterations per chain (proposal scales adapt; draws are discarded)
 * @param draws   kept draws per chain
 * @param seed    the base seed; chain k's stream depends on (seed, k) only, never on threads
 * @param threads worker threads; changes speed, never the draws
 * @param thin    iterations per kept draw after warm-up: every thin-th is kept, so a chain runs
 *                warmup + draws * thin iterations
 */
public record SamplerSettings(int chains, int warmup, int draws, long seed, int threads, int thin) {
    public SamplerSettings {
        if (thin < 1) {
            throw new IllegalArgumentException("thin must be at least 1 (every iteration kept), got " + thin);
        }
        if (chains < 1) {
            throw new IllegalArgumentException("at least one chain is needed, got " + chains);
        }
        if (warmup < 0 || draws < 1) {
            throw new IllegalArgumentException("warm-up must be >= 0 and kept draws >= 1, got " + warmup + " and " + draws);
        }
        if (threads < 1) {
            throw new IllegalArgumentException("at least one thread is needed, got " + threads);
        }
    }

    /** Every iteration after warm-up kept. */
    public SamplerSettings(int chains, int warmup, int draws, long seed, int threads) {
        this(chains, warmup, draws, seed, threads, 1);
    }

    /** Iterations per chain: warm-up, then thin per kept draw. */
    public int iterations() {
        return warmup + draws * thin;
    }

    /** 4 chains of 1000 warm-up and 1000 kept iterations, one thread per core. */
    public static SamplerSettings defaults(long seed) {
        return new SamplerSettings(4, 1000, 1000, seed, Math.max(1, Math.min(4, Runtime.getRuntime().availableProcessors())));
    }
}
