package org.rungs.sampler;

import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.rungs.models.RoundingChannel;
import org.rungs.priors.StandardNormal;

/**
 * Draws every respondent's latent level from its full conditional, a normal with mean eta_i and
 * sd 1 truncated to the interval of the answer it intended (Albert & Chib 1993, section 4): the
 * reported category for a full-scale responder; for a coarse responder (MODEL.md 4a) the intended
 * category and the level are drawn together, from the run of categories that round to the
 * reported point, each half-weighted tie category being a separate piece. Only the sufficient
 * statistics of the conjugate level update and the threshold rescaling are kept, by cell
 * ({@link LatentCells}); the latent values themselves are not stored.
 *
 * <p>Under number attraction (MODEL.md 4b) a full-scale answer is the first accepted draw of a
 * redraw scheme: draw y ~ Normal(eta, 1), accept its category k with probability
 * exp(a[g,k] - A[g]), A[g] = max(0, max_k a[g,k]), else draw again; the accepted category has
 * exactly the tilted probabilities of 4b. The rejected draws before the accepted one are
 * independent of it given eta, a geometric number of draws from the rejected part (Rao, Lin &
 * Dunson 2016, Data augmentation for models based on rejection sampling, Biometrika 103,
 * section 2), so they are drawn by running the scheme until its first acceptance. Every draw is
 * a Normal(eta, 1) value, so all of them enter the conjugate update; no other update conditions
 * on them, so they are not kept.
 */
final class LatentLevelUpdate implements Update {
    private final ChainState state;
    private final UniformRandomProvider rng;
    private final TruncatedNormalSampler truncatedNormal;
    /** Bounds of the piece chosen by {@link #intendedPiece}. */
    private double pieceLower;
    private double pieceUpper;
    private final ZigguratSampler.NormalizedGaussian normal;
    /** exp(a[g,k] - A[g]) by group and position: the acceptance probability of a draw in category k. */
    private final double[] acceptance;
    /** A run's covariate sums and cross-products with the latent values, passed to {@link LatentCells#addRun}. */
    private final double[] runX = new double[4];
    private final double[] runXz = new double[4];
    /** A run's rejected draws (redraw scheme): count-weighted covariate sums and their 4 x 4 products, packed to p x p. */
    private final double[] runExtra = new double[4];
    private final double[] runGram = new double[16];
    private final double[] runGramPacked = new double[16];

    private LatentLevelUpdate(ChainState state, UniformRandomProvider rng) {
        this.state = state;
        this.rng = rng;
        this.truncatedNormal = TruncatedNormalSampler.of(rng);
        this.normal = ZigguratSampler.NormalizedGaussian.of(rng);
        this.acceptance = new double[state.attractionOn() ? state.groups * state.categories : 0];
    }

    static LatentLevelUpdate of(ChainState state, UniformRandomProvider rng) {
        return new LatentLevelUpdate(state, rng);
    }

    @Override
    public void update(boolean adapt) {
        ChainState s = state;
        RegressionBlock level = s.level;
        LatentCells cells = s.cells;
        cells.clear();
        double[] thresholds = s.thresholds;
        byte[] coarse = s.coarse;
        double[][] columns = level.columns;
        int stride = s.categories + 1;
        int m = s.categories;
        boolean attraction = s.attractionOn();
        if (attraction) {
            level.clearExtra();
            for (int g = 0; g < s.groups; g++) {
                double top = s.attractionTop(g);
                for (int k = 0; k < m; k++) {
                    acceptance[g * m + k] = Math.exp(s.attraction[g * m + k] - top);
                }
            }
        }
        int p = level.count;
        for (int c = 0; c < s.groups * m; c++) {
            int from = s.start[c];
            int to = s.start[c + 1];
            if (from == to) {
                continue;
            }
            int g = c / m;
            int r = c - g * m;
            if (p >= 1 && p <= 4) {
                drawRun(c, g, r, from, to);
                continue;
            }
            for (int i = from; i < to; i++) {
                double eta = level.linear(i, g);
                if (coarse != null && coarse[i] == 1) {
                    drawCoarse(i, g, r, eta);
                    continue;
                }
                if (attraction) {
                    level.addExtra(i, g, redraw(i, g, eta));
                }
                double latent = eta + truncatedNormal.sample(thresholds[g * stride + r] - eta, thresholds[g * stride + r + 1] - eta);
                cells.add(c, columns, i, latent);
            }
        }
        cells.finish(level, m);
    }

    /**
     * The respondents from..to-1 of cell c (group g, answer r), with one to four level
     * covariates: a full-scale respondent's latent value goes into sums kept in registers and
     * added to the cell once at the end of the run (the survey is sorted by cell); a coarse
     * responder's goes to the cell its intended answer picks.
     */
    private void drawRun(int c, int g, int r, int from, int to) {
        ChainState s = state;
        RegressionBlock level = s.level;
        byte[] coarse = s.coarse;
        boolean attraction = s.attractionOn();
        int p = level.count;
        double[][] x = level.columns;
        // Up to four covariates in registers; the missing ones repeat the first with coefficient 0.
        double[] x0 = x[0];
        double[] x1 = p > 1 ? x[1] : x0;
        double[] x2 = p > 2 ? x[2] : x0;
        double[] x3 = p > 3 ? x[3] : x0;
        double[] b = level.coefficient;
        double b0 = b[0];
        double b1 = p > 1 ? b[1] : 0;
        double b2 = p > 2 ? b[2] : 0;
        double b3 = p > 3 ? b[3] : 0;
        double intercept = level.intercept[g];
        double lower = s.thresholds[g * (s.categories + 1) + r];
        double upper = s.thresholds[g * (s.categories + 1) + r + 1];
        double n = 0;
        double s1 = 0;
        double s2 = 0;
        double a0 = 0;
        double a1 = 0;
        double a2 = 0;
        double a3 = 0;
        double z0 = 0;
        double z1 = 0;
        double z2 = 0;
        double z3 = 0;
        double e = 0;
        double e0 = 0;
        double e1 = 0;
        double e2 = 0;
        double e3 = 0;
        double g00 = 0;
        double g01 = 0;
        double g02 = 0;
        double g03 = 0;
        double g11 = 0;
        double g12 = 0;
        double g13 = 0;
        double g22 = 0;
        double g23 = 0;
        double g33 = 0;
        for (int i = from; i < to; i++) {
            double v0 = x0[i];
            double v1 = x1[i];
            double v2 = x2[i];
            double v3 = x3[i];
            double eta = intercept + v0 * b0 + v1 * b1 + v2 * b2 + v3 * b3;
            if (coarse != null && coarse[i] == 1) {
                drawCoarse(i, g, r, eta);
                continue;
            }
            if (attraction) {
                int rejected = redraw(i, g, eta);
                if (rejected > 0) {
                    // the rejected draws' design rows, each respondent's weighted by its count
                    double w0 = rejected * v0;
                    double w1 = rejected * v1;
                    double w2 = rejected * v2;
                    double w3 = rejected * v3;
                    e += rejected;
                    e0 += w0;
                    e1 += w1;
                    e2 += w2;
                    e3 += w3;
                    g00 += w0 * v0;
                    g01 += w0 * v1;
                    g02 += w0 * v2;
                    g03 += w0 * v3;
                    g11 += w1 * v1;
                    g12 += w1 * v2;
                    g13 += w1 * v3;
                    g22 += w2 * v2;
                    g23 += w2 * v3;
                    g33 += w3 * v3;
                }
            }
            double z = eta + truncatedNormal.sample(lower - eta, upper - eta);
            n += 1;
            s1 += z;
            s2 += z * z;
            a0 += v0;
            a1 += v1;
            a2 += v2;
            a3 += v3;
            z0 += v0 * z;
            z1 += v1 * z;
            z2 += v2 * z;
            z3 += v3 * z;
        }
        runX[0] = a0;
        runX[1] = a1;
        runX[2] = a2;
        runX[3] = a3;
        runXz[0] = z0;
        runXz[1] = z1;
        runXz[2] = z2;
        runXz[3] = z3;
        s.cells.addRun(c, n, s1, s2, runX, runXz);
        if (e > 0) {
            runExtra[0] = e0;
            runExtra[1] = e1;
            runExtra[2] = e2;
            runExtra[3] = e3;
            double[] gram = runGram;
            gram[0] = g00;
            gram[1] = g01;
            gram[2] = g02;
            gram[3] = g03;
            gram[4 + 1] = g11;
            gram[4 + 2] = g12;
            gram[4 + 3] = g13;
            gram[8 + 2] = g22;
            gram[8 + 3] = g23;
            gram[12 + 3] = g33;
            // the first p rows and columns of the symmetric 4 x 4, row-major p x p
            for (int j = 0; j < p; j++) {
                for (int k = 0; k < p; k++) {
                    runGramPacked[j * p + k] = j <= k ? gram[4 * j + k] : gram[4 * k + j];
                }
            }
            level.addExtraRun(g, e, runExtra, runGramPacked);
        }
    }

    /** A coarse responder's intended answer and latent level drawn together (MODEL.md 4a), added to the intended cell. */
    private void drawCoarse(int i, int g, int point, double eta) {
        ChainState s = state;
        int stride = s.categories + 1;
        intendedPiece(g * stride, point, eta);
        double latent = eta + truncatedNormal.sample(pieceLower - eta, pieceUpper - eta);
        int cell = categoryOf(s.thresholds, g * stride, s.categories, latent);
        s.cells.add(g * s.categories + cell, s.level.columns, i, latent);
    }

    /**
     * The rejected draws of full-scale respondent i, the redraw scheme run to its first acceptance,
     * each added to its cell; returns their number, for the caller to add to the design.
     */
    private int redraw(int i, int g, double eta) {
        ChainState s = state;
        int m = s.categories;
        int row = g * (m + 1);
        int rejected = 0;
        while (true) {
            double y = eta + normal.sample();
            int k = categoryOf(s.thresholds, row, m, y);
            if (rng.nextDouble() < acceptance[g * m + k]) {
                return rejected;
            }
            s.cells.add(g * m + k, s.level.columns, i, y);
            rejected++;
        }
    }

    /**
     * The category k with t[k] < y <= t[k+1] in the row at {@code row}: the number of inner
     * thresholds below y, counted without branches (a bisection's branches depend on the draw, and
     * mispredicted they cost more than the comparisons).
     */
    static int categoryOf(double[] t, int row, int m, double y) {
        int k = 0;
        for (int j = 1; j < m; j++) {
            k += t[row + j] < y ? 1 : 0;
        }
        return k;
    }

    /**
     * Chooses the piece of a coarse point's pre-image that holds the intended answer: the run of
     * full-weight categories, or a half-weight tie category below or above it, with probability
     * proportional to its mass; sets {@link #pieceLower} and {@link #pieceUpper}.
     */
    private void intendedPiece(int row, int point, double eta) {
        RoundingChannel channel = state.channel;
        double[] t = state.thresholds;
        int low = channel.fullLow(point);
        int high = channel.fullHigh(point);
        pieceLower = t[row + low];
        pieceUpper = t[row + high + 1];
        boolean below = channel.tieBelow(point);
        boolean above = channel.tieAbove(point);
        if (!below && !above) {
            return;
        }
        double main = StandardNormal.intervalProbability(pieceLower - eta, pieceUpper - eta);
        double massBelow = below ? 0.5 * StandardNormal.intervalProbability(t[row + low - 1] - eta, pieceLower - eta) : 0;
        double massAbove = above ? 0.5 * StandardNormal.intervalProbability(pieceUpper - eta, t[row + high + 2] - eta) : 0;
        double total = main + massBelow + massAbove;
        double u;
        if (total > 1e-280) {
            u = rng.nextDouble() * total;
        } else {
            double logMain = StandardNormal.logIntervalProbability(pieceLower - eta, pieceUpper - eta);
            double logBelow = below ? Math.log(0.5) + StandardNormal.logIntervalProbability(t[row + low - 1] - eta, pieceLower - eta) : Double.NEGATIVE_INFINITY;
            double logAbove = above ? Math.log(0.5) + StandardNormal.logIntervalProbability(pieceUpper - eta, t[row + high + 2] - eta) : Double.NEGATIVE_INFINITY;
            double max = Math.max(logMain, Math.max(logBelow, logAbove));
            main = Math.exp(logMain - max);
            massBelow = Math.exp(logBelow - max);
            massAbove = Math.exp(logAbove - max);
            u = rng.nextDouble() * (main + massBelow + massAbove);
        }
        if (u < massBelow) {
            pieceUpper = pieceLower;
            pieceLower = t[row + low - 1];
        } else if (u < massBelow + massAbove) {
            pieceLower = pieceUpper;
            pieceUpper = t[row + high + 2];
        }
    }
}
