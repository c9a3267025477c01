package org.rungs.validation.calibration;

import java.util.List;
import java.util.Map;

/**
 * Parameters of the coarse class drawn from the prior (MODEL.md 4), on the internal scale.
 *
 * @param delta style coefficients per standardised style covariate
 * @param mean  mu_gamma
 * @param sd    tau_gamma (NaN with one group)
 * @param gamma group intercepts gamma[g] = mu_gamma + tau_gamma v[g]
 */
record StyleParameters(double[] delta, double mean, double sd, double[] gamma) {

    /** Adds the engine's names: {@code style.<cov>}, {@code style_mean}, {@code style_sd}, {@code style_group.<label>}. */
    void name(List<String> covariateNames, List<String> groupLabels, Map<String, Double> named) {
        for (int j = 0; j < delta.length; j++) {
            named.put("style." + covariateNames.get(j), delta[j]);
        }
        named.put("style_mean", mean);
        if (gamma.length > 1) {
            named.put("style_sd", sd);
            for (int g = 0; g < gamma.length; g++) {
                named.put("style_group." + groupLabels.get(g), gamma[g]);
            }
        }
    }

    /** The probit of respondent i's coarse probability, gamma[g] + w_i' delta (MODEL.md 4). */
    static double linear(double[] gamma, double[] delta, double[][] w, int g, int i) {
        double v = gamma[g];
        for (int j = 0; j < w.length; j++) {
            v += w[j][i] * delta[j];
        }
        return v;
    }
}
