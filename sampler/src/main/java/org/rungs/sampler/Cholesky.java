package org.rungs.sampler;

/**
 * Dense Cholesky factorisation and the two triangular solves, on n x n row-major blocks at an
 * offset of a plain array (Golub & Van Loan 2013, Matrix Computations, 4th ed., section 4.2,
 * from memory): the joint step's metric and the attraction block moves' approximations.
 */
final class Cholesky {
    private Cholesky() {
    }

    /**
     * Writes the lower factor L (A = L L') of the symmetric matrix whose lower triangle is at
     * {@code a[from..]} to {@code l[to..]}, row by row; the two may be the same block. False, with
     * {@code l} partly written, if A is not positive definite.
     */
    static boolean factor(double[] a, int from, double[] l, int to, int n) {
        for (int i = 0; i < n; i++) {
            for (int j = 0; j <= i; j++) {
                double s = a[from + i * n + j];
                for (int k = 0; k < j; k++) {
                    s -= l[to + i * n + k] * l[to + j * n + k];
                }
                if (i == j) {
                    if (!(s > 0)) {
                        return false;
                    }
                    l[to + i * n + i] = Math.sqrt(s);
                } else {
                    l[to + i * n + j] = s / l[to + j * n + j];
                }
            }
        }
        return true;
    }

    /** Solves L y = v in place, L the lower factor at {@code l[at..]}. */
    static void solveLower(double[] l, int at, int n, double[] v) {
        for (int i = 0; i < n; i++) {
            double s = v[i];
            for (int j = 0; j < i; j++) {
                s -= l[at + i * n + j] * v[j];
            }
            v[i] = s / l[at + i * n + i];
        }
    }

    /**
     * Solves L' y = v in place from {@code u} = L' row-major ({@link #transpose}): the arithmetic of
     * {@link #solveUpper}, in the same order, but reading rows, which matters once L outgrows the
     * cache (a thousand and more coordinates: many groups with by-group thresholds).
     */
    static void solveTransposedLower(double[] u, int n, double[] v) {
        for (int j = n - 1; j >= 0; j--) {
            double s = v[j];
            int row = j * n;
            for (int i = j + 1; i < n; i++) {
                s -= u[row + i] * v[i];
            }
            v[j] = s / u[row + j];
        }
    }

    /** Writes the transpose of the n x n row-major {@code a} to {@code t}. */
    static void transpose(double[] a, double[] t, int n) {
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                t[j * n + i] = a[i * n + j];
            }
        }
    }

    /** Solves L' y = v in place, L the lower factor at {@code l[at..]}. */
    static void solveUpper(double[] l, int at, int n, double[] v) {
        for (int j = n - 1; j >= 0; j--) {
            double s = v[j];
            for (int i = j + 1; i < n; i++) {
                s -= l[at + i * n + j] * v[i];
            }
            v[j] = s / l[at + j * n + j];
        }
    }
}
