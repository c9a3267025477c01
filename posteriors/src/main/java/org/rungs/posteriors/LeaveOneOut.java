package org.rungs.posteriors;

import java.util.Arrays;
import org.apache.commons.math3.special.Erf;

/**
 * Leave-one-out predictive accuracy of one observation from its log-likelihood at S posterior
 * draws, by Pareto-smoothed importance sampling (PSIS-LOO): Vehtari, Gelman & Gabry (2017),
 * Practical Bayesian model evaluation using leave-one-out cross-validation and WAIC, Statistics
 * and Computing 27, eqs. 4 to 10; the smoothing of the largest ratios by Vehtari, Simpson,
 * Gelman, Yao & Gabry (2024), Pareto smoothed importance sampling, JMLR 25(72), section 3; the
 * generalized Pareto fit of Zhang & Stephens (2009), A new and efficient estimation method for
 * the generalized Pareto distribution, Technometrics 51, section 4, with the weak prior that
 * pulls k towards 0.5 (equation and section numbers from memory). Tail length, grid, prior,
 * truncation and Monte Carlo error follow package
 * loo 2.5.1 ({@code do_psis_i}, {@code gpdfit}, {@code pointwise_loo_calcs}, {@code mcse_elpd}),
 * and {@code LeaveOneOutReferenceTest} holds the results to its values.
 *
 * <p>The importance ratios are 1 / p(y_i | theta_s), so a draw's log ratio is minus its
 * log-likelihood, and the draws can be put in order of their ratios without carrying an index.
 * One instance per worker: the buffers are allocated once and {@link #evaluate} allocates
 * nothing.
 */
public final class LeaveOneOut {
    /**
     * Pareto k at most this is good; above {@link #RELIABLE_K} the importance sampling is
     * unreliable (the thresholds of loo 2.5.1's diagnostic table; Vehtari, Gelman & Gabry 2017,
     * section 2.1, from memory).
     */
    public static final double GOOD_K = 0.5;
    public static final double RELIABLE_K = 0.7;
    /** Fewer tail draws than this leave the ratios unsmoothed and k infinite (loo's {@code enough_tail_samples}). */
    private static final int MIN_TAIL = 5;
    /** The fit's grid has this many points plus sqrt(tail length) (loo's {@code min_grid_pts}). */
    private static final int MIN_GRID = 30;
    /** The prior's weight in the grid's spacing, and the pseudo-observations pulling k towards 1/2. */
    private static final double GRID_PRIOR = 3;
    private static final double K_PRIOR_WEIGHT = 10;
    /** Normal quantiles at which {@code mcse_elpd} evaluates the log of the predictive density. */
    private static final int MCSE_POINTS = 1000;
    private static final double[] MCSE_QUANTILES = mcseQuantiles();

    private final int draws;
    /** The shifted log ratios in increasing order; the log weights beside them; their sum with the log-likelihood. */
    private final double[] raw;
    private final double[] weight;
    private final double[] joint;
    private final double[] tailExcess;
    /** The logs of the normal's points in {@link #mcse}. */
    private final double[] logPoint = new double[MCSE_POINTS];
    private final double[] grid;
    private final double[] gridLogLikelihood;
    /** exp(ll - max ll), chain after chain, for the relative efficiency. */
    private final double[] likelihood;
    private final EffectiveSampleSize ess;
    private double elpd;
    private double lpd;
    private double paretoK;
    private double mcse;
    private double relativeEfficiency;

    /** For S = chains x perChain draws, chain after chain. */
    public LeaveOneOut(int chains, int perChain) {
        this.draws = chains * perChain;
        this.raw = new double[draws];
        this.weight = new double[draws];
        this.joint = new double[draws];
        this.tailExcess = new double[draws];
        this.grid = new double[MIN_GRID + (int) Math.floor(Math.sqrt(draws))];
        this.gridLogLikelihood = new double[grid.length];
        this.likelihood = new double[draws];
        this.ess = new EffectiveSampleSize(chains, perChain);
    }

    /**
     * Evaluates the observation whose log-likelihood at draw s is {@code logLikelihood[s]}, the
     * draws chain after chain; its relative efficiency r_eff is the ESS of the likelihood over S
     * (loo's {@code relative_eff} of exp(ll)), 1 where that is undefined (a constant likelihood).
     */
    public void evaluate(double[] logLikelihood) {
        double top = max(logLikelihood);
        for (int s = 0; s < draws; s++) {
            likelihood[s] = Math.exp(logLikelihood[s] - top);
        }
        double n = ess.of(likelihood);
        evaluate(logLikelihood, Double.isNaN(n) ? 1 : n / draws);
    }

    /** As {@link #evaluate(double[])} with the relative efficiency given. */
    public void evaluate(double[] logLikelihood, double relativeEfficiency) {
        this.relativeEfficiency = relativeEfficiency;
        // log ratios -ll, shifted so that the largest is 0, in increasing order; a draw's
        // log-likelihood is then -(raw + shift) wherever its ratio stands
        double shift = -min(logLikelihood);
        for (int s = 0; s < draws; s++) {
            raw[s] = -logLikelihood[s] - shift;
        }
        Arrays.sort(raw);
        System.arraycopy(raw, 0, weight, 0, draws);
        int tail = (int) Math.ceil(Math.min(0.2 * draws, 3 * Math.sqrt(draws / relativeEfficiency)));
        paretoK = Double.POSITIVE_INFINITY;
        if (tail >= MIN_TAIL && tail < draws && weight[draws - 1] - weight[draws - tail] >= Math.ulp(1.0) / 100) {
            smoothTail(draws - tail, weight[draws - tail - 1]);
        }
        // truncated at the largest raw ratio, 0 after the shift
        for (int s = 0; s < draws; s++) {
            weight[s] = Math.min(weight[s], 0);
        }
        double logWeightSum = logSumExp(weight);
        for (int s = 0; s < draws; s++) {
            weight[s] -= logWeightSum;
            joint[s] = weight[s] - raw[s] - shift;
        }
        elpd = logSumExp(joint);
        lpd = logSumExp(logLikelihood) - Math.log(draws);
        mcse = mcse(shift);
    }

    /**
     * Replaces the sorted log weights from {@code from} on by the expected order statistics of the
     * generalized Pareto distribution fitted to exp(ratio) - exp(cutoff) (loo's
     * {@code psis_smooth_tail}); sets {@link #paretoK}.
     */
    private void smoothTail(int from, double cutoff) {
        int n = draws - from;
        double expCutoff = Math.exp(cutoff);
        for (int j = 0; j < n; j++) {
            tailExcess[j] = Math.exp(weight[from + j]) - expCutoff;
        }
        // Zhang & Stephens (2009), section 4: a posterior mean of theta = -k / sigma over a grid,
        // each point weighted by its profile likelihood
        int points = MIN_GRID + (int) Math.floor(Math.sqrt(n));
        double firstQuartile = tailExcess[(int) Math.floor(n / 4.0 + 0.5) - 1];
        double largest = tailExcess[n - 1];
        double top = Double.NEGATIVE_INFINITY;
        for (int j = 0; j < points; j++) {
            double theta = 1 / largest + (1 - Math.sqrt(points / (j + 0.5))) / GRID_PRIOR / firstQuartile;
            grid[j] = theta;
            double k = meanLog1p(-theta, n);
            double l = n * (Math.log(-theta / k) - k - 1);
            gridLogLikelihood[j] = l;
            top = Math.max(top, l);
        }
        double weightSum = 0;
        for (int j = 0; j < points; j++) {
            weightSum += Math.exp(gridLogLikelihood[j] - top);
        }
        double logWeightSum = top + Math.log(weightSum);
        double thetaHat = 0;
        for (int j = 0; j < points; j++) {
            thetaHat += grid[j] * Math.exp(gridLogLikelihood[j] - logWeightSum);
        }
        double k = meanLog1p(-thetaHat, n);
        double sigma = -k / thetaHat;
        k = k * n / (n + K_PRIOR_WEIGHT) + K_PRIOR_WEIGHT * 0.5 / (n + K_PRIOR_WEIGHT);
        if (Double.isNaN(k)) {
            k = Double.POSITIVE_INFINITY;
        }
        paretoK = k;
        if (!Double.isFinite(k) || !(sigma > 0)) {
            // loo keeps the raw tail for an infinite k; a fit without a positive scale (which loo
            // would turn into NaN weights) keeps it too
            return;
        }
        for (int j = 0; j < n; j++) {
            double p = (j + 0.5) / n;
            weight[from + j] = Math.log(sigma * Math.expm1(-k * Math.log1p(-p)) / k + expCutoff);
        }
    }

    /** Mean of log1p(a x) over the first n tail excesses. */
    private double meanLog1p(double a, int n) {
        double sum = 0;
        for (int j = 0; j < n; j++) {
            sum += Math.log1p(a * tailExcess[j]);
        }
        return sum / n;
    }

    /**
     * loo's {@code mcse_elpd}: the variance of the importance-sampling estimate of the predictive
     * density, carried to the log scale through a normal evaluated at fixed quantiles, over r_eff.
     */
    private double mcse(double shift) {
        double predictive = Math.exp(elpd);
        double variance = 0;
        for (int s = 0; s < draws; s++) {
            double w = Math.exp(weight[s]);
            double d = Math.exp(-raw[s] - shift) - predictive;
            variance += w * w * d * d;
        }
        double sd = Math.sqrt(variance);
        int count = 0;
        double sum = 0;
        for (double z : MCSE_QUANTILES) {
            double value = predictive + sd * z;
            if (value > 0) {
                double log = Math.log(value);
                logPoint[count++] = log;
                sum += log;
            }
        }
        double mean = sum / count;
        double squares = 0;
        for (int j = 0; j < count; j++) {
            double d = logPoint[j] - mean;
            squares += d * d;
        }
        double logVariance = squares / (count - 1);
        return Math.sqrt(logVariance / relativeEfficiency);
    }

    private static double[] mcseQuantiles() {
        double c = 3.0 / 8;
        double[] z = new double[MCSE_POINTS];
        for (int r = 1; r <= MCSE_POINTS; r++) {
            // qnorm as RankNormalization takes it
            z[r - 1] = Math.sqrt(2.0) * Erf.erfInv(2 * (r - c) / (MCSE_POINTS - 2 * c + 1) - 1);
        }
        return z;
    }

    /** log sum exp(x), the largest term factored out. */
    private static double logSumExp(double[] x) {
        double top = max(x);
        if (top == Double.NEGATIVE_INFINITY) {
            return top;
        }
        double sum = 0;
        for (double v : x) {
            sum += Math.exp(v - top);
        }
        return top + Math.log(sum);
    }

    private static double max(double[] x) {
        double m = Double.NEGATIVE_INFINITY;
        for (double v : x) {
            m = Math.max(m, v);
        }
        return m;
    }

    private static double min(double[] x) {
        double m = Double.POSITIVE_INFINITY;
        for (double v : x) {
            m = Math.min(m, v);
        }
        return m;
    }

    /** The sum of pointwise values, such as elpd_loo over the observations. */
    public static double total(double[] pointwise) {
        double sum = 0;
        for (double v : pointwise) {
            sum += v;
        }
        return sum;
    }

    /**
     * The standard error of the sum of pointwise values, sqrt(n) times their sd (Vehtari, Gelman
     * & Gabry 2017, eqs. 23 and 24, for elpd_loo and for a difference of two); NaN below two values.
     */
    public static double standardError(double[] pointwise) {
        int n = pointwise.length;
        if (n < 2) {
            return Double.NaN;
        }
        double mean = total(pointwise) / n;
        double squares = 0;
        for (double v : pointwise) {
            squares += (v - mean) * (v - mean);
        }
        return Math.sqrt(n * squares / (n - 1));
    }

    /** The Monte Carlo standard error of a sum from the pointwise ones (independent): the root of their squares' sum. */
    public static double combinedMcse(double[] pointwise) {
        double sum = 0;
        for (double v : pointwise) {
            sum += v * v;
        }
        return Math.sqrt(sum);
    }

    /** log p(y_i | y_-i) estimated: elpd_loo,i. */
    public double elpd() {
        return elpd;
    }

    /** log of the posterior mean of the likelihood: lpd_i (the in-sample fit). */
    public double lpd() {
        return lpd;
    }

    /** lpd_i - elpd_loo,i: the effective number of parameters this observation contributes. */
    public double effectiveParameters() {
        return lpd - elpd;
    }

    /** The generalized Pareto shape of the largest ratios: above {@link #RELIABLE_K} the estimate is unreliable. */
    public double paretoK() {
        return paretoK;
    }

    /** Monte Carlo standard error of elpd_loo,i. */
    public double mcse() {
        return mcse;
    }

    /** The relative efficiency used for the tail length and the Monte Carlo error. */
    public double relativeEfficiency() {
        return relativeEfficiency;
    }
}
