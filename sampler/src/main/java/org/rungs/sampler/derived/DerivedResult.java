package org.rungs.sampler.derived;

import java.util.List;
import org.rungs.models.survey.Scale;
import org.rungs.posteriors.Draws;

/**
 * The derived quantities of MODEL.md section 6 beside the observed data they are compared with.
 *
 * @param draws derived scalars per used draw: the fit's chains, {@code usedIterations.length}
 *     iterations each (column names in {@link DerivedQuantities})
 * @param groupLabels group labels in survey order
 * @param scale the rating scale
 * @param usedIterations the kept iterations that were used, the same in every chain
 * @param observedCounts respondents per group and position on the scale (rating - lowest)
 * @param reportedShares weighted share of each position among the group's respondents
 * @param reportedMeans weighted mean reported rating per group
 * @param coarseClass whether the model has the coarse class (and so coarse shares)
 * @param attraction whether the model has number attraction (and so attracted shares and the split
 *     of the mean bias)
 * @param coarseLevels the style levels with a coarse share, in column order
 */
public record DerivedResult(Draws draws, List<String> groupLabels, Scale scale, int[] usedIterations,
        int[][] observedCounts, double[][] reportedShares, double[] reportedMeans, boolean coarseClass,
        boolean attraction, List<StyleLevel> coarseLevels) {

    /** One level of a categorical style covariate, e.g. column {@code education}, level {@code tertiary}. */
    public record StyleLevel(String column, String level) {
    }

    public DerivedResult {
        groupLabels = List.copyOf(groupLabels);
        coarseLevels = List.copyOf(coarseLevels);
    }

    /** Number of respondents of group g. */
    public int respondents(int g) {
        int n = 0;
        for (int count : observedCounts[g]) {
            n += count;
        }
        return n;
    }
}
