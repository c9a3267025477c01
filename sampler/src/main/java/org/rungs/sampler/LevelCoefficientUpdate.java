package org.rungs.sampler;

import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.ejml.data.DMatrixRMaj;
import org.rungs.priors.Normal;
import org.rungs.priors.Priors;

/**
 * Joint conjugate draw of the group levels alpha and the coefficients beta given the latent
 * levels (Albert & Chib 1993, eq. 6, with the group prior alpha[g] ~ Normal(mu_alpha, tau_alpha)
 * of MODEL.md section 2). The group block of the precision is diagonal, so beta is drawn from its
 * marginal (the Schur complement) and then alpha given beta: exact, at a cost of O(G P^2) per
 * sweep whatever the number of respondents. With one group, alpha is mu_alpha itself.
 */
final class LevelCoefficientUpdate implements Update {
    private final ChainState state;
    private final DesignSums sums;
    private final Normal levelPrior;
    private final Normal groupMeanPrior;
    private final GaussianPrecisionSampler gaussian;
    private final ZigguratSampler.NormalizedGaussian normal;
    private final DMatrixRMaj precision;
    private final double[] h;
    private final double[] draw;
    private final double[] groupPrecision;
    private final double[] groupRhs;

    private LevelCoefficientUpdate(ChainState state, DesignSums sums, Priors priors, UniformRandomProvider rng) {
        this.state = state;
        this.sums = sums;
        this.levelPrior = priors.level();
        this.groupMeanPrior = priors.groupMean();
        int p = state.levelCount;
        this.gaussian = p > 0 ? GaussianPrecisionSampler.of(rng, p) : null;
        this.normal = ZigguratSampler.NormalizedGaussian.of(rng);
        this.precision = new DMatrixRMaj(p, p);
        this.h = new double[p];
        this.draw = new double[p];
        this.groupPrecision = new double[state.groups];
        this.groupRhs = new double[state.groups];
    }

    static LevelCoefficientUpdate of(ChainState state, DesignSums sums, Priors priors, UniformRandomProvider rng) {
        return new LevelCoefficientUpdate(state, sums, priors, rng);
    }

    @Override
    public void update(boolean adapt) {
        ChainState s = state;
        int groups = s.groups;
        int p = s.levelCount;
        double priorPrecision;
        double priorMean;
        if (groups > 1) {
            priorPrecision = 1.0 / (s.groupSd * s.groupSd);
            priorMean = s.groupMean;
        } else {
            priorPrecision = groupMeanPrior.precision();
            priorMean = groupMeanPrior.mean();
        }
        int[] sizes = sums.groupSizes();
        for (int g = 0; g < groups; g++) {
            groupPrecision[g] = sizes[g] + priorPrecision;
            groupRhs[g] = s.latentSumByGroup[g] + priorPrecision * priorMean;
        }
        if (p > 0) {
            double[][] gram = sums.covariateGram();
            double[][] groupCov = sums.groupCovariateSums();
            double betaPrecision = levelPrior.precision();
            for (int j = 0; j < p; j++) {
                for (int k = 0; k < p; k++) {
                    precision.unsafe_set(j, k, gram[j][k] + (j == k ? betaPrecision : 0));
                }
                h[j] = s.latentCross[j] + betaPrecision * levelPrior.mean();
            }
            for (int g = 0; g < groups; g++) {
                double[] cg = groupCov[g];
                double inv = 1.0 / groupPrecision[g];
                for (int j = 0; j < p; j++) {
                    h[j] -= cg[j] * groupRhs[g] * inv;
                    for (int k = 0; k < p; k++) {
                        precision.unsafe_set(j, k, precision.unsafe_get(j, k) - cg[j] * cg[k] * inv);
                    }
                }
            }
            gaussian.sample(precision, h, draw);
            System.arraycopy(draw, 0, s.beta, 0, p);
        }
        double[][] groupCov = sums.groupCovariateSums();
        for (int g = 0; g < groups; g++) {
            double rhs = groupRhs[g];
            for (int j = 0; j < p; j++) {
                rhs -= groupCov[g][j] * s.beta[j];
            }
            double sd = Math.sqrt(1.0 / groupPrecision[g]);
            s.alpha[g] = rhs / groupPrecision[g] + sd * normal.sample();
        }
        if (groups == 1) {
            s.groupMean = s.alpha[0];
        }
    }
}
