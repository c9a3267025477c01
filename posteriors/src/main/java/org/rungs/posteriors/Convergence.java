package org.rungs.posteriors;

/**
 * Convergence diagnostics of Vehtari, Gelman, Simpson, Carpenter and Burkner (2021),
 * "Rank-normalization, folding, and localization: an improved R-hat for assessing convergence
 * of MCMC", Bayesian Analysis 16(2), with the conventions of the R package posterior 1.4.0.
 * Each function takes draws as {@code draws[chain][iteration]} (all chains of equal length) and
 * returns NaN where posterior returns NA: constant draws, non-finite draws (except rank-based
 * R-hat and bulk ESS, which stay defined under infinite draws), or chains too short to split.
 */
public final class Convergence {
    private Convergence() {
    }

    /** The larger of the bulk and tail R-hat (section 4.2). */
    public static double rhat(double[][] draws) {
        ChainDiagnostics diagnostics = diagnosticsFor(draws);
        double[] x = flatten(draws);
        return Math.max(diagnostics.rhatBulk(x), diagnostics.rhatTail(x));
    }

    /** Split R-hat of the rank-normalised draws (eq. 14). */
    public static double rhatBulk(double[][] draws) {
        return diagnosticsFor(draws).rhatBulk(flatten(draws));
    }

    /** Split R-hat of the rank-normalised draws folded around the median (section 4.2). */
    public static double rhatTail(double[][] draws) {
        return diagnosticsFor(draws).rhatTail(flatten(draws));
    }

    /**
     * The chance that chains drawing from the posterior itself give an R-hat at least as high as
     * {@link #rhat}, at these chains' autocorrelations (after Gelman & Rubin 1992; see
     * {@code ChainDiagnostics}): a small chance says the chains disagree, a large one that an
     * R-hat a little above 1.01 is what this many effective draws give.
     */
    public static double rhatChance(double[][] draws) {
        return diagnosticsFor(draws).rhatChance(flatten(draws));
    }

    /** ESS of the rank-normalised split chains (section 4.1). */
    public static double essBulk(double[][] draws) {
        return diagnosticsFor(draws).essBulk(flatten(draws));
    }

    /** Minimum of the quantile ESS at 5% and 95% (section 4.3). */
    public static double essTail(double[][] draws) {
        return diagnosticsFor(draws).essTail(flatten(draws));
    }

    /** ESS of the split chains of the raw draws, the one behind the MCSE of the mean. */
    public static double essMean(double[][] draws) {
        return diagnosticsFor(draws).essMean(flatten(draws));
    }

    /** ESS of the indicator of draws at most the {@code prob} quantile (eq. 17). */
    public static double essQuantile(double[][] draws, double prob) {
        return diagnosticsFor(draws).essQuantile(flatten(draws), prob);
    }

    /** Monte Carlo standard error of the mean: sd / sqrt(essMean). */
    public static double mcseMean(double[][] draws) {
        return diagnosticsFor(draws).mcseMean(flatten(draws));
    }

    /** Monte Carlo standard error of the sd, by the delta method as posterior 1.4.0's mcse_sd. */
    public static double mcseSd(double[][] draws) {
        return diagnosticsFor(draws).mcseSd(flatten(draws));
    }

    /** Monte Carlo standard error of the {@code prob} quantile (section 4.3). */
    public static double mcseQuantile(double[][] draws, double prob) {
        return diagnosticsFor(draws).mcseQuantile(flatten(draws), prob);
    }

    static ChainDiagnostics diagnosticsFor(double[][] draws) {
        if (draws.length == 0) {
            throw new IllegalArgumentException("draws need at least one chain");
        }
        return new ChainDiagnostics(draws.length, draws[0].length);
    }

    /** Chain after chain in one array; rejects chains of unequal length. */
    static double[] flatten(double[][] draws) {
        int iterations = draws[0].length;
        double[] flat = new double[draws.length * iterations];
        for (int c = 0; c < draws.length; c++) {
            if (draws[c].length != iterations) {
                throw new IllegalArgumentException("all chains need the same length: chain 0 has " + iterations
                        + " draws, chain " + c + " has " + draws[c].length);
            }
            System.arraycopy(draws[c], 0, flat, c * iterations, iterations);
        }
        return flat;
    }
}
