package org.rungs.sampler;

import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.ejml.data.DMatrixRMaj;
import org.rungs.priors.Normal;

/**
 * Joint conjugate draw of a block's group intercepts and coefficients given the sums of its
 * latent values (Albert & Chib 1993, eq. 6, with the group prior intercept[g] ~ Normal(mean, sd)
 * of MODEL.md 2 and 4). The intercept block of the precision is diagonal, so the coefficients
 * are drawn from their marginal (the Schur complement) and then the intercepts given them:
 * exact, at a cost of O(G P^2) per sweep whatever the number of respondents. With one group the
 * intercept is the block's mean itself, with the mean's prior. Extra latent values of a
 * respondent (the rejected draws under attraction) enter as further observations of its eta.
 */
final class RegressionUpdate implements Update {
    private final RegressionBlock block;
    private final Normal coefficientPrior;
    private final Normal meanPrior;
    private final GaussianPrecisionSampler gaussian;
    private final ZigguratSampler.NormalizedGaussian normal;
    private final DMatrixRMaj precision;
    private final double[] h;
    private final double[] draw;
    private final double[] groupPrecision;
    private final double[] groupRhs;
    private final double[][] groupCovariate;

    private RegressionUpdate(RegressionBlock block, Normal coefficientPrior, Normal meanPrior, UniformRandomProvider rng) {
        this.block = block;
        this.coefficientPrior = coefficientPrior;
        this.meanPrior = meanPrior;
        int p = block.count;
        this.gaussian = p > 0 ? GaussianPrecisionSampler.of(rng, p) : null;
        this.normal = ZigguratSampler.NormalizedGaussian.of(rng);
        this.precision = new DMatrixRMaj(p, p);
        this.h = new double[p];
        this.draw = new double[p];
        this.groupPrecision = new double[block.groups];
        this.groupRhs = new double[block.groups];
        this.groupCovariate = new double[block.groups][p];
    }

    static RegressionUpdate of(RegressionBlock block, Normal coefficientPrior, Normal meanPrior, UniformRandomProvider rng) {
        return new RegressionUpdate(block, coefficientPrior, meanPrior, rng);
    }

    @Override
    public void update(boolean adapt) {
        RegressionBlock b = block;
        int groups = b.groups;
        int p = b.count;
        double priorPrecision;
        double priorMean;
        if (groups > 1) {
            priorPrecision = 1.0 / (b.sd * b.sd);
            priorMean = b.mean;
        } else {
            priorPrecision = meanPrior.precision();
            priorMean = meanPrior.mean();
        }
        int[] sizes = b.sums.groupSizes();
        for (int g = 0; g < groups; g++) {
            groupPrecision[g] = sizes[g] + b.extraCount[g] + priorPrecision;
            groupRhs[g] = b.latentSum[g] + priorPrecision * priorMean;
        }
        double[][] groupCov = groupCovariate;
        double[][] baseCov = b.sums.groupCovariateSums();
        for (int g = 0; g < groups; g++) {
            for (int j = 0; j < p; j++) {
                groupCov[g][j] = baseCov[g][j] + b.extraGroupCovariate[g][j];
            }
        }
        if (p > 0) {
            double[][] gram = b.sums.covariateGram();
            double betaPrecision = coefficientPrior.precision();
            for (int j = 0; j < p; j++) {
                for (int k = 0; k < p; k++) {
                    precision.unsafe_set(j, k, gram[j][k] + b.extraGram[j][k] + (j == k ? betaPrecision : 0));
                }
                h[j] = b.latentCross[j] + betaPrecision * coefficientPrior.mean();
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
            System.arraycopy(draw, 0, b.coefficient, 0, p);
        }
        for (int g = 0; g < groups; g++) {
            double rhs = groupRhs[g];
            for (int j = 0; j < p; j++) {
                rhs -= groupCov[g][j] * b.coefficient[j];
            }
            double sd = Math.sqrt(1.0 / groupPrecision[g]);
            b.intercept[g] = rhs / groupPrecision[g] + sd * normal.sample();
        }
        if (groups == 1) {
            b.mean = b.intercept[0];
        }
    }
}
