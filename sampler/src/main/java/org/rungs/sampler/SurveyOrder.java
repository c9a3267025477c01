package org.rungs.sampler;

import org.rungs.models.survey.Survey;

/**
 * Respondents sorted by group, then by reported category, with the start of every
 * (group, category) run: the threshold update then reads only the respondents next to the
 * threshold it moves, in memory order.
 *
 * @param survey the sorted survey
 * @param start  respondents of group g and category k are rows {@code start[g*M+k] .. start[g*M+k+1]-1}
 */
record SurveyOrder(Survey survey, int[] start) {

    static SurveyOrder of(Survey survey) {
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
        boolean sorted = true;
        for (int i = 1; i < n && sorted; i++) {
            sorted = group[i - 1] * m + category[i - 1] <= group[i] * m + category[i];
        }
        if (sorted) {
            return new SurveyOrder(survey, start);
        }
        int[] next = start.clone();
        int[] order = new int[n];
        for (int i = 0; i < n; i++) {
            order[next[group[i] * m + category[i]]++] = i;
        }
        return new SurveyOrder(survey.permuted(order), start);
    }
}
