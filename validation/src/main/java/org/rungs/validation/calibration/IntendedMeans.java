package org.rungs.validation.calibration;

import java.util.Arrays;
import org.rungs.priors.StandardNormal;

/**
 * The intended mean rating of each group (MODEL.md section 6, unweighted):
 * {@code sum_k k p_int[g,k]} with {@code p_int[g,k]} the group's average of
 * {@code Phi(c[g,k] - eta_i) - Phi(c[g,k-1] - eta_i)}. A derived quantity calibrated beside the
 * parameters: it mixes levels, coefficients and thresholds nonlinearly.
 */
final class IntendedMeans {
    private IntendedMeans() {
    }

    /**
     * @param thresholds c[g,1..M-1] per group
     * @param x          internal covariates [covariate][respondent]
     * @param lowest     the lowest rating L
     * @param out        receives one mean per group
     */
    static void of(double[] beta, double[] alpha, double[][] thresholds, double[][] x, int[] group, int lowest,
            double[] out) {
        int groups = alpha.length;
        double[] sum = out;
        Arrays.fill(sum, 0);
        int[] count = new int[groups];
        for (int i = 0; i < group.length; i++) {
            int g = group[i];
            double eta = alpha[g];
            for (int j = 0; j < x.length; j++) {
                eta += x[j][i] * beta[j];
            }
            // E[k] = L + sum_k P(rating > k-th threshold) = L + sum_k (1 - Phi(c_k - eta))
            double expected = lowest;
            for (double c : thresholds[g]) {
                expected += StandardNormal.upperTail(c - eta);
            }
            sum[g] += expected;
            count[g]++;
        }
        for (int g = 0; g < groups; g++) {
            sum[g] /= count[g];
        }
    }
}
