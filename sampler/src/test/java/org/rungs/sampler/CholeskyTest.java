package org.rungs.sampler;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.CommonOps_DDRM;
import org.junit.jupiter.api.Test;

class CholeskyTest {
    /** A random symmetric positive definite n x n matrix, row-major: B B' + n I. */
    private static double[] spd(int n, long seed) {
        SplittableRandom random = new SplittableRandom(seed);
        double[] b = new double[n * n];
        for (int i = 0; i < b.length; i++) {
            b[i] = random.nextDouble(-1, 1);
        }
        double[] a = new double[n * n];
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                double s = i == j ? n : 0;
                for (int k = 0; k < n; k++) {
                    s += b[i * n + k] * b[j * n + k];
                }
                a[i * n + j] = s;
            }
        }
        return a;
    }

    /**
     * L L' = A and the two solves invert L and L', against EJML 0.46.1's general inverse (the
     * reference: A^-1 v from an LU decomposition), to 1e-10 relative (rounding of a 40 x 40
     * system whose condition number is about 5).
     */
    @Test
    void factorAndSolvesInvertTheMatrix() {
        int n = 40;
        double[] a = spd(n, 3L);
        double[] l = new double[n * n];
        assertTrue(Cholesky.factor(a, 0, l, 0, n));
        double[] v = new SplittableRandom(4L).doubles(n, -1, 1).toArray();
        double[] x = v.clone();
        Cholesky.solveLower(l, 0, n, x);
        Cholesky.solveUpper(l, 0, n, x);
        DMatrixRMaj inverse = new DMatrixRMaj(n, n, true, a);
        assertTrue(CommonOps_DDRM.invert(inverse));
        DMatrixRMaj expected = new DMatrixRMaj(n, 1);
        CommonOps_DDRM.mult(inverse, new DMatrixRMaj(n, 1, true, v), expected);
        for (int i = 0; i < n; i++) {
            assertEquals(expected.get(i, 0), x[i], 1e-10 * Math.abs(expected.get(i, 0)) + 1e-14, "component " + i);
        }
    }

    /**
     * The joint step solves with R' from R' stored row-major, so that the draws stay what they
     * were when it read R by columns: the same numbers, bit for bit (our rule: a layout change
     * must not change the chain).
     */
    @Test
    void theTransposedSolveIsTheColumnSolveBitForBit() {
        int n = 57;
        double[] l = new double[n * n];
        assertTrue(Cholesky.factor(spd(n, 5L), 0, l, 0, n));
        double[] u = new double[n * n];
        Cholesky.transpose(l, u, n);
        for (long seed = 0; seed < 20; seed++) {
            double[] v = new SplittableRandom(seed).doubles(n, -3, 3).toArray();
            double[] byColumns = v.clone();
            double[] byRows = v.clone();
            Cholesky.solveUpper(l, 0, n, byColumns);
            Cholesky.solveTransposedLower(u, n, byRows);
            assertArrayEquals(byColumns, byRows, 0.0);
        }
    }
}
