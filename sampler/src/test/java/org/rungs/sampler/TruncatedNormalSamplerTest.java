package org.rungs.sampler;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.stream.Stream;
import org.apache.commons.math3.distribution.AbstractRealDistribution;
import org.apache.commons.math3.stat.inference.KolmogorovSmirnovTest;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.simple.RandomSource;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;
import org.rungs.priors.StandardNormal;

/**
 * Draws against the closed-form moments and distribution function of the truncated standard
 * normal. Each case has its own fixed seed, so the outcome is deterministic; the tolerances are
 * what a correct sampler meets with high probability at an arbitrary seed.
 */
class TruncatedNormalSamplerTest {

    private static final int DRAWS = 100_000;
    /** Moment tolerance in Monte Carlo standard errors: a correct sampler fails one check with probability 6e-7. */
    private static final double STANDARD_ERRORS = 5;
    /** Kolmogorov-Smirnov significance level (common practice, no source). */
    private static final double ALPHA = 1e-3;
    private static final double INF = Double.POSITIVE_INFINITY;

    static Stream<Arguments> intervals() {
        return Stream.of(
                Arguments.of(Double.NEGATIVE_INFINITY, INF),
                Arguments.of(Double.NEGATIVE_INFINITY, 0.5),
                Arguments.of(-1.0, 1.0),
                // the uniform-proposal region (density changes by at most a factor 2)
                Arguments.of(-0.5, 0.6),
                Arguments.of(0.1, 0.9),
                Arguments.of(-1.1, -0.3),
                Arguments.of(0.3, 1.5),
                Arguments.of(-1.2, 0.4),
                Arguments.of(0.2, 0.2001),
                // exponential proposals from a bound at or near 0, the rejection above the far bound
                Arguments.of(0.0, INF),
                Arguments.of(0.5, 2.5),
                Arguments.of(-3.0, -1.0),
                // 0 inside, density changing by more than 2: normal draws until inside
                Arguments.of(-0.1, 1.3),
                Arguments.of(-30.0, 30.0),
                Arguments.of(0.7, INF),
                Arguments.of(-1.9, -0.7),
                Arguments.of(3.0, 8.0),
                Arguments.of(10.0, INF),
                Arguments.of(10.0, 10.5),
                Arguments.of(40.0, INF),
                Arguments.of(Double.NEGATIVE_INFINITY, -40.0),
                Arguments.of(40.0, 40.001));
    }

    @ParameterizedTest(name = "[{0}, {1}]")
    @MethodSource("intervals")
    void drawsHaveTheTruncatedNormalLaw(double lower, double upper) {
        TruncatedNormal law = new TruncatedNormal(lower, upper);
        double[] draws = draw(lower, upper, seed(lower, upper));

        for (double z : draws) {
            assertTrue(z >= lower && z <= upper, "draw " + z + " outside [" + lower + ", " + upper + "]");
        }

        // Two-pass moments: the far-tail draws share their leading digits.
        double mean = 0;
        for (double z : draws) {
            mean += z;
        }
        mean /= DRAWS;
        double second = 0;
        double fourth = 0;
        for (double z : draws) {
            double d = (z - mean) * (z - mean);
            second += d;
            fourth += d * d;
        }
        double variance = second / (DRAWS - 1);
        fourth /= DRAWS;

        // Standard error of the mean sqrt(var / n); of the sample variance sqrt((m4 - var^2) / n),
        // with the fourth central moment m4 estimated from the draws.
        double meanError = Math.sqrt(law.getNumericalVariance() / DRAWS);
        assertEquals(law.getNumericalMean(), mean, STANDARD_ERRORS * meanError, "mean");
        double varianceError = Math.sqrt((fourth - variance * variance) / DRAWS);
        assertEquals(law.getNumericalVariance(), variance, STANDARD_ERRORS * varianceError, "variance");

        double pValue = new KolmogorovSmirnovTest().kolmogorovSmirnovTest(law, draws);
        assertTrue(pValue > ALPHA, "Kolmogorov-Smirnov p-value " + pValue);
    }

    /**
     * Given Z > a, a (Z - a) tends to Exp(1): P(a (Z - a) > t | Z > a) = Q(a + t/a) / Q(a)
     * = exp(-t) (1 + O(1/a^2)) by the Mills ratio Q(x) = phi(x) / x (1 + O(1/x^2)). At a = 1e6
     * the law is Exp(1) to 1e-12, far below Monte Carlo error.
     */
    @Test
    void staysExactAMillionStandardDeviationsOut() {
        double lower = 1e6;
        int n = 10_000;
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(20240611L);
        TruncatedNormalSampler sampler = TruncatedNormalSampler.of(rng);
        double sum = 0;
        for (int i = 0; i < n; i++) {
            double z = sampler.sample(lower, INF);
            assertTrue(z >= lower && z < INF, "draw " + z);
            sum += lower * (z - lower);
        }
        // Exp(1) has mean 1 and sd 1; z - lower is resolved to ulp(1e6) = 1.2e-10, 1e-4 of its scale.
        assertEquals(1, sum / n, STANDARD_ERRORS / Math.sqrt(n));
    }

    @Test
    void anEmptyOrReversedIntervalIsRefused() {
        TruncatedNormalSampler sampler = TruncatedNormalSampler.of(RandomSource.XO_RO_SHI_RO_128_PP.create(1L));
        assertThrows(IllegalArgumentException.class, () -> sampler.sample(1, 1));
        assertThrows(IllegalArgumentException.class, () -> sampler.sample(2, 1));
        assertThrows(IllegalArgumentException.class, () -> sampler.sample(Double.NaN, 1));
    }

    private static double[] draw(double lower, double upper, long seed) {
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(seed);
        TruncatedNormalSampler sampler = TruncatedNormalSampler.of(rng);
        double[] draws = new double[DRAWS];
        for (int i = 0; i < DRAWS; i++) {
            draws[i] = sampler.sample(lower, upper);
        }
        return draws;
    }

    private static long seed(double lower, double upper) {
        return 20240611L + 31 * Double.hashCode(lower) + Double.hashCode(upper);
    }

    /**
     * The standard normal truncated to [a, b] (Johnson, Kotz & Balakrishnan, Continuous
     * Univariate Distributions, vol. 1, 2nd ed., section 10.1): with Z = Phi(b) - Phi(a),
     * mean = (phi(a) - phi(b)) / Z and variance = 1 + (a phi(a) - b phi(b)) / Z - mean^2. Each
     * ratio phi(x) / Z is exp(log phi(x) - log Z), so it stays finite 40 sd out where phi and Z
     * both underflow; log Z and the distribution function come from
     * StandardNormal.logIntervalProbability, itself tested against 256-bit values.
     */
    private static final class TruncatedNormal extends AbstractRealDistribution {
        private static final long serialVersionUID = 1L;
        private static final double LOG_SQRT_2PI = 0.5 * Math.log(2 * Math.PI);

        private final double lower;
        private final double upper;
        private final double logMass;
        private final double mean;
        private final double variance;

        TruncatedNormal(double lower, double upper) {
            super(null);
            this.lower = lower;
            this.upper = upper;
            this.logMass = StandardNormal.logIntervalProbability(lower, upper);
            double densityRatioLower = densityOverMass(lower);
            double densityRatioUpper = densityOverMass(upper);
            this.mean = densityRatioLower - densityRatioUpper;
            this.variance = 1 + times(lower, densityRatioLower) - times(upper, densityRatioUpper) - mean * mean;
        }

        /** phi(x) / Z, 0 at an infinite bound. */
        private double densityOverMass(double x) {
            return Double.isInfinite(x) ? 0 : Math.exp(-0.5 * x * x - LOG_SQRT_2PI - logMass);
        }

        /** x phi(x) / Z, 0 at an infinite bound, where phi vanishes faster than x grows. */
        private static double times(double x, double ratio) {
            return Double.isInfinite(x) ? 0 : x * ratio;
        }

        @Override
        public double density(double x) {
            return x < lower || x > upper ? 0 : Math.exp(-0.5 * x * x - LOG_SQRT_2PI - logMass);
        }

        @Override
        public double cumulativeProbability(double x) {
            if (x <= lower) {
                return 0;
            }
            if (x >= upper) {
                return 1;
            }
            return Math.exp(StandardNormal.logIntervalProbability(lower, x) - logMass);
        }

        @Override
        public double getNumericalMean() {
            return mean;
        }

        @Override
        public double getNumericalVariance() {
            return variance;
        }

        @Override
        public double getSupportLowerBound() {
            return lower;
        }

        @Override
        public double getSupportUpperBound() {
            return upper;
        }

        @Override
        @SuppressWarnings("deprecation") // abstract in Commons Math 3.6.1, deprecated for 4.0
        public boolean isSupportLowerBoundInclusive() {
            return true;
        }

        @Override
        @SuppressWarnings("deprecation") // abstract in Commons Math 3.6.1, deprecated for 4.0
        public boolean isSupportUpperBoundInclusive() {
            return true;
        }

        @Override
        public boolean isSupportConnected() {
            return true;
        }
    }
}
