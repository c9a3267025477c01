package org.rungs.sampler;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.rungs.models.survey.Covariates;
import org.rungs.models.survey.Scale;
import org.rungs.models.survey.Survey;
import org.junit.jupiter.api.Test;

class SurveyOrderTest {
    private static final Scale SCALE = new Scale(0, 3);
    private static final int N = 400;

    /** A survey of three groups whose column "id" (a level covariate) numbers the respondents in file order. */
    private static Survey survey(Covariates style, SplittableRandom random) {
        byte[] category = new byte[N];
        int[] group = new int[N];
        double[] id = new double[N];
        for (int i = 0; i < N; i++) {
            category[i] = (byte) random.nextInt(4);
            group[i] = i < 3 ? i : random.nextInt(3);
            id[i] = i;
        }
        Covariates level = Covariates.builder().numeric("id", id).build();
        return Survey.of(SCALE, category, group, List.of("a", "b", "c"), level, style, null);
    }

    private static int[] fileOrder(Survey sorted) {
        Covariates level = sorted.level();
        int[] order = new int[sorted.size()];
        for (int r = 0; r < order.length; r++) {
            order[r] = (int) Math.round(level.column(0)[r] * level.scale(0) + level.centre(0));
        }
        return order;
    }

    /**
     * Categorical style covariates, style runs asked for: rows sorted by group, category, then
     * style row in order of first appearance, stable within that (file order), and start[] marks
     * each cell; without style runs, the file's order within each cell.
     */
    @Test
    void respondentsSharingAStyleRowAreAdjacentWithinTheirCell() {
        SplittableRandom random = new SplittableRandom(3);
        int[] education = new int[N];
        for (int i = 0; i < N; i++) {
            education[i] = random.nextInt(3);
        }
        Covariates style = Covariates.builder().categorical("education", education, List.of("basic", "secondary", "higher"), null).build();
        Survey survey = survey(style, random);
        SurveyOrder order = SurveyOrder.of(survey, true);
        Survey sorted = order.survey();
        int[] from = fileOrder(sorted);
        // the expected order, written out: first appearance of each education level in the file
        List<Integer> firstSeen = new ArrayList<>();
        for (int i = 0; i < N; i++) {
            if (!firstSeen.contains(education[i])) {
                firstSeen.add(education[i]);
            }
        }
        List<Integer> expected = new ArrayList<>();
        for (int g = 0; g < 3; g++) {
            for (int k = 0; k < 4; k++) {
                for (int level : firstSeen) {
                    for (int i = 0; i < N; i++) {
                        if (survey.group()[i] == g && survey.category()[i] == k && education[i] == level) {
                            expected.add(i);
                        }
                    }
                }
            }
        }
        assertArrayEquals(expected.stream().mapToInt(Integer::intValue).toArray(), from);
        for (int g = 0; g < 3; g++) {
            for (int k = 0; k < 4; k++) {
                for (int r = order.start()[g * 4 + k]; r < order.start()[g * 4 + k + 1]; r++) {
                    assertEquals(g, sorted.group()[r]);
                    assertEquals(k, sorted.category()[r]);
                }
            }
        }
        assertEquals(N, order.start()[12]);
        assertSame(sorted, SurveyOrder.of(sorted, true).survey(), "a sorted survey is kept as it is");
        assertFileOrderWithinCells(survey, fileOrder(SurveyOrder.of(survey).survey()));
    }

    /** With more distinct style rows than SurveyOrder.STYLE_ROWS, the order within a cell is the file's. */
    @Test
    void continuousStyleCovariatesKeepTheFileOrderWithinACell() {
        SplittableRandom random = new SplittableRandom(5);
        double[] score = new double[N];
        for (int i = 0; i < N; i++) {
            score[i] = random.nextDouble();
        }
        Covariates style = Covariates.builder().numeric("score", score).build();
        Survey survey = survey(style, random);
        assertFileOrderWithinCells(survey, fileOrder(SurveyOrder.of(survey, true).survey()));
    }

    /** Sorted by (group, category), and within each cell in file order. */
    private static void assertFileOrderWithinCells(Survey survey, int[] from) {
        for (int r = 1; r < N; r++) {
            int before = survey.group()[from[r - 1]] * 4 + survey.category()[from[r - 1]];
            int after = survey.group()[from[r]] * 4 + survey.category()[from[r]];
            assertTrue(before < after || (before == after && from[r - 1] < from[r]), "row " + r);
        }
    }
}
