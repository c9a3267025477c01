package org.rungs.sampler;

/**
 * Data-only sums of a latent regression's design [group indicators | covariates], computed once
 * per chain: because the latent sd is fixed at 1, the Gram matrix of the conjugate update
 * (Albert & Chib 1993, eq. 6) never changes.
 */
record DesignSums(int[] groupSizes, double[][] groupCovariateSums, double[][] covariateGram) {

    static DesignSums of(int[] group, int groups, double[][] columns) {
        int n = group.length;
        int p = columns.length;
        int[] sizes = new int[groups];
        double[][] groupSums = new double[groups][p];
        double[][] gram = new double[p][p];
        for (int i = 0; i < n; i++) {
            sizes[group[i]]++;
        }
        for (int j = 0; j < p; j++) {
            double[] xj = columns[j];
            for (int i = 0; i < n; i++) {
                groupSums[group[i]][j] += xj[i];
            }
            for (int k = 0; k <= j; k++) {
                double[] xk = columns[k];
                double s = 0;
                for (int i = 0; i < n; i++) {
                    s += xj[i] * xk[i];
                }
                gram[j][k] = s;
                gram[k][j] = s;
            }
        }
        return new DesignSums(sizes, groupSums, gram);
    }
}
