package org.rungs.validation;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import java.util.concurrent.atomic.AtomicBoolean;
import java.util.function.ToDoubleFunction;
import org.apache.commons.math3.special.Erf;
import org.junit.jupiter.api.Test;
import org.rungs.models.ModelSpec;
import org.rungs.models.NumberAttraction;
import org.rungs.models.StyleClasses;
import org.rungs.models.survey.Covariates;
import org.rungs.models.survey.Scale;
import org.rungs.models.survey.Survey;
import org.rungs.posteriors.Convergence;
import org.rungs.posteriors.Draws;
import org.rungs.sampler.Fitter;
import org.rungs.sampler.ProgressListener;
import org.rungs.sampler.SamplerSettings;

/**
 * MODEL.md says that an independent implementation of its density must reach the same
 * posterior. Here is one, written in this test from MODEL.md alone (sections 3, 4, 4a-4c and 5,
 * one group): the log posterior of a small survey on the scale 0..4 (coarse points 0, 2, 4, so 1
 * and 3 split half and half), sampled by a random-walk Metropolis chain with the proposal
 * covariance of a pilot run (Haario, Saksman & Tamminen 2001, Bernoulli 7; scale 2.38^2 / d after
 * Gelman, Roberts & Gilks 1996), the normal distribution function from Commons Math's erfc. The
 * engine's posterior means and sds must agree with it.
 *
 * <p>Tolerance: 4.5 standard errors of the difference, the Monte Carlo standard errors of both
 * sides combined (Vehtari et al. 2021's MCSE of the mean and of the sd); 14 comparisons per case,
 * seeded, so a false alarm has a chance of about 1e-4 and the outcome is fixed. Largest |z| as
 * written: 2.0. With this test's density misread on purpose it failed each time: the thresholds'
 * prior sd 2 instead of 3 (|z| 9.9), a point equally near two coarse points sent to the lower one
 * (8.4), the coarse-class intercept's prior centred at 0 instead of -1 (9.9), the attractions'
 * prior sd 1 instead of 0.5 (54).
 */
class IndependentPosteriorTest {
    private static final int CATEGORIES = 5;
    /** R(j | k) of MODEL.md 4a for the points {0, 2, 4}: rows j, columns k. */
    private static final double[][] ROUNDING = {
        {1, 0.5, 0, 0, 0}, {0, 0, 0, 0, 0}, {0, 0.5, 1, 0.5, 0}, {0, 0, 0, 0, 0}, {0, 0, 0, 0.5, 1}};

    @Test
    void coarseClassMatchesAnIndependentSampler() {
        int[] counts = {5, 2, 10, 7, 6};
        compare(counts, false, 20261203L);
    }

    @Test
    void numberAttractionMatchesAnIndependentSampler() {
        int[] counts = {4, 2, 8, 10, 6};
        compare(counts, true, 20261204L);
    }

    /**
     * Parameters of the independent side: mu_alpha, mu_gamma, c1, c2, c3 (c4 = -(c1 + c2 + c3),
     * MODEL.md 3: the common thresholds sum to zero), then abar[1] and abar[3] under attraction.
     */
    private static void compare(int[] counts, boolean attraction, long seed) {
        int d = attraction ? 7 : 5;
        ToDoubleFunction<double[]> logPosterior = theta -> logPosterior(theta, counts, attraction);
        double[][][] independent = independentDraws(logPosterior, d, seed);

        Survey survey = survey(counts);
        ModelSpec spec = ModelSpec.defaults().withStyleClasses(StyleClasses.coarse(null))
                .withAttraction(attraction ? NumberAttraction.of(1, 3) : NumberAttraction.none());
        Draws engine = Fitter.fit(survey, spec, new SamplerSettings(4, 1000, 2000, seed, 2, 2), ProgressListener.NONE,
                new AtomicBoolean()).draws();

        List<String> names = new ArrayList<>(List.of("group_mean", "style_mean", "threshold.1", "threshold.2",
                "threshold.3", "threshold.4"));
        if (attraction) {
            names.addAll(List.of("attraction.1", "attraction.3"));
        }
        for (int p = 0; p < names.size(); p++) {
            check(names.get(p), engine.chainsOf(engine.indexOf(names.get(p))), independent[p]);
        }
    }

    private static void check(String name, double[][] ours, double[][] theirs) {
        double meanOurs = mean(ours);
        double meanTheirs = mean(theirs);
        double seMean = Math.hypot(Convergence.mcseMean(ours), Convergence.mcseMean(theirs));
        assertEquals(meanTheirs, meanOurs, 4.5 * seMean, "posterior mean of " + name);
        double sdOurs = sd(ours, meanOurs);
        double sdTheirs = sd(theirs, meanTheirs);
        double seSd = Math.hypot(Convergence.mcseSd(ours), Convergence.mcseSd(theirs));
        assertEquals(sdTheirs, sdOurs, 4.5 * seSd, "posterior sd of " + name);
    }

    private static Survey survey(int[] counts) {
        int n = 0;
        for (int c : counts) {
            n += c;
        }
        byte[] category = new byte[n];
        int i = 0;
        for (int k = 0; k < counts.length; k++) {
            for (int c = 0; c < counts[k]; c++) {
                category[i++] = (byte) k;
            }
        }
        return Survey.of(new Scale(0, 4), category, new int[n], List.of("all"), Covariates.none(), Covariates.none(), null);
    }

    private static double phi(double x) {
        return 0.5 * Erf.erfc(-x / Math.sqrt(2));
    }

    /** MODEL.md 3-5 with one group: no deviations, alpha = mu_alpha, gamma = mu_gamma, a[j] = abar[j]. */
    private static double logPosterior(double[] theta, int[] counts, boolean attraction) {
        double muAlpha = theta[0];
        double muGamma = theta[1];
        double[] c = {Double.NEGATIVE_INFINITY, theta[2], theta[3], theta[4], -(theta[2] + theta[3] + theta[4]),
            Double.POSITIVE_INFINITY};
        for (int k = 1; k < CATEGORIES; k++) {
            if (!(c[k] > c[k - 1])) {
                return Double.NEGATIVE_INFINITY;
            }
        }
        // b[k] ~ Normal(0, 3), c = b - mean(b): integrating the mean out leaves exp(-sum c^2 / (2 * 9))
        // on the plane sum c = 0 (the cross term vanishes there)
        double log = -muAlpha * muAlpha / 8 - (muGamma + 1) * (muGamma + 1) / 2;
        for (int k = 1; k < CATEGORIES; k++) {
            log -= c[k] * c[k] / 18;
        }
        double[] a = new double[CATEGORIES];
        if (attraction) {
            a[1] = theta[5];
            a[3] = theta[6];
            log -= (a[1] * a[1] + a[3] * a[3]) / (2 * 0.25);
        }
        double[] pi = new double[CATEGORIES];
        double tilt = 0;
        for (int k = 0; k < CATEGORIES; k++) {
            pi[k] = phi(c[k + 1] - muAlpha) - phi(c[k] - muAlpha);
            tilt += pi[k] * Math.exp(a[k]);
        }
        double q = phi(muGamma);
        for (int j = 0; j < CATEGORIES; j++) {
            double full = pi[j] * Math.exp(a[j]) / tilt;
            double coarse = 0;
            for (int k = 0; k < CATEGORIES; k++) {
                coarse += pi[k] * ROUNDING[j][k];
            }
            log += counts[j] * Math.log((1 - q) * full + q * coarse);
        }
        return log;
    }

    /**
     * Four random-walk Metropolis chains of 200,000 iterations (every 20th kept) after a pilot of
     * 100,000 whose draws give the proposal covariance; returns draws[parameter][chain][iteration]
     * in the engine's order: mu_alpha, mu_gamma, c1 to c4 (c4 = -(c1 + c2 + c3)), then the attractions.
     */
    private static double[][][] independentDraws(ToDoubleFunction<double[]> logPosterior, int d, long seed) {
        SplittableRandom random = new SplittableRandom(seed);
        double[] start = new double[d];
        start[1] = -1;
        start[2] = -1.5;
        start[3] = -0.5;
        start[4] = 0.5;
        double[][] pilot = new double[d][d];
        for (int i = 0; i < d; i++) {
            pilot[i][i] = 0.01;
        }
        double[][] covariance = covarianceOf(run(logPosterior, start, cholesky(pilot), 100_000, 1, random), d);
        double[][] factor = cholesky(scaled(covariance, 2.38 * 2.38 / d));
        int chains = 4;
        int kept = 10_000;
        int thin = 20;
        double[][][] out = new double[d + 1][chains][kept];
        for (int chain = 0; chain < chains; chain++) {
            double[][] draws = run(logPosterior, start, factor, kept * thin + 20_000, thin, random);
            for (int t = 0; t < kept; t++) {
                double[] x = draws[draws.length - kept + t];
                for (int p = 0; p < d; p++) {
                    out[p < 5 ? p : p + 1][chain][t] = x[p];
                }
                out[5][chain][t] = -(x[2] + x[3] + x[4]);
            }
        }
        return out;
    }

    /** Every thin-th state of a random-walk Metropolis chain with proposal factor L (steps L z, z standard normal). */
    private static double[][] run(ToDoubleFunction<double[]> logPosterior, double[] start, double[][] factor,
            int iterations, int thin, SplittableRandom random) {
        int d = start.length;
        double[] x = start.clone();
        double current = logPosterior.applyAsDouble(x);
        double[] z = new double[d];
        double[] y = new double[d];
        double[][] kept = new double[iterations / thin][];
        for (int it = 0; it < iterations; it++) {
            for (int i = 0; i < d; i++) {
                z[i] = random.nextGaussian();
            }
            for (int i = 0; i < d; i++) {
                double step = 0;
                for (int j = 0; j <= i; j++) {
                    step += factor[i][j] * z[j];
                }
                y[i] = x[i] + step;
            }
            double proposed = logPosterior.applyAsDouble(y);
            if (Math.log(random.nextDouble()) < proposed - current) {
                System.arraycopy(y, 0, x, 0, d);
                current = proposed;
            }
            if ((it + 1) % thin == 0) {
                kept[(it + 1) / thin - 1] = x.clone();
            }
        }
        return kept;
    }

    private static double[][] covarianceOf(double[][] draws, int d) {
        int from = draws.length / 2;
        int n = draws.length - from;
        double[] mean = new double[d];
        for (int t = from; t < draws.length; t++) {
            for (int i = 0; i < d; i++) {
                mean[i] += draws[t][i] / n;
            }
        }
        double[][] cov = new double[d][d];
        for (int t = from; t < draws.length; t++) {
            for (int i = 0; i < d; i++) {
                for (int j = 0; j < d; j++) {
                    cov[i][j] += (draws[t][i] - mean[i]) * (draws[t][j] - mean[j]) / (n - 1);
                }
            }
        }
        return cov;
    }

    private static double[][] scaled(double[][] a, double s) {
        double[][] out = new double[a.length][];
        for (int i = 0; i < a.length; i++) {
            out[i] = a[i].clone();
            for (int j = 0; j < a.length; j++) {
                out[i][j] *= s;
            }
        }
        return out;
    }

    private static double[][] cholesky(double[][] a) {
        int d = a.length;
        double[][] l = new double[d][d];
        for (int i = 0; i < d; i++) {
            for (int j = 0; j <= i; j++) {
                double sum = a[i][j];
                for (int k = 0; k < j; k++) {
                    sum -= l[i][k] * l[j][k];
                }
                l[i][j] = i == j ? Math.sqrt(sum) : sum / l[j][j];
            }
        }
        return l;
    }

    private static double mean(double[][] draws) {
        double sum = 0;
        int n = 0;
        for (double[] chain : draws) {
            for (double v : chain) {
                sum += v;
                n++;
            }
        }
        return sum / n;
    }

    private static double sd(double[][] draws, double mean) {
        double sum = 0;
        int n = 0;
        for (double[] chain : draws) {
            for (double v : chain) {
                sum += (v - mean) * (v - mean);
                n++;
            }
        }
        return Math.sqrt(sum / (n - 1));
    }
}
