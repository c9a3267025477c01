package org.rungs.sampler.derived;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.rungs.models.survey.Covariates;

/**
 * The respondents split by the levels of each categorical style covariate, the reference level
 * included (the coarse share by level of MODEL.md 6). Level slots are numbered over all columns:
 * a column's reference first, then its indicator levels in covariate order.
 */
final class StylePartition {
    final List<DerivedResult.StyleLevel> levels;
    /** {@code slotOf[s][i]}: the slot of respondent i's level of the s-th categorical column. */
    final int[][] slotOf;
    /** Total survey weight (respondents when unweighted) of each slot. */
    final double[] slotWeight;

    private StylePartition(List<DerivedResult.StyleLevel> levels, int[][] slotOf, double[] slotWeight) {
        this.levels = List.copyOf(levels);
        this.slotOf = slotOf;
        this.slotWeight = slotWeight;
    }

    static StylePartition empty() {
        return new StylePartition(List.of(), new int[0][], new double[0]);
    }

    static StylePartition of(Covariates style, int respondents, double[] weight) {
        Map<String, List<Integer>> members = new LinkedHashMap<>();
        for (int j = 0; j < style.count(); j++) {
            if (style.isIndicator(j)) {
                members.computeIfAbsent(style.sourceColumn(j), c -> new ArrayList<>()).add(j);
            }
        }
        List<DerivedResult.StyleLevel> levels = new ArrayList<>();
        int[][] slotOf = new int[members.size()][];
        int s = 0;
        for (Map.Entry<String, List<Integer>> column : members.entrySet()) {
            String name = column.getKey();
            List<Integer> indicators = column.getValue();
            int reference = levels.size();
            levels.add(new DerivedResult.StyleLevel(name, style.referenceLevel(indicators.get(0))));
            int[] slot = new int[respondents];
            Arrays.fill(slot, reference);
            for (int j : indicators) {
                int own = levels.size();
                levels.add(new DerivedResult.StyleLevel(name, style.name(j).substring(name.length() + 1)));
                double[] x = style.column(j);
                for (int i = 0; i < respondents; i++) {
                    if (x[i] == 1) {
                        slot[i] = own;
                    }
                }
            }
            slotOf[s++] = slot;
        }
        double[] slotWeight = new double[levels.size()];
        for (int[] slot : slotOf) {
            for (int i = 0; i < respondents; i++) {
                slotWeight[slot[i]] += weight == null ? 1 : weight[i];
            }
        }
        return new StylePartition(levels, slotOf, slotWeight);
    }
}
