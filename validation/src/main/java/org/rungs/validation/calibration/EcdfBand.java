package org.rungs.validation.calibration;

import java.util.Arrays;
import org.apache.commons.math3.distribution.BinomialDistribution;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.simple.RandomSource;

/**
 * Simultaneous band for the empirical distribution function of N ranks in 0..L under discrete
 * uniformity, by the simulation method of Sailynoja, Burkner & Vehtari (2022), "Graphical test
 * for discrete uniformity and its applications in goodness-of-fit evaluation and multiple sample
 * comparison", Statistics and Computing 32, section 2.2.
 *
 * <p>The ECDF is evaluated at z_k = k/(L+1), k = 1..L, as the count x_k of ranks below k; under
 * uniformity x_k ~ Binomial(N, z_k). A pointwise band of level 1-gamma keeps x_k where its
 * two-sided binomial tail 2 min(P(X <= x_k), P(X >= x_k)) is at least gamma. Gamma is the
 * alpha-quantile, over simulated uniform samples, of the smallest tail of a sample over k: then a
 * uniform sample leaves the band somewhere with probability alpha (up to Monte Carlo error), the
 * simultaneous level 1-alpha. The simulation uses a fixed seed, so a band is a function of
 * (N, L, alpha) alone.
 */
public final class EcdfBand {
    /** Seed of the uniform samples: bands, and with them verdicts, never change between runs. */
    private static final long SEED = 20220601L;

    private final int samples;
    private final int rankDraws;
    private final double alpha;
    private final double gamma;
    private final int[] lower;
    private final int[] upper;
    private final double[][] atMost;

    private EcdfBand(int samples, int rankDraws, double alpha) {
        this.samples = samples;
        this.rankDraws = rankDraws;
        this.alpha = alpha;
        atMost = new double[rankDraws + 1][];
        for (int k = 1; k <= rankDraws; k++) {
            BinomialDistribution b = new BinomialDistribution(null, samples, k / (rankDraws + 1.0));
            double[] cdf = new double[samples + 1];
            for (int x = 0; x <= samples; x++) {
                cdf[x] = b.cumulativeProbability(x);
            }
            atMost[k] = cdf;
        }
        gamma = simulateGamma();
        lower = new int[rankDraws + 1];
        upper = new int[rankDraws + 1];
        for (int k = 1; k <= rankDraws; k++) {
            int lo = 0;
            while (tail(k, lo) < gamma) {
                lo++;
            }
            int hi = samples;
            while (tail(k, hi) < gamma) {
                hi--;
            }
            lower[k] = lo;
            upper[k] = hi;
        }
    }

    /**
     * @param samples   N, the number of ranks (replications)
     * @param rankDraws L; ranks lie in 0..L
     * @param alpha     1 minus the simultaneous level
     */
    public static EcdfBand of(int samples, int rankDraws, double alpha) {
        if (samples < 1 || rankDraws < 1 || !(alpha > 0 && alpha < 1)) {
            throw new IllegalArgumentException("an ECDF band needs N >= 1, L >= 1 and 0 < alpha < 1, got " + samples
                    + ", " + rankDraws + ", " + alpha);
        }
        return new EcdfBand(samples, rankDraws, alpha);
    }

    /** Uniform samples simulated: enough that about 200 fall below the alpha-quantile, and at least 10,000. */
    static int simulations(double alpha) {
        return (int) Math.min(20_000_000, Math.max(10_000, Math.ceil(200 / alpha)));
    }

    private double simulateGamma() {
        int m = simulations(alpha);
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(new long[] {SEED, samples * 31L + rankDraws});
        double[] smallest = new double[m];
        int[] counts = new int[rankDraws + 1];
        for (int s = 0; s < m; s++) {
            Arrays.fill(counts, 0);
            for (int i = 0; i < samples; i++) {
                counts[rng.nextInt(rankDraws + 1)]++;
            }
            smallest[s] = smallestTail(counts);
        }
        Arrays.sort(smallest);
        return smallest[(int) Math.floor(alpha * m)];
    }

    /** The smallest two-sided pointwise tail over k of a histogram of ranks. */
    private double smallestTail(int[] counts) {
        double min = 1;
        int below = 0;
        for (int k = 1; k <= rankDraws; k++) {
            below += counts[k - 1];
            min = Math.min(min, tail(k, below));
        }
        return min;
    }

    /** 2 min(P(X <= x), P(X >= x)) for X ~ Binomial(N, z_k), at most 1. */
    private double tail(int k, int x) {
        double[] cdf = atMost[k];
        double left = cdf[x];
        double right = x == 0 ? 1 : 1 - cdf[x - 1];
        return Math.min(1, 2 * Math.min(left, right));
    }

    /** The pointwise level gamma that makes the band simultaneous at 1-alpha. */
    public double gamma() {
        return gamma;
    }

    public double alpha() {
        return alpha;
    }

    public int samples() {
        return samples;
    }

    public int rankDraws() {
        return rankDraws;
    }

    /** Smallest count of ranks below k inside the band, k = 1..L. */
    public int lower(int k) {
        return lower[k];
    }

    /** Largest count of ranks below k inside the band, k = 1..L. */
    public int upper(int k) {
        return upper[k];
    }

    /** Counts of ranks below k, k = 0..L+1, from a histogram of ranks 0..L. */
    public static int[] countsBelow(int[] histogram) {
        int[] below = new int[histogram.length + 1];
        for (int k = 1; k <= histogram.length; k++) {
            below[k] = below[k - 1] + histogram[k - 1];
        }
        return below;
    }

    /** Whether the ECDF of the ranks leaves the band at some z_k. */
    public boolean exceeded(int[] histogram) {
        int[] below = countsBelow(histogram);
        for (int k = 1; k <= rankDraws; k++) {
            if (below[k] < lower[k] || below[k] > upper[k]) {
                return true;
            }
        }
        return false;
    }

    /** max_k |ECDF(z_k) - z_k|, the largest distance from the uniform distribution function. */
    public static double maxDeviation(int[] histogram) {
        int[] below = countsBelow(histogram);
        int n = below[histogram.length];
        int l = histogram.length - 1;
        double max = 0;
        for (int k = 1; k <= l; k++) {
            max = Math.max(max, Math.abs((double) below[k] / n - k / (l + 1.0)));
        }
        return max;
    }
}
