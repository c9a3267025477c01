package org.rungs.sampler;

import java.util.SplittableRandom;
import java.util.function.DoubleSupplier;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.commons.rng.simple.RandomSource;
import org.junit.jupiter.api.Test;
import org.rungs.models.ModelSpec;
import org.rungs.models.StyleClasses;
import org.rungs.models.ThresholdMode;
import org.rungs.posteriors.MonteCarloMean;
import org.rungs.priors.HalfNormal;
import org.rungs.priors.Priors;

/**
 * The spread moves alone leave everything but one spread and the deviations along its ray fixed,
 * so they sample a one-dimensional density that quadrature gives exactly: with s the log of the
 * spread's factor from the start, q(s) proportional to the collapsed density at the scaled state
 * with the scaled spread, times the spread's half-normal prior and its Jacobian e^s. The chain's
 * mean and sd of s must match the quadrature's (trapezoid rule on 8,001 points of [-30, 6], far
 * finer than the density's width; below about -35 the collapsed density's deviations from the
 * intercepts' mean round to 0 and its value jumps) within 5 Monte Carlo standard errors (batch means of 40
 * batches; 5 so that the four comparisons stay clear of a false alarm; the seeds are fixed).
 * Without the Jacobian in the move's ratio both tests fail.
 */
class CollapsedSpreadUpdateTest {
    private static final int BURN = 500;
    private static final int BATCHES = 40;
    private static final int PER_BATCH = 250;

    /** By-group thresholds without the coarse class: the move of tau_d alone. */
    @Test
    void theThresholdSpreadMoveSamplesItsConditional() {
        ChainState s = CollapsedPosteriorTest.state(true, false, false, 6);
        CollapsedPosterior posterior = new CollapsedPosterior(s, Priors.defaults());
        int from = posterior.deviationAt;
        int to = from + s.groups * (s.categories - 2);
        double start = s.thresholdSd;
        check(s, posterior, Priors.defaults().thresholdSd(), start, () -> s.thresholdSd,
                (theta, factor) -> {
                    for (int i = from; i < to; i++) {
                        theta[i] *= factor;
                    }
                    s.thresholdSd = start * factor;
                });
    }

    /** Shared thresholds with the coarse class: the move of tau_gamma alone. */
    @Test
    void theStyleSpreadMoveSamplesItsConditional() {
        ChainState s = CollapsedPosteriorTest.state(false, true, false, 6);
        CollapsedPosterior posterior = new CollapsedPosterior(s, Priors.defaults());
        int from = posterior.gammaAt;
        double start = s.style.sd;
        check(s, posterior, Priors.defaults().styleSd(), start, () -> s.style.sd,
                (theta, factor) -> {
                    double mean = theta[from + s.groups];
                    for (int g = 0; g < s.groups; g++) {
                        theta[from + g] = mean + factor * (theta[from + g] - mean);
                    }
                    s.style.sd = start * factor;
                });
    }

    /**
     * The lag-1 autocorrelation that decides is the usual estimate r_1 = c_1 / c_0 (Box, Jenkins &
     * Reinsel, Time Series Analysis, eq. 2.1.12; by hand for 1, 2, 3, 4: 1.25 / 5 = 0.25). On
     * AR(1) series of the window's length (188 sweeps of the default warm-up) it tells the demo's
     * autocorrelations from the slow chains': of 200 series with rho 0.5 none exceeds
     * {@value CollapsedSpreadUpdate#SLOW} (the estimate's sd is about 0.06, so 0.8 is 5 sd away),
     * and of 200 with rho 0.95 at most 4 stay below it (bias about -(1 + 4 rho) / n = -0.025,
     * Marriott & Pope 1954, from memory; the sd about 0.025 asymptotically, more in such short
     * series). Fixed seed.
     */
    @Test
    void theDecidingAutocorrelationTellsASlowChainFromAFastOne() {
        assertEquals(0.25, CollapsedSpreadUpdate.lagOneAutocorrelation(new double[] {1, 2, 3, 4}), 1e-15);
        assertEquals(0, CollapsedSpreadUpdate.lagOneAutocorrelation(new double[] {2, 2, 2}));
        SplittableRandom random = new SplittableRandom(41L);
        int n = 188;
        double[] x = new double[n];
        int[] slow = new int[2];
        double[] rhos = {0.5, 0.95};
        for (int r = 0; r < 2; r++) {
            double rho = rhos[r];
            for (int series = 0; series < 200; series++) {
                x[0] = random.nextGaussian() / Math.sqrt(1 - rho * rho);
                for (int t = 1; t < n; t++) {
                    x[t] = rho * x[t - 1] + random.nextGaussian();
                }
                slow[r] += CollapsedSpreadUpdate.lagOneAutocorrelation(x) > CollapsedSpreadUpdate.SLOW ? 1 : 0;
            }
        }
        assertEquals(0, slow[0], "rho 0.5");
        assertTrue(slow[1] >= 196, "rho 0.95: " + slow[1]);
    }

    /**
     * Below the arrow metric's size the moves start only in a chain whose spreads crawl, with
     * the coarse class and 1,000 warm-up sweeps. On 40 groups of 30 drawn alike (true spreads 0;
     * 440 coordinates, so the dense metric), none run until the window (sweeps 562 to 749) ends
     * and both spreads' run from sweep 750 (lag-1 autocorrelations 0.90 and 0.94 at this seed).
     * On 8 groups of 400 that use the scale differently none start (0.54 and 0.18).
     */
    @Test
    void theMovesStartAtThreeQuartersOfWarmupOnlyWhereTheSpreadsCrawl() {
        ModelSpec spec = new ModelSpec(ThresholdMode.BY_GROUP, Priors.defaults(), StyleClasses.coarse(null));
        Chain slow = Chain.of(SurveyOrder.of(FitterTest.manyGroups(40, 30, 3L)), spec, true, 1000,
                RandomSource.XO_RO_SHI_RO_128_PP.create(5L));
        for (int t = 0; t < 750; t++) {
            slow.sweepOnce(true);
        }
        assertEquals("none", slow.spreadMoves());
        slow.sweepOnce(true);
        assertEquals("threshold_sd, style_sd", slow.spreadMoves());
        for (int t = 751; t < 1000; t++) {
            slow.sweepOnce(true);
        }
        assertEquals("threshold_sd, style_sd", slow.spreadMoves(), "decided once");
        Chain fast = Chain.of(SurveyOrder.of(FitterTest.distinctGroups(8, 400, 3L)), spec, true, 1000,
                RandomSource.XO_RO_SHI_RO_128_PP.create(5L));
        for (int t = 0; t < 1000; t++) {
            fast.sweepOnce(true);
        }
        assertEquals("none", fast.spreadMoves());
    }

    /**
     * The plain model's sweep (no joint step) starts with the same moves of tau_d alone: on 40
     * groups of 30 drawn alike they start at sweep 750 of 1,000 warm-up sweeps (this seed). That
     * such fits stay calibrated is the plain calibration record's check
     * (validation/records/2026-12-05-plain-spread-moves).
     */
    @Test
    void thePlainModelsThresholdSpreadMovesStartWhenItIsSlow() {
        ModelSpec plain = new ModelSpec(ThresholdMode.BY_GROUP, Priors.defaults(), StyleClasses.none());
        Chain chain = Chain.of(SurveyOrder.of(FitterTest.manyGroups(40, 30, 3L)), plain, true, 1000,
                RandomSource.XO_RO_SHI_RO_128_PP.create(5L));
        for (int t = 0; t < 750; t++) {
            chain.sweepOnce(true);
        }
        assertEquals("none", chain.spreadMoves());
        chain.sweepOnce(true);
        assertEquals("threshold_sd", chain.spreadMoves());
    }

    /** Scales theta's part of the spread's ray by the factor and sets the spread to start * factor. */
    private interface Ray {
        void scale(double[] theta, double factor);
    }

    private static void check(ChainState s, CollapsedPosterior posterior, HalfNormal prior, double start,
            DoubleSupplier spread, Ray ray) {
        int d = posterior.dimension();
        double[] origin = new double[d];
        posterior.read(origin);
        // the exact density of s by quadrature
        int points = 8001;
        double low = -30;
        double high = 6;
        double h = (high - low) / (points - 1);
        double[] logQ = new double[points];
        double top = Double.NEGATIVE_INFINITY;
        double[] theta = new double[d];
        for (int p = 0; p < points; p++) {
            double x = low + p * h;
            System.arraycopy(origin, 0, theta, 0, d);
            ray.scale(theta, Math.exp(x));
            double density = posterior.logDensity(theta);
            logQ[p] = density + prior.logDensity(start * Math.exp(x)) + x;
            top = Math.max(top, logQ[p]);
        }
        ray.scale(theta, 1); // back to the start's spread
        double mass = 0;
        double first = 0;
        double second = 0;
        for (int p = 0; p < points; p++) {
            double w = Math.exp(logQ[p] - top) * (p == 0 || p == points - 1 ? 0.5 : 1);
            double x = low + p * h;
            mass += w;
            first += w * x;
            second += w * x * x;
        }
        double mean = first / mass;
        double sd = Math.sqrt(second / mass - mean * mean);
        assertTrue(Math.exp(logQ[0] - top) < 1e-12 && Math.exp(logQ[points - 1] - top) < 1e-12, "the grid holds the density: " + (logQ[0] - top) + ", " + (logQ[points - 1] - top) + ", top at " + top + ", start " + start);

        CollapsedSpreadUpdate update = CollapsedSpreadUpdate.of(s, Priors.defaults(), RandomSource.XO_RO_SHI_RO_128_PP.create(17L));
        for (int t = 0; t < BURN; t++) {
            update.update(true);
        }
        double[] batchMean = new double[BATCHES];
        double[] batchSquare = new double[BATCHES];
        for (int b = 0; b < BATCHES; b++) {
            for (int t = 0; t < PER_BATCH; t++) {
                update.update(false);
                double x = Math.log(spread.getAsDouble() / start);
                batchMean[b] += x / PER_BATCH;
                batchSquare[b] += x * x / PER_BATCH;
            }
        }
        double chainMean = MonteCarloMean.mean(batchMean);
        double chainSquare = MonteCarloMean.mean(batchSquare);
        double chainSd = Math.sqrt(chainSquare - chainMean * chainMean);
        double meanError = MonteCarloMean.standardError(batchMean);
        // the sd's error by the delta method from the batch means of x and x^2
        double[] sdParts = new double[BATCHES];
        for (int b = 0; b < BATCHES; b++) {
            sdParts[b] = (batchSquare[b] - 2 * chainMean * batchMean[b]) / (2 * chainSd);
        }
        double sdError = MonteCarloMean.standardError(sdParts);
        assertEquals(mean, chainMean, 5 * meanError, "mean of log factor (se " + meanError + ")");
        assertEquals(sd, chainSd, 5 * sdError, "sd of log factor (se " + sdError + ")");
    }
}
