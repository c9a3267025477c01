package org.rungs.sampler;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.apache.commons.rng.simple.RandomSource;
import org.junit.jupiter.api.Test;

class CoordinateWarpTest {
    /**
     * Draws of three coordinates: a standard normal (left linear), a normal whose lower tail is a
     * long exponential one (bent below only), and a Student t with 2 degrees of freedom (both
     * tails). 4,000 draws, seed 5.
     */
    private static CoordinateWarp fitted() {
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(5L);
        ZigguratSampler.NormalizedGaussian normal = ZigguratSampler.NormalizedGaussian.of(rng);
        int n = 4000;
        double[] draws = new double[3 * n];
        for (int t = 0; t < n; t++) {
            draws[3 * t] = 2 + 0.5 * normal.sample();
            double z = normal.sample();
            draws[3 * t + 1] = z > 0 ? 0.1 * z : 0.1 * z + (rng.nextDouble() < 0.3 ? Math.log(rng.nextDouble()) : 0);
            double chi = 0;
            for (int f = 0; f < 2; f++) {
                double w = normal.sample();
                chi += w * w;
            }
            draws[3 * t + 2] = normal.sample() / Math.sqrt(chi / 2);
        }
        CoordinateWarp warp = new CoordinateWarp(3);
        warp.fit(draws, n);
        return warp;
    }

    /**
     * The fit bends the heavy tails only: the normal coordinate stays the identity (its bends are
     * within sampling error of 0, below {@link CoordinateWarp#MIN_BEND}; with 4,000 draws the
     * quantiles' sd is a few per cent), the skewed one is bent below alone.
     */
    @Test
    void bendsTheLongTailsAndLeavesAGaussianAlone() {
        CoordinateWarp warp = fitted();
        assertTrue(warp.on());
        double[] s = {0.7, 0, 0};
        double[] theta = new double[3];
        warp.toTheta(s, theta);
        assertEquals(0.7, theta[0], 0.0, "identity on the normal coordinate");
        assertEquals(1.0, warp.slope(0), 0.0);
        // coordinate 1: linear above its median, so theta(s) - theta(0) = b s there
        double[] up = {0, 1, 0};
        double[] down = {0, -1, 0};
        double[] thetaUp = new double[3];
        double[] thetaDown = new double[3];
        warp.toTheta(up, thetaUp);
        warp.toTheta(down, thetaDown);
        assertEquals(warp.slope(1), thetaUp[1] - theta[1], 1e-14);
        assertTrue(theta[1] - thetaDown[1] > 1.01 * warp.slope(1), "bent below");
    }

    /** s(theta(s)) = s to 1e-12 over s in [-6, 6] for every coordinate, and theta increases with s. */
    @Test
    void theMapIsInvertedExactly() {
        CoordinateWarp warp = fitted();
        double[] s = new double[3];
        double[] theta = new double[3];
        double[] back = new double[3];
        double[] previous = {Double.NEGATIVE_INFINITY, Double.NEGATIVE_INFINITY, Double.NEGATIVE_INFINITY};
        for (double x = -6; x <= 6; x += 0.01) {
            java.util.Arrays.fill(s, x);
            warp.toTheta(s, theta);
            warp.toS(theta, back);
            for (int j = 0; j < 3; j++) {
                assertEquals(x, back[j], 1e-12 * Math.max(1, Math.abs(x)), "coordinate " + j + " at s = " + x);
                assertTrue(theta[j] > previous[j], "increasing, coordinate " + j + " at s = " + x);
                previous[j] = theta[j];
            }
        }
    }

    /**
     * The log Jacobian is log |d theta / d s| (against a central difference of theta, step 1e-6,
     * relative error about 1e-9), and {@link CoordinateWarp#chain} gives the gradient in s of
     * f(theta(s)) + log Jacobian for f(theta) = -sum theta^2 / 2 (against central differences,
     * tolerance 1e-6).
     */
    @Test
    void jacobianAndChainRuleMatchFiniteDifferences() {
        CoordinateWarp warp = fitted();
        double h = 1e-6;
        for (double x = -4; x <= 4; x += 0.37) {
            double[] s = {x, x, x};
            double[] theta = new double[3];
            warp.toTheta(s, theta);
            double[] gradient = {-theta[0], -theta[1], -theta[2]};
            warp.chain(s, gradient);
            double logJ = 0;
            for (int j = 0; j < 3; j++) {
                double[] plus = s.clone();
                double[] minus = s.clone();
                plus[j] += h;
                minus[j] -= h;
                double[] tp = new double[3];
                double[] tm = new double[3];
                warp.toTheta(plus, tp);
                warp.toTheta(minus, tm);
                logJ += Math.log((tp[j] - tm[j]) / (2 * h) / warp.slope(j));
                double numeric = (value(warp, plus) - value(warp, minus)) / (2 * h);
                assertEquals(numeric, gradient[j], 1e-6 * Math.max(1, Math.abs(numeric)), "coordinate " + j + " at s = " + x);
            }
            assertEquals(logJ, warp.logJacobian(s), 1e-7, "at s = " + x);
        }
    }

    private static double value(CoordinateWarp warp, double[] s) {
        double[] theta = new double[3];
        warp.toTheta(s, theta);
        double f = 0;
        for (double t : theta) {
            f -= 0.5 * t * t;
        }
        return f + warp.logJacobian(s);
    }

    /** Unfitted, or cleared, the map is the identity bit for bit. */
    @Test
    void identityUntilFitted() {
        CoordinateWarp warp = new CoordinateWarp(2);
        assertFalse(warp.on());
        double[] s = {0.1234567, -3.3};
        double[] theta = new double[2];
        warp.toTheta(s, theta);
        assertEquals(s[0], theta[0], 0.0);
        assertEquals(s[1], theta[1], 0.0);
        assertEquals(0.0, warp.logJacobian(s), 0.0);
        CoordinateWarp bent = fitted();
        bent.clear();
        assertFalse(bent.on());
    }
}
