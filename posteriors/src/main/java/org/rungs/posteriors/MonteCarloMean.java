package org.rungs.posteriors;

/**
 * The mean of independent (or batch-mean) values and its standard error, sd / sqrt(n) with the
 * sd's denominator n - 1: the Monte Carlo error of a recovery study's averages over replications
 * (Morris, White & Crowther 2019) and of batch means of a chain (Flegal & Jones 2010, from memory).
 */
public final class MonteCarloMean {
    private MonteCarloMean() {
    }

    public static double mean(double[] values) {
        double sum = 0;
        for (double v : values) {
            sum += v;
        }
        return sum / values.length;
    }

    public static double standardError(double[] values) {
        int n = values.length;
        double mean = mean(values);
        double sum = 0;
        for (double v : values) {
            sum += (v - mean) * (v - mean);
        }
        return Math.sqrt(sum / (n - 1) / n);
    }
}
