package org.rungs.validation.calibration;

import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.simple.RandomSource;

/**
 * The random stream of one replication, a function of (base seed, replication index) alone, so a
 * replication gives the same ranks whichever shard, thread or order runs it. Seeded through the
 * SplitMix64 finaliser (Steele, Lea & Flood 2014, "Fast splittable pseudorandom number
 * generators", OOPSLA).
 */
final class ReplicationSeeds {
    private ReplicationSeeds() {
    }

    static UniformRandomProvider stream(long seed, int replication) {
        long a = mix(seed ^ mix(0x5851F42D4C957F2DL + replication));
        long b = mix(a + 0x9E3779B97F4A7C15L);
        return RandomSource.XO_RO_SHI_RO_128_PP.create(new long[] {a, b});
    }

    private static long mix(long z) {
        z = (z ^ (z >>> 30)) * 0xBF58476D1CE4E5B9L;
        z = (z ^ (z >>> 27)) * 0x94D049BB133111EBL;
        return z ^ (z >>> 31);
    }
}
