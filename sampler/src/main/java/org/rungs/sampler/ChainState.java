package org.rungs.sampler;

import java.io.DataInput;
import java.io.DataOutput;
import java.io.IOException;
import org.rungs.models.ParameterLayout;
import org.rungs.models.RoundingChannel;
import org.rungs.models.survey.Survey;

/**
 * The state of one chain as plain arrays (MODEL.md sections 2 to 4), read by the updates of the
 * same package. Thresholds are stored with their sentinels: group g's boundaries occupy
 * {@code thresholds[g*(M+1) .. g*(M+1)+M]} with {@code -inf} first and {@code +inf} last, so
 * category k of group g lies between {@code thresholds[g*(M+1)+k]} and the next entry.
 */
final class ChainState implements Checkpointed {
    /**
     * Category probabilities above this are taken as differences of the cached cdfs (absolute
     * error near 1e-16, so relative error below 1e-10); below it the tail-exact computation.
     */
    static final double EXACT_ENOUGH = 1e-6;

    final Survey survey;
    final byte[] category;
    final int[] group;
    final int size;
    final int groups;
    final int categories;
    final boolean byGroup;
    /** Start of each (group, category) run of the sorted respondents; see {@link SurveyOrder}. */
    final int[] start;

    /** The latent level's regression: alpha[g], beta, mu_alpha, tau_alpha (MODEL.md 2). */
    final RegressionBlock level;
    /** This sweep's latent levels summed by (group, category) cell; see {@link LatentCells}. */
    final LatentCells cells;
    /** The coarse class's probit regression: gamma[g], delta, mu_gamma, tau_gamma (MODEL.md 4); null when off. */
    final RegressionBlock style;
    /** The rounding of coarse responders (MODEL.md 4a); null when the class is off. */
    final RoundingChannel channel;
    /** 1 for respondents currently in the coarse class, 0 for full-scale ones; null when off. */
    final byte[] coarse;
    /**
     * Under attraction, the distinct rows of the style covariates when there are at most
     * {@link #STYLE_ROW_LIMIT} (categorical ones, say), whose respondents share the class probit
     * within a group: {@link CollapsedPosterior} reads one table per row and
     * {@link StyleClassUpdate} counts a row's respondents instead of drawing their probit latents.
     * Null otherwise (no classes, no style covariates, no attraction, or more rows).
     */
    final StyleRows styleRows;
    /** See {@link #styleRows}. */
    static final int STYLE_ROW_LIMIT = 8;

    /** Common thresholds c[0..M] with sentinels; they sum to zero over 1..M-1. */
    final double[] common;
    /** Group thresholds c[g,0..M] with sentinels, G rows of M+1; equal to {@link #common} in shared mode. */
    final double[] thresholds;
    double thresholdSd;

    /** Positions (rating - L) of the attraction set A (MODEL.md 4b); empty when attraction is off. */
    final int[] attracted;
    /** a[g,k] for group g and position k at {@code g*M + k}; 0 outside A. */
    final double[] attraction;
    /** The common terms abar[k] by position; 0 outside A (with one group a = abar). */
    final double[] attractionMean;
    double attractionSd;
    /**
     * Under attraction, Phi(c[g,k] - eta_i) for k = 0..M (0 and 1 at the ends) threshold by
     * threshold, at k * size + i for respondent i in sorted order, so that a step that moves one
     * threshold or one attraction reads a contiguous column (one respondent after another in the
     * other layout read a cache line each for one or two doubles); and the normaliser N_i =
     * sum_k pi[g,k](eta_i) exp(a[g,k]) of MODEL.md 4b. Filled by {@link ThresholdUpdate} at the
     * start of a sweep and kept current by every later update that moves a threshold or an
     * attraction before the levels move; empty when attraction is off.
     */
    double[] cdf;
    double[] normaliser;
    /**
     * Under attraction, a second array shaped as {@link #cdf}, which the joint step fills at its
     * proposal and swaps in when it accepts ({@link JointHamiltonianUpdate}); and whether
     * {@link #cdf} holds, bit for bit, what {@link ThresholdUpdate#refresh} would compute at the
     * current state, and {@link #normaliser} the N_i of the joint step's pass there (set by the
     * joint step, cleared by that refresh), so that it need not recompute them.
     */
    double[] spareCdf;
    /** N_i beside {@link #spareCdf}, swapped with it. */
    double[] spareNormaliser;
    boolean cdfCurrent;
    /** exp(a[g,k]) - 1 of the group being refreshed, by position. */
    private final double[] excess;

    /** Attraction off. */
    ChainState(SurveyOrder order, boolean byGroup, RoundingChannel channel) {
        this(order, byGroup, channel, new int[0]);
    }

    ChainState(SurveyOrder order, boolean byGroup, RoundingChannel channel, int[] attracted) {
        Survey survey = order.survey();
        this.start = order.start();
        this.survey = survey;
        this.category = survey.category();
        this.group = survey.group();
        this.size = survey.size();
        this.groups = survey.groupCount();
        this.categories = survey.scale().categories();
        this.byGroup = byGroup && groups > 1;
        this.level = new RegressionBlock(survey.level(), group, groups);
        this.cells = new LatentCells(groups * categories, level.count);
        this.channel = channel;
        this.style = channel == null ? null : new RegressionBlock(survey.style(), group, groups);
        this.coarse = channel == null ? null : new byte[size];
        // Without attraction the coarse model keeps the exact force and the drawn latents, and with
        // them its chains as they were (with the tables the coarse demo's seed 1 took 59 s instead
        // of about 65 but ended "not converged", the roll of the dice that a new chain brings).
        this.styleRows = style != null && style.count > 0 && attracted.length > 0
                ? StyleRows.of(style.columns, size, STYLE_ROW_LIMIT) : null;
        this.attracted = attracted.clone();
        this.attraction = new double[groups * categories];
        this.attractionMean = new double[categories];
        this.cdf = new double[attracted.length > 0 ? size * (categories + 1) : 0];
        this.spareCdf = new double[cdf.length];
        if (cdf.length > 0) {
            java.util.Arrays.fill(cdf, categories * size, cdf.length, 1);
            java.util.Arrays.fill(spareCdf, categories * size, cdf.length, 1);
        }
        this.normaliser = new double[attracted.length > 0 ? size : 0];
        this.spareNormaliser = new double[normaliser.length];
        this.excess = new double[categories];
        common = new double[categories + 1];
        thresholds = new double[groups * (categories + 1)];
        common[0] = Double.NEGATIVE_INFINITY;
        common[categories] = Double.POSITIVE_INFINITY;
    }

    /** Linear predictor eta_i = alpha[g_i] + x_i' beta (MODEL.md section 2). */
    double eta(int i) {
        return level.linear(i, group[i]);
    }

    boolean attractionOn() {
        return attracted.length > 0;
    }

    /** max(0, max_k a[g,k]): the bound of the redraw scheme; numbers outside A have a = 0. */
    double attractionTop(int g) {
        double top = 0;
        for (int k : attracted) {
            top = Math.max(top, attraction[g * categories + k]);
        }
        return top;
    }

    /** Recomputes N_i for respondents from..to-1 of group g from {@link #cdf} and the attraction. */
    void refreshNormalisers(int g, int from, int to) {
        int m = categories;
        for (int k : attracted) {
            excess[k] = Math.expm1(attraction[g * m + k]);
        }
        for (int i = from; i < to; i++) {
            double n = 1;
            for (int k : attracted) {
                n += (cdf[(k + 1) * size + i] - cdf[k * size + i]) * excess[k];
            }
            normaliser[i] = n;
        }
    }

    /**
     * P(r | coarse) of MODEL.md 4a for coarse point r from respondent i's cdfs (columns of n, as
     * {@link ChainState#cdf}), with those at thresholds k and k+1 replaced by lowK and highK1: the
     * point's full range and half of each tie category beside it.
     */
    static double coarseFromCdfs(RoundingChannel channel, double[] cdf, int n, int i, int r, int k, double lowK, double highK1) {
        int low = channel.fullLow(r);
        int high = channel.fullHigh(r) + 1;
        double p = cdfAt(cdf, n, i, high, k, lowK, highK1) - cdfAt(cdf, n, i, low, k, lowK, highK1);
        if (channel.tieBelow(r)) {
            p += 0.5 * (cdfAt(cdf, n, i, low, k, lowK, highK1) - cdfAt(cdf, n, i, low - 1, k, lowK, highK1));
        }
        if (channel.tieAbove(r)) {
            p += 0.5 * (cdfAt(cdf, n, i, high + 1, k, lowK, highK1) - cdfAt(cdf, n, i, high, k, lowK, highK1));
        }
        return p;
    }

    private static double cdfAt(double[] cdf, int n, int i, int t, int k, double lowK, double highK1) {
        return t == k ? lowK : t == k + 1 ? highK1 : cdf[t * n + i];
    }

    /** Makes {@link #spareCdf} and {@link #spareNormaliser} the current ones and the current ones the spares. */
    void swapCdf() {
        double[] current = cdf;
        cdf = spareCdf;
        spareCdf = current;
        double[] normalisers = normaliser;
        normaliser = spareNormaliser;
        spareNormaliser = normalisers;
    }

    /** Copies the common thresholds into every group's row (shared mode). */
    void shareCommonThresholds() {
        int stride = categories + 1;
        for (int g = 0; g < groups; g++) {
            System.arraycopy(common, 0, thresholds, g * stride, stride);
        }
    }

    /** Writes the named parameters of {@code layout} for this state into {@code row}. */
    void writeRow(ParameterLayout layout, double[] row) {
        System.arraycopy(level.coefficient, 0, row, layout.levelOffset(), level.count);
        row[layout.groupMeanIndex()] = level.mean;
        if (layout.groupSdIndex() >= 0) {
            row[layout.groupSdIndex()] = level.sd;
            System.arraycopy(level.intercept, 0, row, layout.groupOffset(), groups);
        }
        int m1 = categories - 1;
        System.arraycopy(common, 1, row, layout.thresholdOffset(), m1);
        if (layout.thresholdSdIndex() >= 0) {
            row[layout.thresholdSdIndex()] = thresholdSd;
            for (int g = 0; g < groups; g++) {
                System.arraycopy(thresholds, g * (categories + 1) + 1, row, layout.groupThresholdOffset() + g * m1, m1);
            }
        }
        if (style != null) {
            System.arraycopy(style.coefficient, 0, row, layout.styleOffset(), style.count);
            row[layout.styleMeanIndex()] = style.mean;
            if (layout.styleSdIndex() >= 0) {
                row[layout.styleSdIndex()] = style.sd;
                System.arraycopy(style.intercept, 0, row, layout.styleGroupOffset(), groups);
            }
        }
        int na = attracted.length;
        for (int j = 0; j < na; j++) {
            row[layout.attractionOffset() + j] = groups > 1 ? attractionMean[attracted[j]] : attraction[attracted[j]];
        }
        if (layout.attractionSdIndex() >= 0) {
            row[layout.attractionSdIndex()] = attractionSd;
            for (int g = 0; g < groups; g++) {
                for (int j = 0; j < na; j++) {
                    row[layout.groupAttractionOffset() + g * na + j] = attraction[g * categories + attracted[j]];
                }
            }
        }
        for (int u = 0; u < layout.perUnitCount(); u++) {
            int j = layout.perUnitColumn(u);
            row[layout.perUnitOffset() + u] = level.coefficient[j] / survey.level().scale(j);
        }
    }

    @Override
    public void save(DataOutput out) throws IOException {
        level.save(out);
        out.writeBoolean(style != null);
        if (style != null) {
            style.save(out);
            out.writeInt(coarse.length);
            out.write(coarse);
        }
        Checkpointed.writeDoubles(out, common);
        Checkpointed.writeDoubles(out, thresholds);
        Checkpointed.writeDouble(out, thresholdSd);
        out.writeInt(attracted.length);
        if (attractionOn()) {
            Checkpointed.writeDoubles(out, attraction);
            Checkpointed.writeDoubles(out, attractionMean);
            Checkpointed.writeDouble(out, attractionSd);
        }
    }

    @Override
    public void restore(DataInput in) throws IOException {
        level.restore(in);
        if (in.readBoolean() != (style != null)) {
            throw new IOException("the checkpoint was made with the coarse class " + (style == null ? "on" : "off"));
        }
        if (style != null) {
            style.restore(in);
            Checkpointed.expectLength(in.readInt(), coarse.length);
            in.readFully(coarse);
        }
        Checkpointed.readDoubles(in, common);
        Checkpointed.readDoubles(in, thresholds);
        thresholdSd = Checkpointed.readDouble(in);
        if (in.readInt() != attracted.length) {
            throw new IOException("the checkpoint was made with another attraction set");
        }
        if (attractionOn()) {
            Checkpointed.readDoubles(in, attraction);
            Checkpointed.readDoubles(in, attractionMean);
            attractionSd = Checkpointed.readDouble(in);
        }
    }
}
