package org.rungs.models;

import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import org.rungs.models.survey.Covariates;
import org.rungs.models.survey.Scale;
import org.rungs.models.survey.Survey;

/**
 * The named scalar parameters of a fit, in the column order of {@code draws.csv}. Names follow
 * the README: {@code level.<covariate>} (per internal unit), {@code group_mean}, {@code group_sd},
 * {@code group.<label>}, {@code threshold.<k>} (the latent value above which the answer is at
 * least k), {@code threshold_sd}, {@code threshold.<label>.<k>}, the coarse class's
 * {@code style.<covariate>}, {@code style_mean}, {@code style_sd}, {@code style_group.<label>},
 * the attraction's {@code attraction.<j>} (abar[j]; a[j] itself with one group),
 * {@code attraction_sd}, {@code attraction.<label>.<j>} (a[g,j]), and the derived
 * {@code level.<covariate>.per_unit} on the user's scale of each numeric covariate.
 */
public final class ParameterLayout {
    private final List<String> names;
    private final int levelOffset;
    private final int levelCount;
    private final int groupMeanIndex;
    private final int groupSdIndex;
    private final int groupOffset;
    private final int thresholdOffset;
    private final int thresholdSdIndex;
    private final int groupThresholdOffset;
    private final int styleOffset;
    private final int styleCount;
    private final int styleMeanIndex;
    private final int styleSdIndex;
    private final int styleGroupOffset;
    private final int[] attractionSet;
    private final int attractionOffset;
    private final int attractionSdIndex;
    private final int groupAttractionOffset;
    private final int perUnitOffset;
    private final int[] perUnitColumns;

    private ParameterLayout(Survey survey, ThresholdMode mode, boolean coarseClass, int[] attractionSet) {
        List<String> n = new ArrayList<>();
        Covariates level = survey.level();
        Scale scale = survey.scale();
        int groups = survey.groupCount();
        levelOffset = n.size();
        levelCount = level.count();
        for (int j = 0; j < levelCount; j++) {
            n.add("level." + level.name(j));
        }
        groupMeanIndex = n.size();
        n.add("group_mean");
        if (groups > 1) {
            groupSdIndex = n.size();
            n.add("group_sd");
            groupOffset = n.size();
            for (String label : survey.groupLabels()) {
                n.add("group." + label);
            }
        } else {
            groupSdIndex = -1;
            groupOffset = -1;
        }
        thresholdOffset = n.size();
        for (int k = scale.lowest() + 1; k <= scale.highest(); k++) {
            n.add("threshold." + k);
        }
        if (mode == ThresholdMode.BY_GROUP && groups > 1) {
            thresholdSdIndex = n.size();
            n.add("threshold_sd");
            groupThresholdOffset = n.size();
            for (String label : survey.groupLabels()) {
                for (int k = scale.lowest() + 1; k <= scale.highest(); k++) {
                    n.add("threshold." + label + "." + k);
                }
            }
        } else {
            thresholdSdIndex = -1;
            groupThresholdOffset = -1;
        }
        styleOffset = n.size();
        if (coarseClass) {
            Covariates style = survey.style();
            styleCount = style.count();
            for (int j = 0; j < styleCount; j++) {
                n.add("style." + style.name(j));
            }
            styleMeanIndex = n.size();
            n.add("style_mean");
            if (groups > 1) {
                styleSdIndex = n.size();
                n.add("style_sd");
                styleGroupOffset = n.size();
                for (String label : survey.groupLabels()) {
                    n.add("style_group." + label);
                }
            } else {
                styleSdIndex = -1;
                styleGroupOffset = -1;
            }
        } else {
            styleCount = 0;
            styleMeanIndex = -1;
            styleSdIndex = -1;
            styleGroupOffset = -1;
        }
        this.attractionSet = attractionSet.clone();
        attractionOffset = n.size();
        for (int j : attractionSet) {
            n.add("attraction." + j);
        }
        if (attractionSet.length > 0 && groups > 1) {
            attractionSdIndex = n.size();
            n.add("attraction_sd");
            groupAttractionOffset = n.size();
            for (String label : survey.groupLabels()) {
                for (int j : attractionSet) {
                    n.add("attraction." + label + "." + j);
                }
            }
        } else {
            attractionSdIndex = -1;
            groupAttractionOffset = -1;
        }
        perUnitOffset = n.size();
        List<Integer> numeric = new ArrayList<>();
        for (int j = 0; j < levelCount; j++) {
            if (!level.isIndicator(j)) {
                numeric.add(j);
                n.add("level." + level.name(j) + ".per_unit");
            }
        }
        perUnitColumns = numeric.stream().mapToInt(Integer::intValue).toArray();
        names = Collections.unmodifiableList(n);
    }

    public static ParameterLayout of(Survey survey, ModelSpec spec) {
        return new ParameterLayout(survey, spec.effectiveThresholdMode(survey.groupCount()), spec.styleClasses().coarse(),
                spec.attraction().resolve(survey.scale(), spec.styleClasses()));
    }

    public List<String> names() {
        return names;
    }

    public int size() {
        return names.size();
    }

    public int levelOffset() {
        return levelOffset;
    }

    public int levelCount() {
        return levelCount;
    }

    public int groupMeanIndex() {
        return groupMeanIndex;
    }

    /** -1 with a single group. */
    public int groupSdIndex() {
        return groupSdIndex;
    }

    /** -1 with a single group. */
    public int groupOffset() {
        return groupOffset;
    }

    public int thresholdOffset() {
        return thresholdOffset;
    }

    /** -1 unless thresholds vary by group. */
    public int thresholdSdIndex() {
        return thresholdSdIndex;
    }

    /** -1 unless thresholds vary by group; group g's k-th threshold is at offset + g*(M-1) + k-1. */
    public int groupThresholdOffset() {
        return groupThresholdOffset;
    }

    /** Offset of the style coefficients delta (coarse class on). */
    public int styleOffset() {
        return styleOffset;
    }

    public int styleCount() {
        return styleCount;
    }

    /** -1 unless the coarse class is on. */
    public int styleMeanIndex() {
        return styleMeanIndex;
    }

    /** -1 unless the coarse class is on and there are several groups. */
    public int styleSdIndex() {
        return styleSdIndex;
    }

    /** -1 unless the coarse class is on and there are several groups. */
    public int styleGroupOffset() {
        return styleGroupOffset;
    }

    /** The attraction set A as ratings in increasing order; empty when attraction is off. */
    public int[] attractionSet() {
        return attractionSet.clone();
    }

    /** Offset of abar[j] (a[j] with one group), one per number of A in its order. */
    public int attractionOffset() {
        return attractionOffset;
    }

    /** -1 unless attraction is on and there are several groups. */
    public int attractionSdIndex() {
        return attractionSdIndex;
    }

    /** -1 unless attraction is on and there are several groups; a[g,j] at offset + g*|A| + (position of j in A). */
    public int groupAttractionOffset() {
        return groupAttractionOffset;
    }

    public int perUnitOffset() {
        return perUnitOffset;
    }

    /** How many level covariates have a per-unit coefficient (the numeric ones). */
    public int perUnitCount() {
        return perUnitColumns.length;
    }

    /** The level covariate (by index) of the u-th per-unit coefficient. */
    public int perUnitColumn(int u) {
        return perUnitColumns[u];
    }
}
