package org.rungs.sampler;

import org.apache.commons.rng.RestorableUniformRandomProvider;
import org.apache.commons.rng.simple.RandomSource;

/**
 * Independent random streams for the chains of one fit. Chain k's generator is seeded from
 * (base seed, k) through the SplitMix64 finaliser (Steele, Lea & Flood 2014, "Fast splittable
 * pseudorandom number generators", OOPSLA), so streams never depend on thread scheduling.
 */
public final class ChainSeeds {
    private ChainSeeds() {
    }

    /** The stream of chain {@code chain} (0-based) under {@code seed}. */
    public static RestorableUniformRandomProvider stream(long seed, int chain) {
        long a = mix(seed + 0x9E3779B97F4A7C15L * (2L * chain + 1));
        long b = mix(a ^ 0xD1B54A32D192ED03L);
        return RandomSource.XO_RO_SHI_RO_128_PP.create(new long[] {a, b});
    }

    /** SplitMix64 output function. */
    static long mix(long z) {
        z = (z ^ (z >>> 30)) * 0xBF58476D1CE4E5B9L;
        z = (z ^ (z >>> 27)) * 0x94D049BB133111EBL;
        return z ^ (z >>> 31);
    }
}
