package org.rungs.sampler;

import java.util.function.DoubleSupplier;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.commons.rng.simple.RandomSource;
import org.junit.jupiter.api.Test;
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
