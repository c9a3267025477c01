package org.rungs.validation.calibration;

import org.apache.commons.math3.special.Gamma;

/**
 * Pearson's chi-square test that ranks 0..L are uniform, on B bins of consecutive ranks
 * (Talts et al. 2018, section 4.1 suggests binned rank histograms). Bin b holds ranks
 * floor(b(L+1)/B) .. floor((b+1)(L+1)/B) - 1 and expects N times its share of the L+1 values,
 * so bins need not be of equal width.
 *
 * @param statistic sum over bins of (observed - expected)^2 / expected
 * @param df        B - 1
 * @param p         upper tail of the chi-square distribution with df degrees of freedom
 * @param observed  counts per bin
 * @param expected  expected counts per bin
 */
public record ChiSquareUniformity(double statistic, int df, double p, int[] observed, double[] expected) {

    /** Expected count per bin aimed at: 5, a common rule of thumb for the chi-square approximation (common practice, no source). */
    static final int MIN_EXPECTED = 5;
    /** At most 20 bins: finer bins add little power against the smooth departures SBC shows. */
    static final int MAX_BINS = 20;

    /** B = N/5 within 2..min(20, L+1). */
    public static int bins(int samples, int rankDraws) {
        return Math.max(2, Math.min(Math.min(MAX_BINS, rankDraws + 1), samples / MIN_EXPECTED));
    }

    /** @param histogram counts of ranks 0..L */
    public static ChiSquareUniformity of(int[] histogram, int bins) {
        int values = histogram.length;
        int n = 0;
        for (int c : histogram) {
            n += c;
        }
        int[] observed = new int[bins];
        double[] expected = new double[bins];
        double statistic = 0;
        for (int b = 0; b < bins; b++) {
            int from = (int) ((long) b * values / bins);
            int to = (int) ((long) (b + 1) * values / bins);
            for (int r = from; r < to; r++) {
                observed[b] += histogram[r];
            }
            expected[b] = (double) n * (to - from) / values;
            double d = observed[b] - expected[b];
            statistic += d * d / expected[b];
        }
        // upper tail Q(df/2, x/2) directly: 1 - cdf would round tiny p to 0
        double p = Gamma.regularizedGammaQ((bins - 1) / 2.0, statistic / 2);
        return new ChiSquareUniformity(statistic, bins - 1, p, observed, expected);
    }
}
