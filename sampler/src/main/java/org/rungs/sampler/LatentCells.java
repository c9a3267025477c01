package org.rungs.sampler;

import java.util.Arrays;

/**
 * Sums of the latent levels of one sweep by cell (group g, category k whose interval holds the
 * value): count n, sum S1 and sum of squares S2 of the values z, and per covariate j the sums of
 * x_j and of x_j z. They are all the threshold rescaling steps ({@link ThresholdRescaleUpdate})
 * need, and all the conjugate level update needs (the latent sum per group and the cross-products
 * with the covariates), so the latent values themselves are never stored.
 *
 * <p>A rescaling step maps every value of a cell by z -> A + s z. S1 and S2 follow at once; the
 * cross-products follow lazily through the composed map of each cell, applied by {@link #finish}.
 */
final class LatentCells {
    private final int cells;
    private final int count;
    private final int width;
    /** Per cell: n, S1, S2, then sum x_j (count of them), then sum x_j z (count of them). */
    private final double[] sums;
    /** Per cell: the composed map z -> shift + scale z applied since {@link #clear}. */
    private final double[] shift;
    private final double[] scale;
    /** Per cell, for the coefficients of {@link #prepare}: sum of x_i' beta and of z x_i' beta. */
    private final double[] linearSum;
    private final double[] linearCross;

    LatentCells(int cells, int count) {
        this.cells = cells;
        this.count = count;
        this.width = 3 + 2 * count;
        this.sums = new double[cells * width];
        this.shift = new double[cells];
        this.scale = new double[cells];
        this.linearSum = new double[cells];
        this.linearCross = new double[cells];
    }

    void clear() {
        Arrays.fill(sums, 0);
        Arrays.fill(shift, 0);
        Arrays.fill(scale, 1);
    }

    /** Adds latent value z of respondent i (covariate columns x) to cell c. Allocation-free. */
    void add(int c, double[][] x, int i, double z) {
        int at = c * width;
        double[] a = sums;
        a[at] += 1;
        a[at + 1] += z;
        a[at + 2] += z * z;
        int p = count;
        for (int j = 0; j < p; j++) {
            double xj = x[j][i];
            a[at + 3 + j] += xj;
            a[at + 3 + p + j] += xj * z;
        }
    }

    /**
     * Adds a run of n latent values to cell c: their sum s1 and sum of squares s2, and per
     * covariate j the sums x[j] of its values and xz[j] of its values times the latent values.
     */
    void addRun(int c, double n, double s1, double s2, double[] x, double[] xz) {
        int at = c * width;
        double[] a = sums;
        a[at] += n;
        a[at + 1] += s1;
        a[at + 2] += s2;
        int p = count;
        for (int j = 0; j < p; j++) {
            a[at + 3 + j] += x[j];
            a[at + 3 + p + j] += xz[j];
        }
    }

    /** Fills the per-cell sums of x_i' beta and z x_i' beta for the current coefficients. */
    void prepare(double[] beta) {
        int p = count;
        for (int c = 0; c < cells; c++) {
            int at = c * width;
            double r = 0;
            double cross = 0;
            for (int j = 0; j < p; j++) {
                r += beta[j] * sums[at + 3 + j];
                cross += beta[j] * (shift[c] * sums[at + 3 + j] + scale[c] * sums[at + 3 + p + j]);
            }
            linearSum[c] = r;
            linearCross[c] = cross;
        }
    }

    double n(int c) {
        return sums[c * width];
    }

    /**
     * The change of sum (z - alpha - x' beta)^2 over cell c when every z becomes A + s z and the
     * intercept alpha becomes alphaNew, with beta as in {@link #prepare}. With B = A - alphaNew,
     * R1 = sum x' beta and C = sum z x' beta the new sum is s^2 S2 + 2 s B S1 - 2 s C + n B^2
     * - 2 B R1 + R2, the old one the same with s = 1, B = -alpha; R2 cancels.
     */
    double squaresChange(int c, double alpha, double alphaNew, double a, double s) {
        int at = c * width;
        double n = sums[at];
        if (n == 0) {
            return 0;
        }
        double s1 = sums[at + 1];
        double s2 = sums[at + 2];
        double b = a - alphaNew;
        return (s - 1) * (s + 1) * s2 + 2 * s1 * (s * b + alpha) - 2 * (s - 1) * linearCross[c]
                + n * (b - alpha) * (b + alpha) - 2 * linearSum[c] * (b + alpha);
    }

    /** Maps every value of cell c by z -> a + s z. */
    void transform(int c, double a, double s) {
        int at = c * width;
        double n = sums[at];
        double s1 = sums[at + 1];
        sums[at + 2] = s * s * sums[at + 2] + 2 * a * s * s1 + n * a * a;
        sums[at + 1] = n * a + s * s1;
        linearCross[c] = a * linearSum[c] + s * linearCross[c];
        shift[c] = a + s * shift[c];
        scale[c] *= s;
    }

    /** Writes the latent sum per group and the cross-products with each covariate into the block. */
    void finish(RegressionBlock level, int categories) {
        int p = count;
        Arrays.fill(level.latentSum, 0);
        Arrays.fill(level.latentCross, 0);
        for (int c = 0; c < cells; c++) {
            int at = c * width;
            level.latentSum[c / categories] += sums[at + 1];
            for (int j = 0; j < p; j++) {
                level.latentCross[j] += shift[c] * sums[at + 3 + j] + scale[c] * sums[at + 3 + p + j];
            }
        }
    }
}
