package org.rungs.sampler;

import java.io.DataInput;
import java.io.DataOutput;
import java.io.IOException;
import java.util.Arrays;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.rungs.models.ResponseLikelihood;
import org.rungs.models.RoundingChannel;
import org.rungs.priors.Normal;
import org.rungs.priors.Priors;
import org.rungs.priors.StandardNormal;

/**
 * The coarse class of MODEL.md 4, in three steps.
 *
 * <p>First a random-walk Metropolis move of the group's coarse-class intercept gamma[g] with the
 * classes summed out (the likelihood of MODEL.md 4c): the Gibbs cycle of class indicators and
 * probit latents alone moves gamma only as far as the current classes allow, which is little
 * when a heap can be read either as coarse answers or as wide categories; then a joint move of
 * the coefficients delta in the same way. Scales adapt during warm-up only (Roberts & Rosenthal
 * 2009, section 3).
 *
 * <p>Then each respondent's class from its full conditional with the latent level and intended
 * answer summed out: P(coarse | r) = q P(r | coarse) / ((1 - q) P(r | full) + q P(r | coarse)),
 * q = Phi(gamma[g] + w' delta); a rating that is not a coarse point is always full-scale. Last,
 * the class's probit latent from its normal truncated to the class's side of zero (Albert & Chib
 * 1993, section 3), keeping only the sums the conjugate update of gamma and delta needs.
 *
 * <p>Without style covariates nothing but gamma[g] reads the probit latents, and the random-walk
 * move draws it with every latent integrated out: a respondent who is full-scale for sure then
 * contributes log(1 - Phi(gamma[g])), n of them n times that, at no cost per respondent. So no
 * latent is drawn and {@link Chain} leaves out the conjugate step, which would only repeat the
 * move's work. The same under attraction with few distinct rows of style covariates
 * ({@link ChainState#styleRows}): such a respondent contributes log(1 - Phi(gamma[g] + w' delta)),
 * counted per (group, row), and the coefficients move by the random walk and the joint step.
 */
final class StyleClassUpdate implements Update, Checkpointed {
    private static final double TARGET_ACCEPTANCE = 0.44;
    private final ChainState state;
    private final UniformRandomProvider rng;
    private final TruncatedNormalSampler truncatedNormal;
    private final ZigguratSampler.NormalizedGaussian normal;
    private final Normal meanPrior;
    private final Normal coefficientPrior;
    private final double[] logScale;
    /** Per coarse-point reporter (see {@link #gap}): P(r | full), P(r | coarse), and the log mixture now and as proposed. */
    private final double[] full;
    private final double[] coarse;
    private final double[] logMixture;
    private final double[] proposedLog;
    /** Per coarse-point reporter: q = Phi(linear) now and as proposed; the last q computed. */
    private final double[] coarseShare;
    private final double[] proposedQ;
    private double proposedShare;
    /** The last linear predictor given to {@link #logMixture} and its Phi. */
    private double lastLinear = Double.NaN;
    private double lastQ;
    /** Per coarse-point reporter: gamma[g] + w' delta. */
    private final double[] linear;
    private final double[] coefficientStep;
    /** exp(a[g,k]) - 1 by group and position (attraction on). */
    private final double[] excess;
    /**
     * The respondents whose rating is not a coarse point (always full-scale): their number and
     * covariate sums per group and their covariate cross-products, fixed by the data; and the
     * sums of their probit residuals e = latent - linear predictor, drawn at the start of a sweep.
     */
    private final int[] fixedCount;
    private final double[][] fixedCovariate;
    private final double[][] fixedGram;
    private final double[] residualSum;
    private final double[] residualCross;
    /** Positions of the coarse points. */
    private final int[] points;
    /**
     * The per-respondent arrays above hold coarse-point reporters only, in sorted order:
     * respondent i of the (group, category) run c sits at slot i - gap[c].
     */
    private final int[] gap;
    private double coefficientLogScale;
    private int warmupStep;
    /** Whether the probit latents are drawn (see {@link #augmented(ChainState)}); else they stay integrated out. */
    private final boolean augmented;
    /** Whether every respondent of a group has the same class probit (no style covariates). */
    private final boolean shared;
    /** Not augmented, with style covariates: the full-scale-for-sure respondents per (group, style row), and the rows. */
    private final int[] fixedRowCount;
    private final double[][] rowValues;

    private StyleClassUpdate(ChainState state, Priors priors, UniformRandomProvider rng) {
        this.state = state;
        this.rng = rng;
        this.truncatedNormal = TruncatedNormalSampler.of(rng);
        this.normal = ZigguratSampler.NormalizedGaussian.of(rng);
        this.meanPrior = priors.styleMean();
        this.coefficientPrior = priors.style();
        int m = state.categories;
        int p = state.style.count;
        this.logScale = new double[state.groups];
        this.fixedCount = new int[state.groups];
        this.fixedCovariate = new double[state.groups][p];
        this.fixedGram = new double[p][p];
        for (int g = 0; g < state.groups; g++) {
            int size = state.start[(g + 1) * m] - state.start[g * m];
            logScale[g] = Math.log(2.0 / Math.sqrt(1.0 + size));
            for (int k = 0; k < m; k++) {
                if (state.channel.isPoint(k)) {
                    continue;
                }
                for (int i = state.start[g * m + k]; i < state.start[g * m + k + 1]; i++) {
                    fixedCount[g]++;
                    for (int j = 0; j < p; j++) {
                        double xj = state.style.columns[j][i];
                        fixedCovariate[g][j] += xj;
                        for (int l = 0; l < p; l++) {
                            fixedGram[j][l] += xj * state.style.columns[l][i];
                        }
                    }
                }
            }
        }
        this.residualSum = new double[state.groups];
        this.residualCross = new double[p];
        this.gap = new int[state.groups * m];
        int slots = 0;
        for (int c = 0; c < state.groups * m; c++) {
            gap[c] = state.start[c] - slots;
            if (state.channel.isPoint(c % m)) {
                slots += state.start[c + 1] - state.start[c];
            }
        }
        this.full = new double[slots];
        this.coarse = new double[slots];
        this.logMixture = new double[slots];
        this.proposedLog = new double[slots];
        this.coarseShare = new double[slots];
        this.proposedQ = new double[slots];
        this.linear = new double[slots];
        this.coefficientStep = new double[p];
        this.points = state.channel.points();
        this.excess = new double[state.attractionOn() ? state.groups * m : 0];
        this.coefficientLogScale = Math.log(1.0 / Math.sqrt(1.0 + state.size));
        this.augmented = augmented(state);
        this.shared = p == 0;
        if (!augmented && !shared) {
            StyleRows rows = state.styleRows;
            rowValues = rows.values();
            fixedRowCount = new int[state.groups * rows.count()];
            for (int i = 0; i < state.size; i++) {
                if (!state.channel.isPoint(state.category[i])) {
                    fixedRowCount[state.group[i] * rows.count() + rows.number()[i]]++;
                }
            }
        } else {
            rowValues = null;
            fixedRowCount = null;
        }
    }

    /**
     * Whether the coarse class's probit latents are drawn, for the conjugate step of
     * {@link RegressionUpdate}: with style covariates, unless {@link ChainState#styleRows} lets
     * the always-full-scale respondents be counted per row instead.
     */
    static boolean augmented(ChainState state) {
        return state.style.count > 0 && state.styleRows == null;
    }

    static StyleClassUpdate of(ChainState state, Priors priors, UniformRandomProvider rng) {
        return new StyleClassUpdate(state, priors, rng);
    }

    @Override
    public void update(boolean adapt) {
        ChainState s = state;
        RegressionBlock style = s.style;
        Arrays.fill(residualCross, 0);
        for (int g = 0; g < s.groups; g++) {
            prepare(g);
            moveIntercept(g, adapt);
        }
        if (style.count > 0) {
            moveCoefficients(adapt);
        }
        Arrays.fill(style.latentSum, 0);
        Arrays.fill(style.latentCross, 0);
        for (int g = 0; g < s.groups; g++) {
            drawClasses(g);
        }
        if (augmented) {
            addFixedRespondents();
        }
        if (adapt) {
            warmupStep++;
        }
    }

    /**
     * For each respondent of group g: the style linear predictor; for a coarse-point reporter
     * P(r | full) (with attraction, MODEL.md 4b, from the threshold update's N_i, still current),
     * P(r | coarse) and the log of their mixture; for any other respondent, who is full-scale for
     * sure, the probit latent from its normal truncated below zero (Albert & Chib 1993, section
     * 3), of which only the residual sums are kept.
     */
    private void prepare(int g) {
        ChainState s = state;
        int m = s.categories;
        if (s.attractionOn()) {
            for (int k = 0; k < m; k++) {
                excess[g * m + k] = Math.expm1(s.attraction[g * m + k]);
            }
        }
        RoundingChannel channel = s.channel;
        RegressionBlock style = s.style;
        int p = style.count;
        int row = g * (m + 1);
        double sum = 0;
        for (int r = 0; r < m; r++) {
            boolean point = channel.isPoint(r);
            if (!point && !augmented) {
                continue;
            }
            int off = gap[g * m + r];
            for (int i = s.start[g * m + r], end = s.start[g * m + r + 1]; i < end; i++) {
                double lin = style.linear(i, g);
                if (point) {
                    int at = i - off;
                    linear[at] = lin;
                    double eta = s.eta(i);
                    full[at] = ResponseLikelihood.full(s.thresholds, row, r, eta, -1, 0);
                    if (s.attractionOn()) {
                        full[at] *= (excess[g * m + r] + 1) / s.normaliser[i];
                    }
                    coarse[at] = ResponseLikelihood.coarse(channel, s.thresholds, row, r, eta, -1, 0);
                    if (!shared) {
                        logMixture[at] = logMixture(at, lin);
                        coarseShare[at] = proposedShare;
                    } else {
                        // without style covariates the moves read mixtures as ratios (sharedShareChange)
                        coarseShare[at] = share(lin);
                    }
                } else if (augmented) {
                    double e = truncatedNormal.sample(Double.NEGATIVE_INFINITY, -lin);
                    sum += e;
                    for (int j = 0; j < p; j++) {
                        residualCross[j] += style.columns[j][i] * e;
                    }
                }
            }
        }
        residualSum[g] = sum;
    }

    /**
     * Moves gamma[g] by a random-walk step with the classes of the coarse-point reporters summed
     * out (MODEL.md 4c) and the probit latents of the others held: their log density changes by
     * step * sum(e) - n step^2 / 2; or, without style covariates, integrated out:
     * n (log(1 - Phi(gamma + step)) - log(1 - Phi(gamma))), and per style row the same with the
     * row's probit ({@link #fixedChange}).
     */
    private void moveIntercept(int g, boolean adapt) {
        ChainState s = state;
        RegressionBlock style = s.style;
        int m = s.categories;
        double step = Math.exp(logScale[g]) * normal.sample();
        double change;
        if (!shared) {
            change = augmented ? step * residualSum[g] - 0.5 * fixedCount[g] * step * step : fixedChange(g, step, null);
            for (int r : points) {
                for (int at = s.start[g * m + r] - gap[g * m + r], end = s.start[g * m + r + 1] - gap[g * m + r]; at < end; at++) {
                    double after = logMixture(at, linear[at] + step);
                    proposedLog[at] = after;
                    proposedQ[at] = proposedShare;
                    change += after - logMixture[at];
                }
            }
        } else {
            change = fixedCount[g] * (StandardNormal.logUpperTail(style.intercept[g] + step)
                    - StandardNormal.logUpperTail(style.intercept[g]))
                    + sharedShareChange(g, style.intercept[g], style.intercept[g] + step);
        }
        double intercept = style.intercept[g];
        double prior;
        if (s.groups > 1) {
            double a = (intercept - style.mean) / style.sd;
            double b = (intercept + step - style.mean) / style.sd;
            prior = 0.5 * (a * a - b * b);
        } else {
            prior = meanPrior.logDensity(intercept + step) - meanPrior.logDensity(intercept);
        }
        boolean accept = Math.log(rng.nextDouble()) < change + prior;
        if (accept) {
            style.intercept[g] += step;
            if (s.groups == 1) {
                style.mean = style.intercept[g];
            }
            double q = shared ? share(style.intercept[g]) : 0;
            for (int r : points) {
                for (int at = s.start[g * m + r] - gap[g * m + r], end = s.start[g * m + r + 1] - gap[g * m + r]; at < end; at++) {
                    linear[at] += step;
                    if (!shared) {
                        logMixture[at] = proposedLog[at];
                        coarseShare[at] = proposedQ[at];
                    } else {
                        coarseShare[at] = q;
                    }
                }
            }
            residualSum[g] -= fixedCount[g] * step;
            for (int j = 0; j < style.count; j++) {
                residualCross[j] -= step * fixedCovariate[g][j];
            }
        }
        if (adapt) {
            logScale[g] += Math.pow(warmupStep + 1.0, -0.6) * ((accept ? 1 : 0) - TARGET_ACCEPTANCE);
        }
    }

    /**
     * A random-walk move of all coarse-class coefficients delta together, as in
     * {@link #moveIntercept}: the class indicators otherwise tie delta to the current
     * classification. The held residuals change their log density by d' sum(e w) - d' W'W d / 2;
     * counted per style row instead, as in {@link #fixedChange}.
     */
    private void moveCoefficients(boolean adapt) {
        ChainState s = state;
        RegressionBlock style = s.style;
        int p = style.count;
        int m = s.categories;
        double scale = Math.exp(coefficientLogScale);
        for (int j = 0; j < p; j++) {
            coefficientStep[j] = scale * normal.sample();
        }
        double change = 0;
        for (int j = 0; j < p && augmented; j++) {
            double d = coefficientStep[j];
            change += d * residualCross[j];
            for (int l = 0; l < p; l++) {
                change -= 0.5 * d * fixedGram[j][l] * coefficientStep[l];
            }
        }
        for (int g = 0; g < s.groups && !augmented; g++) {
            change += fixedChange(g, 0, coefficientStep);
        }
        for (int g = 0; g < s.groups; g++) {
            for (int r : points) {
                int off = gap[g * m + r];
                for (int i = s.start[g * m + r], end = s.start[g * m + r + 1]; i < end; i++) {
                    int at = i - off;
                    double after = logMixture(at, linear[at] + movedBy(i));
                    proposedLog[at] = after;
                    proposedQ[at] = proposedShare;
                    change += after - logMixture[at];
                }
            }
        }
        double prior = 0;
        for (int j = 0; j < p; j++) {
            prior += coefficientPrior.logDensity(style.coefficient[j] + coefficientStep[j])
                    - coefficientPrior.logDensity(style.coefficient[j]);
        }
        boolean accept = Math.log(rng.nextDouble()) < change + prior;
        if (accept) {
            for (int j = 0; j < p; j++) {
                style.coefficient[j] += coefficientStep[j];
            }
            for (int g = 0; g < s.groups; g++) {
                for (int r : points) {
                    int off = gap[g * m + r];
                    for (int i = s.start[g * m + r], end = s.start[g * m + r + 1]; i < end; i++) {
                        int at = i - off;
                        linear[at] += movedBy(i);
                        logMixture[at] = proposedLog[at];
                        coarseShare[at] = proposedQ[at];
                    }
                }
                double shift = 0;
                for (int j = 0; j < p; j++) {
                    shift += fixedCovariate[g][j] * coefficientStep[j];
                }
                residualSum[g] -= shift;
            }
            for (int j = 0; j < p; j++) {
                for (int l = 0; l < p; l++) {
                    residualCross[j] -= fixedGram[j][l] * coefficientStep[l];
                }
            }
        }
        if (adapt) {
            coefficientLogScale += Math.pow(warmupStep + 1.0, -0.6) * ((accept ? 1 : 0) - TARGET_ACCEPTANCE);
        }
    }

    /**
     * Counted per style row (not augmented, with style covariates): the change of log(1 - q) over
     * group g's full-scale-for-sure respondents when gamma[g] moves by {@code interceptStep} and
     * delta by {@code coefficientSteps} (null: unchanged), q = Phi(gamma[g] + w' delta) of their row.
     */
    private double fixedChange(int g, double interceptStep, double[] coefficientSteps) {
        RegressionBlock style = state.style;
        int rows = rowValues.length;
        double change = 0;
        for (int q = 0; q < rows; q++) {
            int count = fixedRowCount[g * rows + q];
            if (count == 0) {
                continue;
            }
            double before = style.intercept[g];
            double after = before + interceptStep;
            for (int j = 0; j < style.count; j++) {
                double w = rowValues[q][j];
                before += w * style.coefficient[j];
                after += w * (style.coefficient[j] + (coefficientSteps == null ? 0 : coefficientSteps[j]));
            }
            change += count * (StandardNormal.logUpperTail(after) - StandardNormal.logUpperTail(before));
        }
        return change;
    }

    /**
     * Without style covariates: the change of the coarse-point reporters' log mixtures in group g
     * when every one's class probit moves from {@code before} to {@code after}, as the log of a
     * running product of likelihood ratios (one logarithm each time it leaves the bounds of
     * {@link RunningProducts}, not one per respondent); a respondent whose mixture is too small
     * for a ratio enters in log space.
     */
    private double sharedShareChange(int g, double before, double after) {
        ChainState s = state;
        int m = s.categories;
        double qBefore = share(before);
        double qAfter = share(after);
        double change = 0;
        double product = 1;
        for (int r : points) {
            for (int at = s.start[g * m + r] - gap[g * m + r], end = s.start[g * m + r + 1] - gap[g * m + r]; at < end; at++) {
                double now = (1 - qBefore) * full[at] + qBefore * coarse[at];
                double moved = (1 - qAfter) * full[at] + qAfter * coarse[at];
                if (now > 1e-280 && moved > 1e-280) {
                    product *= moved / now;
                    if (product < RunningProducts.LOW || product > RunningProducts.HIGH) {
                        change += Math.log(product);
                        product = 1;
                    }
                } else {
                    change += logMixture(at, after) - logMixture(at, before);
                }
            }
        }
        return change + Math.log(product);
    }

    /** Phi(linear), reused while the linear predictor repeats (see {@link #logMixture}). */
    private double share(double linearPredictor) {
        if (linearPredictor != lastLinear) {
            lastQ = StandardNormal.cdf(linearPredictor);
            lastLinear = linearPredictor;
        }
        return lastQ;
    }

    /** w_i' d for the pending coefficient step d. */
    private double movedBy(int i) {
        RegressionBlock style = state.style;
        double moved = 0;
        for (int j = 0; j < style.count; j++) {
            moved += style.columns[j][i] * coefficientStep[j];
        }
        return moved;
    }

    /** log((1 - q) P(r | full) + q P(r | coarse)) with q = Phi(linear), left in {@link #proposedShare}. */
    private double logMixture(int at, double linearPredictor) {
        // Respondents of a group who share their style covariates (all of them, without any) share q.
        double q = share(linearPredictor);
        proposedShare = q;
        double p = (1 - q) * full[at] + q * coarse[at];
        if (p > 1e-280) {
            return Math.log(p);
        }
        return ResponseLikelihood.logSum(StandardNormal.logUpperTail(linearPredictor) + Math.log(full[at]),
                StandardNormal.logCdf(linearPredictor) + Math.log(coarse[at]));
    }

    /** The class and (if drawn) probit latent of each coarse-point reporter of group g, added to the sums. */
    private void drawClasses(int g) {
        ChainState s = state;
        RegressionBlock style = s.style;
        int m = s.categories;
        for (int k = 0; k < m; k++) {
            boolean point = s.channel.isPoint(k);
            for (int i = s.start[g * m + k], end = s.start[g * m + k + 1]; i < end; i++) {
                if (!point) {
                    s.coarse[i] = 0;
                    continue;
                }
                int at = i - gap[g * m + k];
                double mean = linear[at];
                double q = coarseShare[at];
                double pf = (1 - q) * full[at];
                double pc = q * coarse[at];
                double share;
                if (pf + pc > 1e-280) {
                    share = pc / (pf + pc);
                } else {
                    double logFull = StandardNormal.logUpperTail(mean) + Math.log(full[at]);
                    double logCoarse = StandardNormal.logCdf(mean) + Math.log(coarse[at]);
                    share = 1 / (1 + Math.exp(logFull - logCoarse));
                }
                byte z = rng.nextDouble() < share ? (byte) 1 : (byte) 0;
                s.coarse[i] = z;
                if (!augmented) {
                    continue;
                }
                double latent = mean + (z == 1
                        ? truncatedNormal.sample(-mean, Double.POSITIVE_INFINITY)
                        : truncatedNormal.sample(Double.NEGATIVE_INFINITY, -mean));
                style.latentSum[g] += latent;
                for (int j = 0; j < style.count; j++) {
                    style.latentCross[j] += style.columns[j][i] * latent;
                }
            }
        }
    }

    /**
     * Adds the probit latents of the respondents who are full-scale for sure: latent = linear +
     * e, and the linear predictors' sums follow from the fixed covariate sums.
     */
    private void addFixedRespondents() {
        RegressionBlock style = state.style;
        int p = style.count;
        for (int g = 0; g < state.groups; g++) {
            double linearSum = fixedCount[g] * style.intercept[g];
            for (int j = 0; j < p; j++) {
                linearSum += fixedCovariate[g][j] * style.coefficient[j];
                style.latentCross[j] += fixedCovariate[g][j] * style.intercept[g];
            }
            style.latentSum[g] += linearSum + residualSum[g];
        }
        for (int j = 0; j < p; j++) {
            double cross = residualCross[j];
            for (int l = 0; l < p; l++) {
                cross += fixedGram[j][l] * style.coefficient[l];
            }
            style.latentCross[j] += cross;
        }
    }

    /** The adapted scales; the per-respondent caches are rebuilt at the start of every update. */
    @Override
    public void save(DataOutput out) throws IOException {
        Checkpointed.writeDoubles(out, logScale);
        Checkpointed.writeDouble(out, coefficientLogScale);
        out.writeInt(warmupStep);
    }

    @Override
    public void restore(DataInput in) throws IOException {
        Checkpointed.readDoubles(in, logScale);
        coefficientLogScale = Checkpointed.readDouble(in);
        warmupStep = in.readInt();
    }
}
