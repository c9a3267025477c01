package org.rungs.sampler;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.List;
import org.apache.commons.math3.analysis.integration.SimpsonIntegrator;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.ArrayRealVector;
import org.apache.commons.math3.linear.LUDecomposition;
import org.apache.commons.math3.linear.RealMatrix;
import org.apache.commons.math3.linear.RealVector;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.simple.RandomSource;
import org.junit.jupiter.api.Test;
import org.rungs.models.survey.Covariates;
import org.rungs.models.survey.Scale;
import org.rungs.models.survey.Survey;
import org.rungs.priors.Priors;

/**
 * Special cases whose posterior is known in closed form: with the thresholds held fixed and one
 * group, the data augmentation of Albert & Chib (1993) must reproduce the exact posterior of the
 * level; and given the latent levels, the coefficient draw must be the conjugate normal.
 */
class ConjugateCaseTest {
    private static final double[] CUTS = {-1.0, 0.0, 1.0};
    private static final NormalDistribution PHI = new NormalDistribution(0, 1);

    /** One respondent answering category k (0..3), thresholds fixed at -1, 0, 1. */
    private static ChainState fixedThresholdState(byte[] categories) {
        Survey survey = Survey.of(new Scale(0, 3), categories, new int[categories.length], List.of("all"),
                Covariates.none(), Covariates.none(), null);
        ChainState s = new ChainState(SurveyOrder.of(survey), false, null);
        for (int k = 0; k < CUTS.length; k++) {
            s.common[k + 1] = CUTS[k];
        }
        s.shareCommonThresholds();
        return s;
    }

    private static double[] runLevelChain(ChainState s, Priors priors, long seed, int iterations) {
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(seed);
        Update latent = LatentLevelUpdate.of(s, rng);
        Update level = RegressionUpdate.of(s.level, priors.level(), priors.groupMean(), rng);
        double[] out = new double[iterations];
        for (int it = 0; it < 1000; it++) {
            latent.update(false);
            level.update(false);
        }
        for (int it = 0; it < iterations; it++) {
            latent.update(false);
            level.update(false);
            out[it] = s.level.mean;
        }
        return out;
    }

    /**
     * One respondent in category 2 (between thresholds 0 and 1), prior mu ~ Normal(m0, s0): the
     * posterior is proportional to Normal(mu; m0, s0) [Phi(1 - mu) - Phi(0 - mu)]. With
     * Z(a) = E Phi(a - mu) = Phi((a - m0)/r), r = sqrt(1 + s0^2), Stein's lemma gives
     * E[mu Phi(a - mu)] = m0 Z(a) - s0^2 phi((a - m0)/r)/r and
     * E[mu^2 Phi(a - mu)] = (m0^2 + s0^2) Z(a) - (2 m0 s0^2 + s0^4 (a - m0)/r^2) phi((a - m0)/r)/r
     * (the skew-normal moments of Azzalini 1985, Scand. J. Statist. 12, in extended form).
     */
    @Test
    void singleRespondentMatchesClosedFormPosterior() {
        double m0 = 0.3;
        double s0 = 1.5;
        Priors priors = Priors.defaults().with("group_mean=normal(" + m0 + "," + s0 + ")");
        ChainState s = fixedThresholdState(new byte[] {2});
        double[] draws = runLevelChain(s, priors, 11L, 400_000);

        double r = Math.sqrt(1 + s0 * s0);
        double z = moment(0, 1.0, m0, s0, r) - moment(0, 0.0, m0, s0, r);
        double mean = (moment(1, 1.0, m0, s0, r) - moment(1, 0.0, m0, s0, r)) / z;
        double second = (moment(2, 1.0, m0, s0, r) - moment(2, 0.0, m0, s0, r)) / z;
        double variance = second - mean * mean;

        // Cross-check the closed form against numerical integration (Simpson, Commons Math 3.6.1).
        assertEquals(mean, quadratureMean(new byte[] {2}, m0, s0), 1e-6, "closed form vs quadrature");

        double sampleMean = mean(draws);
        double sampleVar = variance(draws, sampleMean);
        // Augmentation chains of this kind have lag-1 autocorrelation near 0.4-0.6; with 4e5 draws
        // the Monte Carlo sd of the mean is below sqrt(var * 4 / 4e5) ~ 0.004: allow 0.015.
        assertEquals(mean, sampleMean, 0.015, "posterior mean");
        // Relative Monte Carlo error of a variance from ~1e5 effective draws is ~0.5%: allow 3%.
        assertEquals(variance, sampleVar, 0.03 * variance, "posterior variance");
    }

    /** Five respondents in several categories: the exact posterior mean by quadrature. */
    @Test
    void severalRespondentsMatchQuadrature() {
        double m0 = -0.2;
        double s0 = 1.0;
        byte[] categories = {0, 1, 1, 2, 3};
        Priors priors = Priors.defaults().with("group_mean=normal(" + m0 + "," + s0 + ")");
        ChainState s = fixedThresholdState(categories);
        double[] draws = runLevelChain(s, priors, 12L, 300_000);
        double exact = quadratureMean(categories, m0, s0);
        // Monte Carlo sd of the mean < 0.004 (as above); allow 0.015.
        assertEquals(exact, mean(draws), 0.015);
    }

    /**
     * Given latent levels, (alpha, beta) | y* is Normal((X'X + L0)^-1 (X'y* + L0 m0), (X'X + L0)^-1)
     * (Albert & Chib 1993, eq. 6). Built here with an explicit design matrix and Commons Math's LU
     * inverse, independently of the sampler's Schur-complement route.
     */
    @Test
    void coefficientDrawIsTheConjugateNormal() {
        int n = 60;
        int groups = 3;
        UniformRandomProvider data = RandomSource.XO_RO_SHI_RO_128_PP.create(5L);
        int[] group = new int[n];
        double[] x1 = new double[n];
        double[] x2 = new double[n];
        double[] latent = new double[n];
        for (int i = 0; i < n; i++) {
            group[i] = i % groups;
            x1[i] = data.nextDouble() * 4;
            x2[i] = data.nextDouble() + 0.3 * x1[i];
            latent[i] = 0.5 * group[i] + 0.4 * x1[i] - 0.2 * x2[i] + data.nextDouble() - 0.5;
        }
        Covariates level = Covariates.fromNumeric(List.of("x1", "x2"), List.of(x1, x2));
        Survey survey = Survey.of(new Scale(0, 3), new byte[n], group, List.of("a", "b", "c"), level, Covariates.none(), null);
        ChainState s = new ChainState(SurveyOrder.of(survey), false, null);
        s.level.mean = 0.4;
        s.level.sd = 0.7;
        double[] z1 = level.column(0);
        double[] z2 = level.column(1);
        for (int i = 0; i < n; i++) {
            s.level.latentSum[group[i]] += latent[i];
            s.level.latentCross[0] += z1[i] * latent[i];
            s.level.latentCross[1] += z2[i] * latent[i];
        }
        Priors priors = Priors.defaults().with("level=normal(0.1,2)");
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(6L);
        RegressionUpdate update = RegressionUpdate.of(s.level, priors.level(), priors.groupMean(), rng);

        int d = groups + 2;
        RealMatrix x = new Array2DRowRealMatrix(n, d);
        for (int i = 0; i < n; i++) {
            x.setEntry(i, group[i], 1);
            x.setEntry(i, groups, z1[i]);
            x.setEntry(i, groups + 1, z2[i]);
        }
        RealMatrix precision = x.transpose().multiply(x);
        RealVector rhs = x.transpose().operate(new ArrayRealVector(latent));
        for (int g = 0; g < groups; g++) {
            precision.addToEntry(g, g, 1 / (0.7 * 0.7));
            rhs.addToEntry(g, 0.4 / (0.7 * 0.7));
        }
        for (int j = groups; j < d; j++) {
            precision.addToEntry(j, j, 1 / 4.0);
            rhs.addToEntry(j, 0.1 / 4.0);
        }
        RealMatrix covariance = new LUDecomposition(precision).getSolver().getInverse();
        RealVector mean = covariance.operate(rhs);

        int draws = 200_000;
        double[] sum = new double[d];
        double[][] cross = new double[d][d];
        double[] v = new double[d];
        for (int it = 0; it < draws; it++) {
            update.update(false);
            for (int g = 0; g < groups; g++) {
                v[g] = s.level.intercept[g];
            }
            v[groups] = s.level.coefficient[0];
            v[groups + 1] = s.level.coefficient[1];
            for (int a = 0; a < d; a++) {
                sum[a] += v[a];
                for (int b = 0; b < d; b++) {
                    cross[a][b] += v[a] * v[b];
                }
            }
        }
        for (int a = 0; a < d; a++) {
            double m = sum[a] / draws;
            double sd = Math.sqrt(covariance.getEntry(a, a));
            // Independent draws: Monte Carlo sd of the mean is sd/sqrt(2e5) = 0.0022 sd; allow 5 of them.
            assertEquals(mean.getEntry(a), m, 5 * sd / Math.sqrt(draws), "mean of coordinate " + a);
            for (int b = 0; b < d; b++) {
                double cov = cross[a][b] / draws - m * (sum[b] / draws);
                double scale = Math.sqrt(covariance.getEntry(a, a) * covariance.getEntry(b, b));
                // Sampling sd of a covariance estimate is at most ~sqrt(2/n) of the scale: 0.0032; allow 0.015.
                assertEquals(covariance.getEntry(a, b), cov, 0.015 * scale, "covariance " + a + "," + b);
            }
        }
    }

    private static double moment(int order, double a, double m0, double s0, double r) {
        double t = (a - m0) / r;
        double z = PHI.cumulativeProbability(t);
        double dens = PHI.density(t) / r;
        switch (order) {
            case 0: return z;
            case 1: return m0 * z - s0 * s0 * dens;
            default: return (m0 * m0 + s0 * s0) * z - (2 * m0 * s0 * s0 + Math.pow(s0, 4) * (a - m0) / (r * r)) * dens;
        }
    }

    private static double quadratureMean(byte[] categories, double m0, double s0) {
        double[] bounds = {Double.NEGATIVE_INFINITY, CUTS[0], CUTS[1], CUTS[2], Double.POSITIVE_INFINITY};
        NormalDistribution prior = new NormalDistribution(m0, s0);
        java.util.function.DoubleUnaryOperator post = mu -> {
            double p = prior.density(mu);
            for (byte k : categories) {
                p *= PHI.cumulativeProbability(bounds[k + 1] - mu) - PHI.cumulativeProbability(bounds[k] - mu);
            }
            return p;
        };
        SimpsonIntegrator simpson = new SimpsonIntegrator(1e-12, 1e-12, 3, 30);
        double lo = m0 - 12 * s0;
        double hi = m0 + 12 * s0;
        double z = simpson.integrate(1_000_000, post::applyAsDouble, lo, hi);
        double m = simpson.integrate(1_000_000, mu -> mu * post.applyAsDouble(mu), lo, hi);
        return m / z;
    }

    private static double mean(double[] x) {
        double s = 0;
        for (double v : x) {
            s += v;
        }
        return s / x.length;
    }

    private static double variance(double[] x, double mean) {
        double s = 0;
        for (double v : x) {
            s += (v - mean) * (v - mean);
        }
        return s / (x.length - 1);
    }
}
