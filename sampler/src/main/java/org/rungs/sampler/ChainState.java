package org.rungs.sampler;

import java.util.Arrays;
import org.rungs.models.ParameterLayout;
import org.rungs.models.survey.Survey;

/**
 * The state of one chain as plain arrays (MODEL.md sections 2 and 3), read by the updates of
 * the same package. Thresholds are stored with their sentinels: group g's boundaries occupy
 * {@code thresholds[g*(M+1) .. g*(M+1)+M]} with {@code -inf} first and {@code +inf} last, so
 * category k of group g lies between {@code thresholds[g*(M+1)+k]} and the next entry.
 */
final class ChainState {
    final Survey survey;
    final byte[] category;
    final int[] group;
    final double[][] level;
    final int size;
    final int groups;
    final int categories;
    final int levelCount;
    final boolean byGroup;

    final double[] beta;
    final double[] alpha;
    double groupMean;
    double groupSd;
    /** Common thresholds c[0..M] with sentinels; they sum to zero over 1..M-1. */
    final double[] common;
    /** Group thresholds c[g,0..M] with sentinels, G rows of M+1; equal to {@link #common} in shared mode. */
    final double[] thresholds;
    double thresholdSd;

    /** Sums of the latent levels per group, written by {@link LatentLevelUpdate}. */
    final double[] latentSumByGroup;
    /** Sums of covariate times latent level, written by {@link LatentLevelUpdate}. */
    final double[] latentCross;

    /** Start of each (group, category) run of the sorted respondents; see {@link SurveyOrder}. */
    final int[] start;

    ChainState(SurveyOrder order, boolean byGroup) {
        Survey survey = order.survey();
        this.start = order.start();
        this.survey = survey;
        this.category = survey.category();
        this.group = survey.group();
        this.size = survey.size();
        this.groups = survey.groupCount();
        this.categories = survey.scale().categories();
        this.levelCount = survey.level().count();
        this.level = new double[levelCount][];
        for (int j = 0; j < levelCount; j++) {
            level[j] = survey.level().column(j);
        }
        this.byGroup = byGroup && groups > 1;
        beta = new double[levelCount];
        alpha = new double[groups];
        common = new double[categories + 1];
        thresholds = new double[groups * (categories + 1)];
        latentSumByGroup = new double[groups];
        latentCross = new double[levelCount];
        common[0] = Double.NEGATIVE_INFINITY;
        common[categories] = Double.POSITIVE_INFINITY;
    }

    /** Linear predictor eta_i = alpha[g_i] + x_i' beta (MODEL.md section 2). */
    double eta(int i) {
        double e = alpha[group[i]];
        for (int j = 0; j < levelCount; j++) {
            e += level[j][i] * beta[j];
        }
        return e;
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
        System.arraycopy(beta, 0, row, layout.levelOffset(), levelCount);
        row[layout.groupMeanIndex()] = groupMean;
        if (layout.groupSdIndex() >= 0) {
            row[layout.groupSdIndex()] = groupSd;
            System.arraycopy(alpha, 0, row, layout.groupOffset(), groups);
        }
        int m1 = categories - 1;
        System.arraycopy(common, 1, row, layout.thresholdOffset(), m1);
        if (layout.thresholdSdIndex() >= 0) {
            row[layout.thresholdSdIndex()] = thresholdSd;
            for (int g = 0; g < groups; g++) {
                System.arraycopy(thresholds, g * (categories + 1) + 1, row, layout.groupThresholdOffset() + g * m1, m1);
            }
        }
        for (int u = 0; u < layout.perUnitCount(); u++) {
            int j = layout.perUnitColumn(u);
            row[layout.perUnitOffset() + u] = beta[j] / survey.level().scale(j);
        }
    }

    @Override
    public String toString() {
        return "ChainState[beta=" + Arrays.toString(beta) + ", groupMean=" + groupMean + ", groupSd=" + groupSd
                + ", common=" + Arrays.toString(common) + ", thresholdSd=" + thresholdSd + "]";
    }
}
