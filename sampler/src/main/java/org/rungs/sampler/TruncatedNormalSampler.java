package org.rungs.sampler;

import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.rungs.priors.StandardNormal;

/**
 * Exact draws from the standard normal truncated to {@code [lower, upper]}, either bound possibly
 * infinite, with the three regions of Z. I. Botev (2017), "The normal law under linear
 * restrictions: simulation and estimation via minimax tilting", J. R. Statist. Soc. B 79,
 * 125-148:
 * <ul>
 *   <li>first, any interval over which the density changes by at most a factor 2 (most answer
 *   categories, and narrow intervals far out): uniform proposals accepted with probability
 *   phi(z) / max phi on the interval (C. P. Robert (1995), "Simulation of truncated normal
 *   variables", Statistics and Computing 5, 121-125, section 2.2), acceptance at least 0.5, no
 *   normal-function call;</li>
 *   <li>an interval beyond {@code TAIL} (or, mirrored, below {@code -TAIL}): z^2/2 - lower^2/2
 *   is drawn exactly from an exponential truncated at (upper^2 - lower^2)/2, which gives the
 *   density z exp(-z^2/2) on the interval, and z is accepted with probability lower / z
 *   (G. Marsaglia (1964), "Generating a variable from the tail of the normal distribution",
 *   Technometrics 6, 101-102, here with an upper bound). Acceptance is at least 0.52 and tends
 *   to 1 far out or for narrow intervals; nothing is squared or exponentiated at full size, so
 *   it stays exact 40 or 1e6 sd out;</li>
 *   <li>an interval wider than {@code WIDE} that reaches within {@code TAIL} of 0: standard
 *   normal draws (ziggurat) until one falls inside; it holds at least 0.25 of the mass;</li>
 *   <li>otherwise, with both bounds within TAIL + WIDE of 0: inversion of Phi, from the upper
 *   tail when the interval is above 0 so that no probability near 1 is formed.</li>
 * </ul>
 * A draw from Normal(mean, 1) truncated to [a, b] is {@code mean + sample(a - mean, b - mean)}.
 * Allocation-free; not thread-safe, as the random source is not.
 */
public final class TruncatedNormalSampler {
    /** Lower bound from which the tail method is used (its acceptance there is 0.52). */
    private static final double TAIL = 0.66;
    /** Width beyond which plain rejection is used (its acceptance is then at least 0.25). */
    private static final double WIDE = 2;
    /** Largest far^2 - near^2 for the uniform method: the density changes by at most exp(0.5 * this) = 2. */
    private static final double UNIFORM_SPREAD = 2 * Math.log(2);
    /** 2^-50: the squeeze's margin, eight times the largest rounding error of 1 + x and of exp near 1. */
    private static final double SQUEEZE_MARGIN = 0x1p-50;
    /** Below -this, log(1 + v) is within 1e-12 of log1p(v) relative (1 + v is rounded by at most 2^-53). */
    private static final double LOG1P_BELOW = 1e-4;

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
        if (lower >= TAIL) {
            return tail(lower, upper);
        }
        if (upper <= -TAIL) {
            return -tail(-upper, -lower);
        }
        if (upper - lower > WIDE) {
            while (true) {
                double z = normal.sample();
                if (z >= lower && z <= upper) {
                    return z;
                }
            }
        }
        return inverse(lower, upper);
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

    /** TAIL <= lower < upper; upper may be infinite. */
    private double tail(double lower, double upper) {
        // 1 - exp(-(upper^2 - lower^2)/2) is the mass of the truncated exponential; expm1 keeps it for narrow intervals.
        boolean unbounded = upper == Double.POSITIVE_INFINITY;
        double exponent = -0.5 * (upper - lower) * (upper + lower);
        // exp(x) - 1 loses nothing below x = -0.5 (the result is at least 0.39 in size), and exp is cheaper
        double truncation = unbounded ? -1 : exponent < -0.5 ? Math.exp(exponent) - 1 : Math.expm1(exponent);
        double inverseLower = 1 / lower;
        while (true) {
            // an exponential by ziggurat (C. D. McFarland (2016), J. Stat. Comput. Simul. 86, 1281-1294, as
            // in Commons RNG) where nothing truncates it, else by inversion
            double excess;
            if (unbounded) {
                excess = exponential.sample();
            } else {
                // log1p only where 1 + v would lose digits: Java's log1p costs several logs
                double v = rng.nextDouble() * truncation;
                excess = v > -LOG1P_BELOW ? -Math.log1p(v) : -Math.log(1 + v);
            }
            // z = sqrt(lower^2 + 2 excess), written as lower + its small increment so that neither
            // lower^2 is formed nor the increment lost.
            double ratio = 2 * excess * inverseLower;
            double z = lower + ratio / (1 + Math.sqrt(1 + ratio * inverseLower));
            if (rng.nextDouble() * z <= lower) {
                return Math.min(z, upper);
            }
        }
    }

    /** |lower|, |upper| < TAIL + WIDE. */
    private double inverse(double lower, double upper) {
        double u = rng.nextDouble();
        double z;
        if (lower >= 0) {
            double tailLower = StandardNormal.upperTail(lower);
            double tailUpper = StandardNormal.upperTail(upper);
            z = -StandardNormal.quantile(tailUpper + u * (tailLower - tailUpper));
        } else {
            double cdfLower = StandardNormal.cdf(lower);
            double cdfUpper = StandardNormal.cdf(upper);
            z = StandardNormal.quantile(cdfLower + u * (cdfUpper - cdfLower));
        }
        // Rounding in Phi and its inverse can step an ulp outside a narrow interval.
        return Math.max(lower, Math.min(z, upper));
    }
}
