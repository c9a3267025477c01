package org.rungs.sampler;

import java.util.Arrays;
import org.rungs.models.survey.Covariates;
import org.rungs.models.survey.Survey;

/**
 * Respondents sorted by group, then by reported category, with the start of every
 * (group, category) run: the threshold update then reads only the respondents next to the
 * threshold it moves, in memory order. Under number attraction, within a run, when the style
 * covariates take at most {@link #STYLE_ROWS} distinct rows (categorical ones, say), respondents
 * sharing a row are placed together, in order of the row's first appearance: they share the
 * coarse class's probit, whose normal cdf the passes over the respondents then compute once per
 * run of equal values. On the attraction demo that took 13% off a sweep (one thread, 18.6-18.9
 * against 16.0-16.4 ms), without attraction 1 to 2%; there the file's order is kept, and with it
 * the chains of earlier releases bit for bit.
 *
 * @param survey the sorted survey
 * @param start  respondents of group g and category k are rows {@code start[g*M+k] .. start[g*M+k+1]-1}
 */
record SurveyOrder(Survey survey, int[] start) {
    /** Above this many distinct rows of style covariates the order within a run is the file's. */
    static final int STYLE_ROWS = 64;

    /** Sorted by (group, category), the file's order within each run. */
    static SurveyOrder of(Survey survey) {
        return of(survey, false);
    }

    /** As {@link #of(Survey)}, and with {@code styleRuns} respondents sharing a style row together within each run. */
    static SurveyOrder of(Survey survey, boolean styleRuns) {
        int m = survey.scale().categories();
        int cells = survey.groupCount() * m;
        int[] start = new int[cells + 1];
        byte[] category = survey.category();
        int[] group = survey.group();
        int n = survey.size();
        for (int i = 0; i < n; i++) {
            start[group[i] * m + category[i] + 1]++;
        }
        for (int c = 0; c < cells; c++) {
            start[c + 1] += start[c];
        }
        int[] row = styleRuns ? styleRows(survey.style(), n) : null;
        int rows = row == null ? 1 : Arrays.stream(row).max().orElse(0) + 1;
        boolean sorted = true;
        for (int i = 1; i < n && sorted; i++) {
            sorted = key(group, category, row, m, rows, i - 1) <= key(group, category, row, m, rows, i);
        }
        if (sorted) {
            return new SurveyOrder(survey, start);
        }
        // a stable counting sort on (group, category, style row)
        long buckets = (long) cells * rows;
        int[] next = new int[(int) buckets + 1];
        for (int i = 0; i < n; i++) {
            next[(int) key(group, category, row, m, rows, i) + 1]++;
        }
        for (int b = 0; b < buckets; b++) {
            next[b + 1] += next[b];
        }
        int[] order = new int[n];
        for (int i = 0; i < n; i++) {
            order[next[(int) key(group, category, row, m, rows, i)]++] = i;
        }
        return new SurveyOrder(survey.permuted(order), start);
    }

    private static long key(int[] group, byte[] category, int[] row, int m, int rows, int i) {
        return ((long) group[i] * m + category[i]) * rows + (row == null ? 0 : row[i]);
    }

    /**
     * Per respondent, the number of its style-covariate row among the distinct rows in order of
     * first appearance; null without style covariates or with more than {@link #STYLE_ROWS} rows.
     */
    private static int[] styleRows(Covariates style, int n) {
        int count = style.count();
        if (count == 0) {
            return null;
        }
        double[][] columns = new double[count][];
        for (int j = 0; j < count; j++) {
            columns[j] = style.column(j);
        }
        StyleRows rows = StyleRows.of(columns, n, STYLE_ROWS);
        return rows == null ? null : rows.number();
    }
}
