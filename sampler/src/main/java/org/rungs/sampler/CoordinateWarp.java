package org.rungs.sampler;

import java.io.DataInput;
import java.io.DataOutput;
import java.io.IOException;
import java.util.Arrays;

/**
 * A coordinate-wise change of variables for the joint step: theta_j = c_j + b_j (s + k (sinh s - s)),
 * with k = low_j for s < 0 and high_j for s > 0. Linear near c_j (slope b_j, curvature 0 at s = 0,
 * so the map is twice differentiable), it stretches a long tail of theta_j into a short one of
 * s_j, where a linear metric cannot fit a narrow bulk and a long flat tail at once. Identity
 * (c = 0, b = 1, k = 0) until {@link #fit}. The joint step runs on s with the density
 * p(theta(s)) |d theta / d s|, the same posterior in other coordinates, so it stays exact for any
 * fixed map (the map is fitted during warm-up only). A transport map of one dimension per
 * coordinate, in the spirit of Parno & Marzouk 2018 (Transport map accelerated Markov chain Monte
 * Carlo, SIAM/ASA JUQ 6, section 3, from memory); the sinh shape after the sinh-arcsinh family of
 * Jones & Pewsey 2009 (Biometrika 96, section 2, from memory).
 */
final class CoordinateWarp {
    /** sinh(z) - z at z = 1.645, the standard normal's 95% quantile. */
    private static final double TAIL_STRETCH = Math.sinh(1.6448536269514722) - 1.6448536269514722;
    private static final double Z95 = 1.6448536269514722;
    /** The interquartile range of a standard normal. */
    private static final double IQR = 1.3489795003921634;
    /** Bends below this are taken as 0: a tail within about a fifth of a Gaussian's is left linear. */
    static final double MIN_BEND = 0.5;
    private final int dimension;
    private final double[] centre;
    private final double[] scale;
    private final double[] low;
    private final double[] high;
    private boolean on;

    CoordinateWarp(int dimension) {
        this.dimension = dimension;
        this.centre = new double[dimension];
        this.scale = new double[dimension];
        this.low = new double[dimension];
        this.high = new double[dimension];
        Arrays.fill(scale, 1);
    }

    /** Whether any coordinate is warped. */
    boolean on() {
        return on;
    }

    /**
     * Fits the map from n draws stored row by row in {@code draws}: per coordinate c the median,
     * b the interquartile range over a normal's, and each tail's bend so that its 5% or 95% quantile
     * lands at s = -+1.645, where that asks for a bend of at least {@link #MIN_BEND}.
     */
    void fit(double[] draws, int n) {
        double[] column = new double[n];
        on = false;
        for (int j = 0; j < dimension; j++) {
            for (int t = 0; t < n; t++) {
                column[t] = draws[t * dimension + j];
            }
            Arrays.sort(column);
            double median = quantile(column, 0.5);
            double b = (quantile(column, 0.75) - quantile(column, 0.25)) / IQR;
            double lowBend = b > 0 ? ((median - quantile(column, 0.05)) / b - Z95) / TAIL_STRETCH : 0;
            double highBend = b > 0 ? ((quantile(column, 0.95) - median) / b - Z95) / TAIL_STRETCH : 0;
            lowBend = lowBend >= MIN_BEND ? lowBend : 0;
            highBend = highBend >= MIN_BEND ? highBend : 0;
            if (lowBend > 0 || highBend > 0) {
                centre[j] = median;
                scale[j] = b;
                low[j] = lowBend;
                high[j] = highBend;
                on = true;
            } else {
                centre[j] = 0;
                scale[j] = 1;
                low[j] = 0;
                high[j] = 0;
            }
        }
    }

    /** Back to the identity. */
    void clear() {
        Arrays.fill(centre, 0);
        Arrays.fill(scale, 1);
        Arrays.fill(low, 0);
        Arrays.fill(high, 0);
        on = false;
    }

    /** The sorted sample's quantile p, linear between order statistics. */
    private static double quantile(double[] sorted, double p) {
        double at = p * (sorted.length - 1);
        int i = (int) Math.floor(at);
        int next = Math.min(sorted.length - 1, i + 1);
        return sorted[i] + (at - i) * (sorted[next] - sorted[i]);
    }

    /** d theta_j / d s at s = 0: b_j (1 where unwarped). */
    double slope(int j) {
        return scale[j];
    }

    /** theta(s). */
    void toTheta(double[] s, double[] theta) {
        if (!on) {
            System.arraycopy(s, 0, theta, 0, dimension);
            return;
        }
        for (int j = 0; j < dimension; j++) {
            double x = s[j];
            double k = x < 0 ? low[j] : high[j];
            theta[j] = k == 0 && scale[j] == 1 && centre[j] == 0 ? x : centre[j] + scale[j] * (x + k * (Math.sinh(x) - x));
        }
    }

    /** s(theta), by Newton's method safeguarded by bisection on the monotone map. */
    void toS(double[] theta, double[] s) {
        if (!on) {
            System.arraycopy(theta, 0, s, 0, dimension);
            return;
        }
        for (int j = 0; j < dimension; j++) {
            double y = (theta[j] - centre[j]) / scale[j];
            double k = y < 0 ? low[j] : high[j];
            s[j] = k == 0 ? (scale[j] == 1 && centre[j] == 0 ? theta[j] : y) : Math.copySign(invert(Math.abs(y), k), y);
        }
    }

    /** The s >= 0 with s + k (sinh s - s) = y, y >= 0, k > 0. */
    private static double invert(double y, double k) {
        double lo = 0;
        double hi = Math.min(y, Math.log(2 * y / k + 1) + 1);
        while (hi + k * (Math.sinh(hi) - hi) < y) {
            hi *= 2;
        }
        double x = 0.5 * (lo + hi);
        for (int it = 0; it < 200; it++) {
            double f = x + k * (Math.sinh(x) - x) - y;
            if (f > 0) {
                hi = x;
            } else {
                lo = x;
            }
            double next = x - f / (1 + k * (Math.cosh(x) - 1));
            if (!(next > lo && next < hi)) {
                next = 0.5 * (lo + hi);
            }
            if (Math.abs(next - x) <= 1e-15 * Math.max(1, x)) {
                return next;
            }
            x = next;
        }
        return x;
    }

    /** log |d theta / d s| at s, up to a constant. */
    double logJacobian(double[] s) {
        if (!on) {
            return 0;
        }
        double sum = 0;
        for (int j = 0; j < dimension; j++) {
            double x = s[j];
            double k = x < 0 ? low[j] : high[j];
            if (k != 0) {
                sum += Math.log1p(k * (Math.cosh(x) - 1));
            }
        }
        return sum;
    }

    /** Turns the gradient in theta into the gradient in s of log p(theta(s)) + log |d theta / d s|, in place. */
    void chain(double[] s, double[] gradient) {
        if (!on) {
            return;
        }
        for (int j = 0; j < dimension; j++) {
            double x = s[j];
            double k = x < 0 ? low[j] : high[j];
            if (k == 0) {
                gradient[j] *= scale[j];
            } else {
                double d = 1 + k * (Math.cosh(x) - 1);
                gradient[j] = gradient[j] * scale[j] * d + k * Math.sinh(x) / d;
            }
        }
    }

    void save(DataOutput out) throws IOException {
        out.writeBoolean(on);
        if (on) {
            Checkpointed.writeDoubles(out, centre);
            Checkpointed.writeDoubles(out, scale);
            Checkpointed.writeDoubles(out, low);
            Checkpointed.writeDoubles(out, high);
        }
    }

    void restore(DataInput in) throws IOException {
        on = in.readBoolean();
        if (on) {
            Checkpointed.readDoubles(in, centre);
            Checkpointed.readDoubles(in, scale);
            Checkpointed.readDoubles(in, low);
            Checkpointed.readDoubles(in, high);
        }
    }
}
