package org.rungs.validation.calibration;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * Parameters drawn from the prior, on the engine's internal scale (MODEL.md sections 2 and 3).
 *
 * @param beta            level coefficients per standardised covariate
 * @param groupMean       mu_alpha
 * @param groupSd         tau_alpha (NaN with one group)
 * @param alpha           group levels alpha[g]
 * @param common          common thresholds c[1..M-1], summing to zero
 * @param thresholdSd     tau_d (NaN unless thresholds vary by group)
 * @param groupThresholds c[g,1..M-1] per group; the common ones in shared mode
 * @param byGroup         whether thresholds vary by group
 */
record TrueParameters(double[] beta, double groupMean, double groupSd, double[] alpha, double[] common,
        double thresholdSd, double[][] groupThresholds, boolean byGroup) {

    /**
     * The values under the engine's parameter names: {@code level.<cov>}, {@code group_mean},
     * {@code group_sd}, {@code group.<label>}, {@code threshold.<k>}, {@code threshold_sd},
     * {@code threshold.<label>.<k>}, with k the rating at and above which the threshold lies.
     */
    Map<String, Double> named(List<String> covariateNames, List<String> groupLabels, int lowest) {
        Map<String, Double> named = new LinkedHashMap<>();
        for (int j = 0; j < beta.length; j++) {
            named.put("level." + covariateNames.get(j), beta[j]);
        }
        named.put("group_mean", groupMean);
        if (alpha.length > 1) {
            named.put("group_sd", groupSd);
            for (int g = 0; g < alpha.length; g++) {
                named.put("group." + groupLabels.get(g), alpha[g]);
            }
        }
        for (int k = 0; k < common.length; k++) {
            named.put("threshold." + (lowest + 1 + k), common[k]);
        }
        if (byGroup) {
            named.put("threshold_sd", thresholdSd);
            for (int g = 0; g < alpha.length; g++) {
                for (int k = 0; k < common.length; k++) {
                    named.put("threshold." + groupLabels.get(g) + "." + (lowest + 1 + k), groupThresholds[g][k]);
                }
            }
        }
        return named;
    }
}
