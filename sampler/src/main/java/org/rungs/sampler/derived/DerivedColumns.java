package org.rungs.sampler.derived;

import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import org.rungs.models.survey.Covariates;
import org.rungs.models.survey.Scale;

/**
 * Names and positions of the derived scalars of MODEL.md section 6, one column each of the
 * derived draws: per-group means, bias (and its split under number attraction), coarse share and
 * ranks, then the per-group shares and replicated counts by rating, the coarse share by style
 * level, and the average marginal effects. The attraction columns exist only with attraction on,
 * so a fit without it has the columns it always had, in the same order.
 */
final class DerivedColumns {
    final int groups;
    final int categories;
    final int intendedMean;
    final int harmonisedMean;
    final int meanBias;
    /** -1 without number attraction; likewise the two parts of the mean bias and the attracted shares. */
    final int attractedMean;
    final int meanBiasAttraction;
    final int meanBiasRounding;
    /** -1 without the coarse class. */
    final int coarseShare;
    final int rankIntended;
    final int rankHarmonised;
    /** Group g's share of position k is at {@code intendedShare + g*M + k}; likewise the next two. */
    final int intendedShare;
    final int harmonisedShare;
    final int attractedShare;
    final int replicated;
    /** Start of the coarse shares by style level, in the order of {@code levels}. */
    final int coarseShareBy;
    /** Column of each level covariate's average marginal effect. */
    final int[] ame;
    /** Column of each level covariate's effect per unit of the user's column; -1 for indicators. */
    final int[] amePerUnit;
    final List<String> names;

    /** True when only the average marginal effects are columns (every other position is -1). */
    final boolean effectsOnly;

    DerivedColumns(List<String> groupLabels, Scale scale, Covariates level, boolean coarse, boolean attraction,
            List<DerivedResult.StyleLevel> levels) {
        this(groupLabels, scale, level, coarse, attraction, levels, false);
    }

    /** The average marginal effects alone: what the comparison with a plain ordered probit reads. */
    static DerivedColumns effects(List<String> groupLabels, Scale scale, Covariates level) {
        return new DerivedColumns(groupLabels, scale, level, false, false, List.of(), true);
    }

    private DerivedColumns(List<String> groupLabels, Scale scale, Covariates level, boolean coarse, boolean attraction,
            List<DerivedResult.StyleLevel> levels, boolean effectsOnly) {
        this.effectsOnly = effectsOnly;
        groups = groupLabels.size();
        categories = scale.categories();
        List<String> n = new ArrayList<>();
        boolean all = !effectsOnly;
        intendedMean = all ? perGroup(n, "intended_mean", groupLabels) : -1;
        harmonisedMean = all ? perGroup(n, "harmonised_mean", groupLabels) : -1;
        meanBias = all ? perGroup(n, "mean_bias", groupLabels) : -1;
        attractedMean = all && attraction ? perGroup(n, "attracted_mean", groupLabels) : -1;
        meanBiasAttraction = all && attraction ? perGroup(n, "mean_bias_attraction", groupLabels) : -1;
        meanBiasRounding = all && attraction ? perGroup(n, "mean_bias_rounding", groupLabels) : -1;
        coarseShare = all && coarse ? perGroup(n, "coarse_share", groupLabels) : -1;
        rankIntended = all ? perGroup(n, "rank_intended", groupLabels) : -1;
        rankHarmonised = all ? perGroup(n, "rank_harmonised", groupLabels) : -1;
        intendedShare = all ? perRating(n, "intended_share", groupLabels, scale) : -1;
        harmonisedShare = all ? perRating(n, "harmonised_share", groupLabels, scale) : -1;
        attractedShare = all && attraction ? perRating(n, "attracted_share", groupLabels, scale) : -1;
        replicated = all ? perRating(n, "replicated", groupLabels, scale) : -1;
        coarseShareBy = n.size();
        for (DerivedResult.StyleLevel l : levels) {
            n.add(coarseShareByName(l));
        }
        ame = new int[level.count()];
        amePerUnit = new int[level.count()];
        for (int j = 0; j < level.count(); j++) {
            ame[j] = n.size();
            n.add("ame." + level.name(j));
            amePerUnit[j] = -1;
            if (!level.isIndicator(j)) {
                amePerUnit[j] = n.size();
                n.add("ame." + level.name(j) + ".per_unit");
            }
        }
        names = Collections.unmodifiableList(n);
    }

    /** {@code <kind>.<label>}, e.g. {@code intended_mean.North}. */
    static String groupName(String kind, String label) {
        return kind + "." + label;
    }

    /** {@code <kind>.<label>.<rating>}, e.g. {@code intended_share.North.7}. */
    static String ratingName(String kind, String label, int rating) {
        return kind + "." + label + "." + rating;
    }

    static String coarseShareByName(DerivedResult.StyleLevel level) {
        return "coarse_share_by." + level.column() + "=" + level.level();
    }

    private static int perGroup(List<String> n, String kind, List<String> labels) {
        int start = n.size();
        for (String label : labels) {
            n.add(groupName(kind, label));
        }
        return start;
    }

    private static int perRating(List<String> n, String kind, List<String> labels, Scale scale) {
        int start = n.size();
        for (String label : labels) {
            for (int k = scale.lowest(); k <= scale.highest(); k++) {
                n.add(ratingName(kind, label, k));
            }
        }
        return start;
    }
}
