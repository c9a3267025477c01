package org.rungs.sampler;

import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.decomposition.TriangularSolver_DDRM;
import org.ejml.dense.row.factory.DecompositionFactory_DDRM;
import org.ejml.interfaces.decomposition.CholeskyDecomposition_F64;

/**
 * Draws x ~ Normal(Q^-1 h, Q^-1) from a precision matrix Q and a vector h (the canonical form
 * of a conjugate Gaussian full conditional): with Q = L L', the mean solves L L' m = h and
 * x = m + L'^-1 z for standard normal z (Rue & Held 2005, Gaussian Markov Random Fields,
 * algorithm 2.5). The workspace is allocated once for a fixed dimension.
 */
final class GaussianPrecisionSampler {
    private final int dimension;
    private final CholeskyDecomposition_F64<DMatrixRMaj> cholesky;
    private final DMatrixRMaj work;
    private final DMatrixRMaj lower;
    private final double[] noise;
    private final ZigguratSampler.NormalizedGaussian normal;

    private GaussianPrecisionSampler(UniformRandomProvider rng, int dimension) {
        this.dimension = dimension;
        this.cholesky = DecompositionFactory_DDRM.chol(dimension, true);
        this.work = new DMatrixRMaj(dimension, dimension);
        this.lower = new DMatrixRMaj(dimension, dimension);
        this.noise = new double[dimension];
        this.normal = ZigguratSampler.NormalizedGaussian.of(rng);
    }

    static GaussianPrecisionSampler of(UniformRandomProvider rng, int dimension) {
        return new GaussianPrecisionSampler(rng, dimension);
    }

    /**
     * Fills {@code out} with a draw; {@code precision} is read, not changed; {@code h} is overwritten.
     *
     * @throws IllegalStateException if the precision is not positive definite
     */
    void sample(DMatrixRMaj precision, double[] h, double[] out) {
        work.setTo(precision);
        if (!cholesky.decompose(work)) {
            throw new IllegalStateException("the precision matrix of a conjugate update is not positive definite");
        }
        cholesky.getT(lower);
        double[] l = lower.data;
        TriangularSolver_DDRM.solveL(l, h, dimension);
        TriangularSolver_DDRM.solveTranL(l, h, dimension);
        for (int k = 0; k < dimension; k++) {
            noise[k] = normal.sample();
        }
        TriangularSolver_DDRM.solveTranL(l, noise, dimension);
        for (int k = 0; k < dimension; k++) {
            out[k] = h[k] + noise[k];
        }
    }
}
