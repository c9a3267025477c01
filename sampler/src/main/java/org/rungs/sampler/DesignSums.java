package org.rungs.sampler;

import org.rungs.models.survey.Survey;

/**
 * Data-only sums of the latent-level regression design [group indicators | covariates], computed
 * once and shared by every chain: because the latent sd is fixed at 1, the Gram matrix of the
 * conjugate update (Albert & Chib 1993, eq. 6) never changes.
 */
record DesignSums(int[] groupSizes, double[][] groupCovariateSums, double[][] covariateGram) {

    static DesignSums of(Survey survey) {
        int n = survey.size();
        int groups = survey.groupCount();
        int p = survey.level().count();
        int[] group = survey.group();
        int[] sizes = new int[groups];
        double[][] groupSums = new double[groups][p];
        double[][] gram = new double[p][p];
        for (int i = 0; i < n; i++) {
            sizes[group[i]]++;
        }
        for (int j = 0; j < p; j++) {
            double[] xj = survey.level().column(j);
            for (int i = 0; i < n; i++) {
                groupSums[group[i]][j] += xj[i];
            }
            for (int k = 0; k <= j; k++) {
                double[] xk = survey.level().column(k);
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
