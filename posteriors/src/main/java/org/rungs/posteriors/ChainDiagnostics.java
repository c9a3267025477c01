package org.rungs.posteriors;

import java.util.Arrays;
import org.apache.commons.math3.distribution.BetaDistribution;
import org.apache.commons.math3.distribution.ChiSquaredDistribution;

/**
 * The diagnostics of Vehtari et al. (2021) for one draw shape (chains x iterations), with the
 * work buffers they need, so that summarising many parameters reuses them.
 * Draws come flat, chain after chain. Chains are split in halves as in posterior 1.4.0: for an
 * odd length the middle iteration is dropped. Not thread-safe: one instance per thread.
 */
final class ChainDiagnostics {
    private static final double TAIL_LOWER = 0.05;
    private static final double TAIL_UPPER = 0.95;
    /** posterior's .mcse_quantile: pnorm(-1) and pnorm(1) rounded to 7 digits. */
    private static final double MCSE_LOWER = 0.1586553;
    private static final double MCSE_UPPER = 0.8413447;
    private static final double BETA_INVERSE_ACCURACY = 1e-15;

    private final int chains;
    private final int iterations;
    private final int draws;
    private final int half;
    private final int splitDraws;
    private final double[] sorted;
    private final double[] split;
    private final double[] splitSorted;
    private final double[] scores;
    private final double[] work;
    private final RankNormalization ranks = new RankNormalization();
    private final EffectiveSampleSize ess;
    /** Between-chain spread of stationary split chains' means over its expectation, times (chains - 1). */
    private final ChiSquaredDistribution spread;

    ChainDiagnostics(int chains, int iterations) {
        if (chains < 1 || iterations < 1) {
            throw new IllegalArgumentException("diagnostics need at least one chain and one iteration, got "
                    + chains + " x " + iterations);
        }
        this.chains = chains;
        this.iterations = iterations;
        this.draws = chains * iterations;
        this.half = iterations / 2;
        this.splitDraws = 2 * chains * half;
        this.sorted = new double[draws];
        this.split = new double[splitDraws];
        this.splitSorted = new double[splitDraws];
        this.scores = new double[splitDraws];
        this.work = new double[draws];
        this.ess = new EffectiveSampleSize(2 * chains, half);
        this.spread = new ChiSquaredDistribution(null, Math.max(1, 2 * chains - 1));
    }

    /** Rank-normalised split R-hat, eq. 14 with eqs. 1-4. */
    double rhatBulk(double[] x) {
        if (containsNaN(x, draws)) {
            return Double.NaN;
        }
        splitNormalScores(x);
        return SplitRhat.of(scores, 2 * chains, half);
    }

    /** Rank-normalised split R-hat of the draws folded around their median, |x - median|. */
    double rhatTail(double[] x) {
        if (containsNaN(x, draws)) {
            return Double.NaN;
        }
        sortDraws(x);
        splitNormalScores(x);
        return rhatTailOfSplitScores();
    }

    /**
     * The chance of an R-hat at least this high if every chain drew from the posterior itself:
     * the smaller of the bulk and tail chances, made a chance for the pair (1 - (1 - p)^2).
     * See {@link #chance(double, double)}.
     */
    double rhatChance(double[] x) {
        if (containsNaN(x, draws)) {
            return Double.NaN;
        }
        splitNormalScores(x);
        double bulk = chance(SplitRhat.of(scores, 2 * chains, half), ess.withinChains(scores));
        sortDraws(x);
        double rhatTail = rhatTailOfSplitScores();
        double tail = Double.isNaN(rhatTail) ? Double.NaN : chance(rhatTail, ess.withinChains(scores));
        return eitherChance(bulk, tail);
    }

    /** Bulk ESS: ESS of the rank-normalised split chains. */
    double essBulk(double[] x) {
        if (containsNaN(x, draws)) {
            return Double.NaN;
        }
        splitNormalScores(x);
        return ess.of(scores);
    }

    /** Tail ESS: the smaller ESS of the indicators at the 5% and 95% quantiles. */
    double essTail(double[] x) {
        sortDraws(x);
        return essTailOfSorted(x);
    }

    /** ESS of the split chains of the raw draws (posterior's ess_mean). */
    double essMean(double[] x) {
        splitCopy(x);
        return ess.of(split);
    }

    /** ESS of the indicator I(x <= q) at the type-7 quantile q of {@code prob} (eq. 17). */
    double essQuantile(double[] x, double prob) {
        checkProbability(prob);
        sortDraws(x);
        return essQuantileOfSorted(x, prob);
    }

    /** sd / sqrt(ESS of the mean). */
    double mcseMean(double[] x) {
        double sd = Math.sqrt(DrawStatistics.sampleVariance(x, draws));
        return sd / Math.sqrt(essMean(x));
    }

    /** Delta-method MCSE of the sd from the ESS of the squared centred draws (posterior 1.4.0's mcse_sd). */
    double mcseSd(double[] x) {
        double mean = DrawStatistics.mean(x, draws);
        for (int i = 0; i < draws; i++) {
            double d = x[i] - mean;
            work[i] = d * d;
        }
        double essOfSquares = essMean(work);
        double expectedSquare = DrawStatistics.mean(work, draws);
        double fourth = 0;
        for (int i = 0; i < draws; i++) {
            fourth += work[i] * work[i];
        }
        fourth /= draws;
        double varianceOfVariance = (fourth - expectedSquare * expectedSquare) / essOfSquares;
        return Math.sqrt(varianceOfVariance / expectedSquare / 4);
    }

    /**
     * Half the width of the interval of order statistics covering the quantile with probability
     * about 68%, from a Beta(ESS p + 1, ESS (1 - p) + 1) on the quantile's rank (section 4.3).
     */
    double mcseQuantile(double[] x, double prob) {
        checkProbability(prob);
        sortDraws(x);
        return mcseQuantileOfSorted(x, prob);
    }

    /** All figures of one parameter's summary, sharing the sorted draws between them. */
    ParameterSummary summarize(String name, double[] x) {
        boolean hasNaN = containsNaN(x, draws);
        double rhatBulk = Double.NaN;
        double essBulk = Double.NaN;
        double chanceBulk = Double.NaN;
        if (!hasNaN) {
            splitNormalScores(x);
            rhatBulk = SplitRhat.of(scores, 2 * chains, half);
            essBulk = ess.of(scores);
            chanceBulk = chance(rhatBulk, ess.withinChains(scores));
        }
        if (!hasNaN && splitDraws == draws) {
            // an even chain length splits without dropping a draw: the ranking already sorted them
            System.arraycopy(splitSorted, 0, sorted, 0, draws);
        } else {
            sortDraws(x);
        }
        double mean;
        double sd;
        if (sorted[0] == sorted[draws - 1]) {
            mean = sorted[0];
            sd = draws > 1 ? 0 : Double.NaN;
        } else {
            mean = DrawStatistics.mean(x, draws);
            sd = Math.sqrt(DrawStatistics.sampleVariance(x, draws, mean));
        }
        double q05 = hasNaN ? Double.NaN : DrawStatistics.quantileType7(sorted, draws, TAIL_LOWER);
        double q50 = hasNaN ? Double.NaN : DrawStatistics.quantileType7(sorted, draws, 0.5);
        double q95 = hasNaN ? Double.NaN : DrawStatistics.quantileType7(sorted, draws, TAIL_UPPER);
        double rhatTail = hasNaN ? Double.NaN : rhatTailOfSplitScores();
        double chanceTail = Double.isNaN(rhatTail) ? Double.NaN : chance(rhatTail, ess.withinChains(scores));
        double essTail = essTailOfSorted(x);
        double mcseMean = sd / Math.sqrt(essMean(x));
        return ParameterSummary.of(name, mean, sd, q05, q50, q95, Math.max(rhatBulk, rhatTail),
                essBulk, essTail, mcseMean, eitherChance(chanceBulk, chanceTail), chains);
    }

    /**
     * P(R-hat >= rhat) for split chains that all draw from one stationary distribution, after
     * Gelman & Rubin (1992, section 3), who judged R-hat against the sampling distribution of its
     * between- and within-chain variances: the split chains' means then vary with variance
     * W tau / n, tau the integrated autocorrelation time, so (chains - 1) (B / W) / tau, with
     * B / W = n rhat^2 - (n - 1) from eq. 3 of Vehtari et al. (2021), is about chi-square with
     * chains - 1 degrees of freedom. tau comes from the within-chain autocorrelations alone
     * ({@link EffectiveSampleSize#withinChains}), so disagreeing chains cannot lower the statistic.
     * Checked on simulated stationary chains in {@code RhatChanceTest}: calibrated while the
     * chains' ESS is in the hundreds, smaller than nominal (so stricter) for chains that mix
     * very slowly, whose ESS is flagged anyway.
     */
    private double chance(double rhat, double essWithin) {
        int m = 2 * chains;
        if (m < 2 || Double.isNaN(rhat) || !(essWithin > 0)) {
            return Double.NaN;
        }
        int n = half;
        double ratio = n * rhat * rhat - (n - 1);
        double tau = (double) m * n / essWithin;
        return 1 - spread.cumulativeProbability(Math.max(0, (m - 1) * ratio / tau));
    }

    /** The chance that at least one of two tests gives a p-value this small: 1 - (1 - min)^2; NaN only if both are. */
    private static double eitherChance(double a, double b) {
        if (Double.isNaN(a)) {
            return b;
        }
        if (Double.isNaN(b)) {
            return a;
        }
        double min = Math.min(a, b);
        return 1 - (1 - min) * (1 - min);
    }

    /**
     * Tail R-hat from the folded split draws; needs {@code sorted} (all draws) and the bulk
     * ranking of the split draws done just before.
     */
    private double rhatTailOfSplitScores() {
        double median = DrawStatistics.median(sorted, draws);
        // posterior folds infinite draws around an infinite median to NaN, and returns NA
        if (!Double.isFinite(median)) {
            return Double.NaN;
        }
        ranks.foldedScores(splitSorted, splitDraws, median, scores);
        return SplitRhat.of(scores, 2 * chains, half);
    }

    private double essTailOfSorted(double[] x) {
        return Math.min(essQuantileOfSorted(x, TAIL_LOWER), essQuantileOfSorted(x, TAIL_UPPER));
    }

    private double essQuantileOfSorted(double[] x, double prob) {
        if (DrawStatistics.shouldReturnNaN(x, draws)) {
            return Double.NaN;
        }
        // posterior moves prob = 1 inside the range so that the indicator is not constant
        double p = prob == 1 ? (draws - 0.5) / draws : prob;
        double quantile = DrawStatistics.quantileType7(sorted, draws, p);
        splitCopy(x);
        for (int i = 0; i < splitDraws; i++) {
            split[i] = split[i] <= quantile ? 1 : 0;
        }
        return ess.of(split);
    }

    private double mcseQuantileOfSorted(double[] x, double prob) {
        double essOfQuantile = essQuantileOfSorted(x, prob);
        if (Double.isNaN(essOfQuantile)) {
            return Double.NaN;
        }
        BetaDistribution rankShare = new BetaDistribution(null, essOfQuantile * prob + 1,
                essOfQuantile * (1 - prob) + 1, BETA_INVERSE_ACCURACY);
        double lower = rankShare.inverseCumulativeProbability(MCSE_LOWER);
        double upper = rankShare.inverseCumulativeProbability(MCSE_UPPER);
        int first = Math.max((int) Math.floor(lower * draws), 1);
        int last = Math.min((int) Math.ceil(upper * draws), draws);
        return (sorted[last - 1] - sorted[first - 1]) / 2;
    }

    /** Normal scores of the split chains into {@code scores}. */
    private void splitNormalScores(double[] x) {
        splitCopy(x);
        ranks.scores(split, splitDraws, splitSorted, scores);
    }

    /** Chain c becomes split chains 2c (first half) and 2c + 1 (second half). */
    private void splitCopy(double[] x) {
        for (int c = 0; c < chains; c++) {
            int from = c * iterations;
            System.arraycopy(x, from, split, 2 * c * half, half);
            System.arraycopy(x, from + iterations - half, split, (2 * c + 1) * half, half);
        }
    }

    private void sortDraws(double[] x) {
        System.arraycopy(x, 0, sorted, 0, draws);
        Arrays.sort(sorted);
    }

    private static boolean containsNaN(double[] x, int size) {
        for (int i = 0; i < size; i++) {
            if (Double.isNaN(x[i])) {
                return true;
            }
        }
        return false;
    }

    private static void checkProbability(double prob) {
        if (!(prob >= 0 && prob <= 1)) {
            throw new IllegalArgumentException("a quantile probability must lie in [0, 1], got " + prob);
        }
    }
}
