package org.rungs.sampler;

/**
 * How the posterior is sampled.
 *
 * @param chains  independent chains, each with its own random stream derived from {@code seed}
 * @param warmup  warm-up iterations per chain (proposal scales adapt; draws are discarded)
 * @param draws   kept iterations per chain
 * @param seed    the base seed; chain k's stream depends on (seed, k) only, never on threads
 * @param threads worker threads; changes speed, never the draws
 */
public record SamplerSettings(int chains, int warmup, int draws, long seed, int threads) {
    public SamplerSettings {
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

    /** 4 chains of 1000 warm-up and 1000 kept iterations, one thread per core. */
    public static SamplerSettings defaults(long seed) {
        return new SamplerSettings(4, 1000, 1000, seed, Math.max(1, Math.min(4, Runtime.getRuntime().availableProcessors())));
    }
}
