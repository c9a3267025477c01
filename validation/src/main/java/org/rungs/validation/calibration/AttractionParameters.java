package org.rungs.validation.calibration;

import java.util.List;
import java.util.Map;

/**
 * Number attraction drawn from the prior (MODEL.md 4b and 5).
 *
 * @param numbers    the attraction set A as ratings, increasing
 * @param mean       abar[j] for the numbers of A in their order
 * @param sd         tau_a (NaN with one group)
 * @param attraction a[g][j] = abar[j] + t[g,j], t ~ Normal(0, tau_a); abar itself with one group
 */
record AttractionParameters(int[] numbers, double[] mean, double sd, double[][] attraction) {

    /** Adds the engine's names: {@code attraction.<j>}, {@code attraction_sd}, {@code attraction.<label>.<j>}. */
    void name(List<String> groupLabels, Map<String, Double> named) {
        for (int j = 0; j < numbers.length; j++) {
            named.put("attraction." + numbers[j], mean[j]);
        }
        if (attraction.length > 1) {
            named.put("attraction_sd", sd);
            for (int g = 0; g < attraction.length; g++) {
                for (int j = 0; j < numbers.length; j++) {
                    named.put("attraction." + groupLabels.get(g) + "." + numbers[j], attraction[g][j]);
                }
            }
        }
    }
}
