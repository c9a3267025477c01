package org.rungs.sampler;

/**
 * The mean of batch means and its Monte Carlo standard error, sd of the batch means over the
 * square root of their number (Flegal & Jones 2010, batch means for MCMC standard errors, from
 * memory): the tolerance of the tests that compare a chain's averages with an exact value or
 * with another chain's.
 */
final class BatchMeans {
    private BatchMeans() {
    }

    static double mean(double[] batches) {
        double sum = 0;
        for (double v : batches) {
            sum += v;
        }
        return sum / batches.length;
    }

    static double standardError(double[] batches) {
        double m = mean(batches);
        double v = 0;
        for (double b : batches) {
            v += (b - m) * (b - m) / (batches.length - 1);
        }
        return Math.sqrt(v / batches.length);
    }
}
