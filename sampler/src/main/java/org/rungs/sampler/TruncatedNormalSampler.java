package org.rungs.sampler;

import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;

/**
 * Exact draws from the standard normal truncated to {@code [lower, upper]}, either bound possibly
 * infinite, by rejection from one of three proposals, chosen by the interval:
 * <ul>
 *   <li>an interval over which the density changes by at most a factor 2 (most answer
 *   categories, and narrow intervals far out): uniform proposals accepted with probability
 *   phi(z) / max phi on the interval (C. P. Robert (1995), "Simulation of truncated normal
 *   variables", Statistics and Computing 5, 121-125, section 2.2), acceptance at least 0.5;</li>
 *   <li>otherwise an interval on one side of 0: exponential proposals from its bound nearest 0
 *   with the rate that maximises the acceptance (Robert 1995, section 2.2), 0.76 at a bound of
 *   0, 0.85 at 0.66 and tending to 1 far out (numerical integration), the proposals beyond its
 *   other bound rejected as well (at most half of them, since the density changes by more than a
 *   factor 2 over the interval); nothing is squared at full size, so it stays exact 40 or 1e6
 *   sd out;</li>
 *   <li>otherwise (0 inside): standard normal draws (ziggurat) until one falls inside, at least
 *   0.38 of them.</li>
 * </ul>
 * No normal-function call; the exponentials of the acceptance tests are mostly avoided by a
 * squeeze. Earlier versions used Marsaglia's tail method and inversion of Phi, measured slower.
 * A draw from Normal(mean, 1) truncated to [a, b] is {@code mean + sample(a - mean, b - mean)}.
 * Allocation-free; not thread-safe, as the random source is not.
 */
public final class TruncatedNormalSampler {
    /** Largest far^2 - near^2 for the uniform method: the density changes by at most exp(0.5 * this) = 2. */
    private static final double UNIFORM_SPREAD = 2 * Math.log(2);
    /** 2^-50: the squeeze's margin, eight times the largest rounding error of 1 + x and of exp near 1. */
    private static final double SQUEEZE_MARGIN = 0x1p-50;

    private final UniformRandomProvider rng;
    private final ZigguratSampler.NormalizedGaussian normal;
    private final ZigguratSampler.Exponential exponential;

    private TruncatedNormalSampler(UniformRandomProvider rng) {
        this.rng = rng;
        this.normal = ZigguratSampler.NormalizedGaussian.of(rng);
        this.exponential = ZigguratSampler.Exponential.of(rng);
    }

    public static TruncatedNormalSampler of(UniformRandomProvider rng) {
        return new TruncatedNormalSampler(rng);
    }

    /**
     * One draw of Z ~ Normal(0, 1) given lower <= Z <= upper.
     *
     * @throws IllegalArgumentException unless lower < upper
     */
    public double sample(double lower, double upper) {
        if (!(lower < upper)) {
            throw new IllegalArgumentException("a truncated normal needs lower < upper, got [" + lower + ", " + upper + "]");
        }
        double near = lower > 0 ? lower : upper < 0 ? -upper : 0;
        double far = Math.max(-lower, upper);
        // (far - near)(far + near) keeps its digits far out, where far^2 - near^2 would not
        if ((far - near) * (far + near) <= UNIFORM_SPREAD) {
            return uniform(lower, upper, near);
        }
        if (lower >= 0) {
            return tail(lower, upper);
        }
        if (upper <= 0) {
            return -tail(-upper, -lower);
        }
        // 0 inside and the density changing by more than 2: at least Phi(1.18) - 1/2 = 0.38 of the mass
        while (true) {
            double z = normal.sample();
            if (z >= lower && z <= upper) {
                return z;
            }
        }
    }

    /**
     * Robert (1995), section 2.2; {@code near} is the smallest |z| on the interval. The ratio
     * exp(x), x <= 0, is bounded below by 1 + x (a squeeze, Marsaglia 1977, "The squeeze method for
     * generating gamma variates", Comput. Math. Appl. 3, 321-325): a uniform under 1 + x less a
     * margin far above exp's rounding error accepts without the exponential, the same decision.
     */
    private double uniform(double lower, double upper, double near) {
        double width = upper - lower;
        while (true) {
            double z = lower + width * rng.nextDouble();
            double x = 0.5 * (near - z) * (near + z);
            double u = rng.nextDouble();
            if (u <= 1 + x - SQUEEZE_MARGIN || u <= Math.exp(x)) {
                return z;
            }
        }
    }

    /**
     * TAIL <= lower < upper; upper may be infinite. Robert (1995), section 2.2 (proposition 2.3):
     * proposals lower + E / lambda with E ~ Exp(1) (ziggurat) and lambda = (lower +
     * sqrt(lower^2 + 4)) / 2, the rate that maximises the acceptance, accepted with probability
     * exp(-(z - lambda)^2 / 2); a proposal above upper is rejected as well. lambda - lower =
     * 1 / lambda, so z - lambda = (E - 1) / lambda is formed without cancellation however far
     * out; the exponential is bounded below by the squeeze of {@link #uniform}.
     */
    private double tail(double lower, double upper) {
        // beyond 1e8, lower^2 + 4 rounds to lower^2 and lambda = lower + 1 / lambda to lower + 1 / lower
        double lambda = lower > 1e8 ? lower + 1 / lower : 0.5 * (lower + Math.sqrt(lower * lower + 4));
        double inverse = 1 / lambda;
        while (true) {
            double e = exponential.sample();
            double z = lower + e * inverse;
            if (z > upper) {
                continue;
            }
            double d = (e - 1) * inverse;
            double x = -0.5 * d * d;
            double u = rng.nextDouble();
            if (u <= 1 + x - SQUEEZE_MARGIN || u <= Math.exp(x)) {
                return z;
            }
        }
    }
}
