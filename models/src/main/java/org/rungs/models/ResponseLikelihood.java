package org.rungs.models;

import org.rungs.priors.StandardNormal;

/**
 * Probabilities of a reported category given the latent level eta (MODEL.md 3, 4a, 4c), from a
 * row of thresholds with sentinels ({@code thresholds[base + k]} is the boundary below position
 * k, {@code -inf} at k = 0 and {@code +inf} at k = M). One boundary may be read moved by
 * {@code delta}, which is how a Metropolis step evaluates its proposal without copying a row.
 */
public final class ResponseLikelihood {
    /** Below this, probabilities are recomputed in log space (well above the smallest normal double). */
    private static final double TINY = 1e-280;

    private ResponseLikelihood() {
    }

    /** pi[g,k](eta) = Phi(c[k+1] - eta) - Phi(c[k] - eta), the full-scale responder's probability. */
    public static double full(double[] thresholds, int base, int k, double eta, int moved, double delta) {
        return StandardNormal.intervalProbability(at(thresholds, base, k, moved, delta) - eta,
                at(thresholds, base, k + 1, moved, delta) - eta);
    }

    /** P(r = j | coarse, eta) = sum_k pi[g,k](eta) R(j|k) (MODEL.md 4a); 0 unless j is a coarse point. */
    public static double coarse(RoundingChannel channel, double[] thresholds, int base, int j, double eta,
                                int moved, double delta) {
        return coarse(channel, thresholds, base, j, eta, moved, delta, null);
    }

    /**
     * As above with no threshold moved, also writing phi(c[g,k] - eta) to {@code density[k]} for
     * each threshold k it reads (computed with the probability's tails); other entries
     * of {@code density} may be overwritten.
     */
    public static double coarse(RoundingChannel channel, double[] thresholds, int base, int j, double eta, double[] density) {
        return coarse(channel, thresholds, base, j, eta, -1, 0, density);
    }

    private static double coarse(RoundingChannel channel, double[] thresholds, int base, int j, double eta,
                                 int moved, double delta, double[] density) {
        if (!channel.isPoint(j)) {
            return 0;
        }
        int low = channel.fullLow(j);
        int high = channel.fullHigh(j);
        double p = interval(thresholds, base, low, high + 1, eta, moved, delta, density);
        if (channel.tieBelow(j)) {
            p += 0.5 * interval(thresholds, base, low - 1, low, eta, moved, delta, density);
        }
        if (channel.tieAbove(j)) {
            p += 0.5 * interval(thresholds, base, high + 1, high + 2, eta, moved, delta, density);
        }
        return p;
    }

    /** Phi(c[from] - eta) .. Phi(c[to] - eta), with the densities at both ends in density[from], density[to] if asked. */
    private static double interval(double[] thresholds, int base, int from, int to, double eta, int moved, double delta,
                                   double[] density) {
        double lower = at(thresholds, base, from, moved, delta) - eta;
        double upper = at(thresholds, base, to, moved, delta) - eta;
        if (density == null) {
            return StandardNormal.intervalProbability(lower, upper);
        }
        double p = StandardNormal.intervalProbability(lower, upper, density, from);
        // intervalProbability wrote phi(upper) next to phi(lower); move it to its own threshold.
        double atUpper = density[from + 1];
        if (to != from + 1) {
            density[to] = atUpper;
        }
        return p;
    }

    /** log P(r = k | full, eta), exact far in the tails. */
    public static double logFull(double[] thresholds, int base, int k, double eta) {
        double p = full(thresholds, base, k, eta, -1, 0);
        if (p > TINY) {
            return Math.log(p);
        }
        return StandardNormal.logIntervalProbability(thresholds[base + k] - eta, thresholds[base + k + 1] - eta);
    }

    /** log P(r = j | coarse, eta), exact far in the tails; minus infinity unless j is a coarse point. */
    public static double logCoarse(RoundingChannel channel, double[] thresholds, int base, int j, double eta,
                                   int moved, double delta) {
        if (!channel.isPoint(j)) {
            return Double.NEGATIVE_INFINITY;
        }
        double p = coarse(channel, thresholds, base, j, eta, moved, delta);
        if (p > TINY) {
            return Math.log(p);
        }
        int low = channel.fullLow(j);
        int high = channel.fullHigh(j);
        double log = StandardNormal.logIntervalProbability(at(thresholds, base, low, moved, delta) - eta,
                at(thresholds, base, high + 1, moved, delta) - eta);
        if (channel.tieBelow(j)) {
            log = logSum(log, Math.log(0.5) + StandardNormal.logIntervalProbability(
                    at(thresholds, base, low - 1, moved, delta) - eta, at(thresholds, base, low, moved, delta) - eta));
        }
        if (channel.tieAbove(j)) {
            log = logSum(log, Math.log(0.5) + StandardNormal.logIntervalProbability(
                    at(thresholds, base, high + 1, moved, delta) - eta, at(thresholds, base, high + 2, moved, delta) - eta));
        }
        return log;
    }

    /**
     * The per-respondent log-likelihood of MODEL.md 4c with the class summed out:
     * log((1 - q) P(r | full) + q P(r | coarse)); with {@code channel} null, the plain ordered probit.
     */
    public static double logRespondent(RoundingChannel channel, double[] thresholds, int base, int r, double eta, double q) {
        double full = logFull(thresholds, base, r, eta);
        if (channel == null || !channel.isPoint(r)) {
            return (channel == null ? 0 : Math.log1p(-q)) + full;
        }
        return logSum(Math.log1p(-q) + full, Math.log(q) + logCoarse(channel, thresholds, base, r, eta, -1, 0));
    }

    /**
     * log P(r = j | full, eta) under number attraction (MODEL.md 4b):
     * log pi[j] + a[j] - log sum_k pi[k] exp(a[k]), with {@code attraction[k]} = a[g,k] (0 for
     * numbers outside the attraction set). The normaliser is 1 + sum_k pi[k] (exp(a[k]) - 1), which
     * stays at least min(1, exp(min a)) however far eta lies in a tail, so only log pi[j] needs
     * the log-space path.
     */
    public static double logFullAttracted(double[] thresholds, int base, int j, double eta, double[] attraction) {
        double normaliser = 1;
        for (int k = 0; k < attraction.length; k++) {
            if (attraction[k] != 0) {
                normaliser += full(thresholds, base, k, eta, -1, 0) * Math.expm1(attraction[k]);
            }
        }
        return logFull(thresholds, base, j, eta) + attraction[j] - Math.log(normaliser);
    }

    /** MODEL.md 4c with attraction on the full-scale class: log((1 - q) P(r | full, a) + q P(r | coarse)). */
    public static double logRespondentAttracted(RoundingChannel channel, double[] thresholds, int base, int r, double eta,
                                                double q, double[] attraction) {
        double full = logFullAttracted(thresholds, base, r, eta, attraction);
        if (channel == null || !channel.isPoint(r)) {
            return (channel == null ? 0 : Math.log1p(-q)) + full;
        }
        return logSum(Math.log1p(-q) + full, Math.log(q) + logCoarse(channel, thresholds, base, r, eta, -1, 0));
    }

    private static double at(double[] thresholds, int base, int k, int moved, double delta) {
        return k == moved ? thresholds[base + k] + delta : thresholds[base + k];
    }

    /** log(exp(a) + exp(b)) without overflow. */
    public static double logSum(double a, double b) {
        if (a == Double.NEGATIVE_INFINITY) {
            return b;
        }
        if (b == Double.NEGATIVE_INFINITY) {
            return a;
        }
        double max = Math.max(a, b);
        return max + Math.log1p(Math.exp(-Math.abs(a - b)));
    }
}
