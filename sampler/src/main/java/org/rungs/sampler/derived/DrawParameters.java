package org.rungs.sampler.derived;

import java.util.Arrays;
import org.rungs.models.ParameterLayout;
import org.rungs.posteriors.Draws;

/**
 * The model's parameters at one posterior draw, unpacked from the draws' columns into the arrays
 * the likelihood reads (MODEL.md 2 to 4b): group levels, level and style coefficients, each
 * group's thresholds with sentinels (G rows of M+1, as in the sampler's chain state), the common
 * thresholds, the coarse class's intercepts and each group's attractions (0 outside the set).
 */
final class DrawParameters {
    final double[] alpha;
    final double[] beta;
    final double[] thresholds;
    final double[] common;
    final double[] gamma;
    final double[] delta;
    /** a[g,k], a row of M per group, 0 outside the attraction set; exp(a[g,k]) in G rows of M. */
    final double[][] attraction;
    final double[] tilt;
    private final ParameterLayout layout;
    private final int groups;
    private final int categories;
    private final boolean byGroup;
    private final boolean coarse;
    /** Positions (rating - L) of the attraction set, in the order of the layout. */
    private final int[] attracted;

    DrawParameters(ParameterLayout layout, int groups, int categories, int lowest, boolean coarse) {
        this.layout = layout;
        this.groups = groups;
        this.categories = categories;
        this.byGroup = layout.groupThresholdOffset() >= 0;
        this.coarse = coarse;
        int[] set = layout.attractionSet();
        this.attracted = new int[set.length];
        for (int j = 0; j < set.length; j++) {
            attracted[j] = set[j] - lowest;
        }
        alpha = new double[groups];
        gamma = new double[groups];
        beta = new double[layout.levelCount()];
        delta = new double[layout.styleCount()];
        thresholds = new double[groups * (categories + 1)];
        common = new double[categories + 1];
        common[0] = Double.NEGATIVE_INFINITY;
        common[categories] = Double.POSITIVE_INFINITY;
        for (int g = 0; g < groups; g++) {
            thresholds[g * (categories + 1)] = Double.NEGATIVE_INFINITY;
            thresholds[g * (categories + 1) + categories] = Double.POSITIVE_INFINITY;
        }
        attraction = new double[groups][categories];
        tilt = new double[groups * categories];
        Arrays.fill(tilt, 1);
    }

    /** Reads draw (chain, iteration). */
    void read(Draws draws, int chain, int iteration) {
        int m = categories;
        for (int g = 0; g < groups; g++) {
            alpha[g] = draws.get(layout.groupOffset() >= 0 ? layout.groupOffset() + g : layout.groupMeanIndex(),
                    chain, iteration);
        }
        for (int j = 0; j < beta.length; j++) {
            beta[j] = draws.get(layout.levelOffset() + j, chain, iteration);
        }
        for (int t = 1; t < m; t++) {
            common[t] = draws.get(layout.thresholdOffset() + t - 1, chain, iteration);
        }
        for (int g = 0; g < groups; g++) {
            for (int t = 1; t < m; t++) {
                thresholds[g * (m + 1) + t] = byGroup
                        ? draws.get(layout.groupThresholdOffset() + g * (m - 1) + t - 1, chain, iteration)
                        : common[t];
            }
        }
        if (coarse) {
            for (int g = 0; g < groups; g++) {
                gamma[g] = draws.get(layout.styleGroupOffset() >= 0 ? layout.styleGroupOffset() + g
                        : layout.styleMeanIndex(), chain, iteration);
            }
            for (int j = 0; j < delta.length; j++) {
                delta[j] = draws.get(layout.styleOffset() + j, chain, iteration);
            }
        }
        // a[g,j] with several groups, else the common a[j] (ParameterLayout)
        int groupAttraction = layout.groupAttractionOffset();
        for (int g = 0; g < groups; g++) {
            for (int j = 0; j < attracted.length; j++) {
                int column = groupAttraction >= 0 ? groupAttraction + g * attracted.length + j : layout.attractionOffset() + j;
                double a = draws.get(column, chain, iteration);
                attraction[g][attracted[j]] = a;
                tilt[g * m + attracted[j]] = Math.exp(a);
            }
        }
    }
}
