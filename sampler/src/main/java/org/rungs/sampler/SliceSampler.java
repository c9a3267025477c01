package org.rungs.sampler;

import org.apache.commons.rng.UniformRandomProvider;

/**
 * Univariate slice sampling with stepping out and shrinkage (Neal 2003, Annals of Statistics
 * 31, section 4, figures 3 and 5). Exact for any log density known up to a constant.
 */
final class SliceSampler {
    /** A log density up to an additive constant; minus infinity outside the support. */
    interface LogDensity {
        double at(double x);
    }

    private static final int MAX_STEPS = 50;
    private final UniformRandomProvider rng;
    private final double width;

    private SliceSampler(UniformRandomProvider rng, double width) {
        this.rng = rng;
        this.width = width;
    }

    static SliceSampler of(UniformRandomProvider rng, double width) {
        return new SliceSampler(rng, width);
    }

    /**
     * @throws IllegalStateException when the log density at {@code x0} is not finite: the slice
     *         would hold no point, and the shrinkage would never end
     */
    double sample(double x0, LogDensity density) {
        double start = density.at(x0);
        if (!Double.isFinite(start)) {
            throw new IllegalStateException("a slice sampling step started at " + x0 + ", where the log density is "
                    + start + ": the chain has left the posterior's support");
        }
        double level = start + Math.log(rng.nextDouble());
        double left = x0 - width * rng.nextDouble();
        double right = left + width;
        int j = (int) (MAX_STEPS * rng.nextDouble());
        int k = MAX_STEPS - 1 - j;
        while (j-- > 0 && density.at(left) > level) {
            left -= width;
        }
        while (k-- > 0 && density.at(right) > level) {
            right += width;
        }
        while (true) {
            double x = left + (right - left) * rng.nextDouble();
            if (density.at(x) > level) {
                return x;
            }
            if (x < x0) {
                left = x;
            } else {
                right = x;
            }
        }
    }
}
