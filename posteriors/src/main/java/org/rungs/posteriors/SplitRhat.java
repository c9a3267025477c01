package org.rungs.posteriors;

/**
 * Potential scale reduction of Gelman and Rubin (1992) over split chains, Vehtari et al. (2021)
 * eqs. 1-4: {@code sqrt(((n - 1)/n W + B/n) / W)}, following posterior 1.4.0 ({@code .rhat}).
 */
final class SplitRhat {
    private SplitRhat() {
    }

    /** R-hat of {@code x}, chain after chain; NaN as posterior's NA (short, non-finite or constant). */
    static double of(double[] x, int chains, int length) {
        int n = length;
        if (n < 2 || chains < 2 || DrawStatistics.shouldReturnNaN(x, chains * n)) {
            return Double.NaN;
        }
        // Welford's running mean and sum of squares over the chain means
        double meanOfMeans = 0;
        double squaresOfMeans = 0;
        double sumOfVariances = 0;
        for (int c = 0; c < chains; c++) {
            int base = c * n;
            double sum = 0;
            for (int i = base; i < base + n; i++) {
                sum += x[i];
            }
            double chainMean = sum / n;
            double squares = 0;
            for (int i = base; i < base + n; i++) {
                double d = x[i] - chainMean;
                squares += d * d;
            }
            sumOfVariances += squares / (n - 1);
            double delta = chainMean - meanOfMeans;
            meanOfMeans += delta / (c + 1);
            squaresOfMeans += delta * (chainMean - meanOfMeans);
        }
        double between = n * squaresOfMeans / (chains - 1);
        double within = sumOfVariances / chains;
        return Math.sqrt((between / within + n - 1) / n);
    }
}
