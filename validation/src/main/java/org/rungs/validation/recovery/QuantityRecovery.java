package org.rungs.validation.recovery;

import java.util.List;
import org.apache.commons.math3.distribution.BinomialDistribution;
import org.rungs.posteriors.MonteCarloMean;

/**
 * How well one quantity was recovered over R replications, with the Monte Carlo standard errors
 * (MCSE) of Morris, White & Crowther (2019), "Using simulation studies to evaluate statistical
 * methods", Statistics in Medicine 38, table 6. With e_r = mean_r - truth_r (the truth may differ
 * between replications, e.g. a coefficient per internal unit follows the drawn covariate's sd):
 * <ul>
 * <li>bias = mean(e), MCSE = sd(e) / sqrt(R);
 * <li>RMSE = sqrt(MSE), MSE = mean(e^2); MCSE(MSE) = sd(e^2) / sqrt(R) (table 6), and by the
 * delta method, d sqrt(x)/dx = 1 / (2 sqrt(x)), MCSE(RMSE) = MCSE(MSE) / (2 RMSE);
 * <li>coverage p of the central 50% and 90% intervals, MCSE = sqrt(p (1 - p) / R).
 * </ul>
 * Sample sds divide by R - 1; with R = 1 the MCSEs are NaN.
 *
 * @param quantity         the quantity's name
 * @param replications     R, the replications that estimated it
 * @param truthMean        mean true value over the replications
 * @param bias             mean of posterior mean minus truth
 * @param biasMcse         its Monte Carlo standard error
 * @param rmse             root mean squared error of the posterior mean
 * @param rmseMcse         its Monte Carlo standard error (delta method)
 * @param coverage50       share of replications whose central 50% interval holds the truth
 * @param coverage50Mcse   its binomial standard error
 * @param coverage90       share whose central 90% interval holds the truth
 * @param coverage90Mcse   its binomial standard error
 * @param flagged          replications in which this quantity failed the rule of MODEL.md section 7
 * @param outside50        whether coverage50 lies outside the {@link #BAND_LEVEL} binomial band around 0.5
 * @param outside90        whether coverage90 lies outside the band around 0.9
 */
public record QuantityRecovery(String quantity, int replications, double truthMean, double bias, double biasMcse,
        double rmse, double rmseMcse, double coverage50, double coverage50Mcse, double coverage90,
        double coverage90Mcse, int flagged, boolean outside50, boolean outside90) {

    /**
     * Level of the band a quantity's coverage is judged by: the central range of Binomial(R, p)/R
     * holding at least this probability, so that intervals of exact coverage p leave it with
     * probability at most 1 - level (about one quantity in a hundred).
     */
    public static final double BAND_LEVEL = 0.99;

    /** The figures of one quantity over its replications (all of the same quantity). */
    public static QuantityRecovery of(List<QuantityEstimate> estimates) {
        int r = estimates.size();
        if (r == 0) {
            throw new IllegalArgumentException("no replication estimated this quantity");
        }
        double[] error = new double[r];
        double[] squared = new double[r];
        double truth = 0;
        int covered50 = 0;
        int covered90 = 0;
        int flagged = 0;
        for (int i = 0; i < r; i++) {
            QuantityEstimate e = estimates.get(i);
            error[i] = e.mean() - e.truth();
            squared[i] = error[i] * error[i];
            truth += e.truth();
            covered50 += e.covered50() ? 1 : 0;
            covered90 += e.covered90() ? 1 : 0;
            flagged += e.flagged() ? 1 : 0;
        }
        double bias = MonteCarloMean.mean(error);
        double mse = MonteCarloMean.mean(squared);
        double rmse = Math.sqrt(mse);
        double p50 = (double) covered50 / r;
        double p90 = (double) covered90 / r;
        return new QuantityRecovery(estimates.get(0).quantity(), r, truth / r, bias, MonteCarloMean.standardError(error),
                rmse, MonteCarloMean.standardError(squared) / (2 * rmse), p50, binomialError(p50, r), p90, binomialError(p90, r),
                flagged, outside(covered50, r, 0.5), outside(covered90, r, 0.9));
    }

    /** Whether {@code covered} of {@code r} lies outside the central {@link #BAND_LEVEL} range of Binomial(r, nominal). */
    public static boolean outside(int covered, int r, double nominal) {
        int[] band = band(r, nominal);
        return covered < band[0] || covered > band[1];
    }

    /**
     * The counts {lower, upper} with P(X &lt; lower) &lt;= (1 - level)/2 and P(X &gt; upper) &lt;= (1 - level)/2,
     * X ~ Binomial(r, nominal).
     */
    public static int[] band(int r, double nominal) {
        BinomialDistribution x = new BinomialDistribution(null, r, nominal);
        double tail = (1 - BAND_LEVEL) / 2;
        return new int[] {x.inverseCumulativeProbability(tail), x.inverseCumulativeProbability(1 - tail)};
    }

    private static double binomialError(double p, int r) {
        return Math.sqrt(p * (1 - p) / r);
    }
}
