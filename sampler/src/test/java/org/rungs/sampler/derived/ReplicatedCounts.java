package org.rungs.sampler.derived;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.rungs.posteriors.Draws;

/** The posterior predictive check's replicated counts against their expectation, for the tests of the derived quantities. */
final class ReplicatedCounts {
    private ReplicatedCounts() {
    }

    /**
     * Asserts that the mean over {@code draws} draws (chain 0) of each "replicated.LABEL.k" column
     * equals {@code mean[k]}, within 5 standard errors: a count of independent answers has
     * variance {@code variance[k]} (the sum of p (1 - p) over the respondents), so its mean over
     * the draws has standard error sqrt(variance[k] / draws). Returns the standard errors.
     */
    static double[] assertMeans(Draws d, String label, double[] mean, double[] variance, int draws) {
        double[] standardError = new double[mean.length];
        for (int k = 0; k < mean.length; k++) {
            int column = d.indexOf("replicated." + label + "." + k);
            double sum = 0;
            for (int t = 0; t < draws; t++) {
                sum += d.get(column, 0, t);
            }
            standardError[k] = Math.sqrt(variance[k] / draws);
            assertEquals(mean[k], sum / draws, 5 * standardError[k], label + " rating " + k);
        }
        return standardError;
    }
}
