package org.rungs.models.survey;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.util.List;
import org.junit.jupiter.api.Test;

/** In-memory construction, as the simulator uses it. */
class SurveyTest {

    private static final Scale ONE_SEVEN = new Scale(1, 7);

    @Test
    void keepsTheColumnsItIsGiven() {
        byte[] category = {0, 6, 3, 2};
        int[] group = {1, 0, 1, 1};
        double[] weight = {1, 2, 0.5, 0};
        Covariates level = Covariates.fromNumeric(List.of("age"), List.of(new double[] {20, 30, 40, 50}));
        Survey survey = Survey.of(ONE_SEVEN, category, group, List.of("East", "West"), level, Covariates.none(), weight);
        assertSame(category, survey.category());
        assertSame(group, survey.group());
        assertSame(weight, survey.weight());
        assertSame(level, survey.level());
        assertEquals(4, survey.size());
        assertEquals(2, survey.groupCount());
        assertArrayEquals(new int[] {1, 3}, survey.groupSizes());
        assertEquals(ONE_SEVEN, survey.scale());
        assertEquals(Exclusions.none(4), survey.exclusions());
    }

    @Test
    void validatesLengthsAndRanges() {
        List<String> two = List.of("East", "West");
        Covariates none = Covariates.none();
        assertThrows(IllegalArgumentException.class,
                () -> Survey.of(ONE_SEVEN, new byte[] {0, 7}, new int[] {0, 1}, two, none, none, null));
        assertThrows(IllegalArgumentException.class,
                () -> Survey.of(ONE_SEVEN, new byte[] {0, -1}, new int[] {0, 1}, two, none, none, null));
        assertThrows(IllegalArgumentException.class,
                () -> Survey.of(ONE_SEVEN, new byte[] {0, 1}, new int[] {0, 2}, two, none, none, null));
        assertThrows(IllegalArgumentException.class,
                () -> Survey.of(ONE_SEVEN, new byte[] {0, 1}, new int[] {0}, two, none, none, null));
        assertThrows(IllegalArgumentException.class,
                () -> Survey.of(ONE_SEVEN, new byte[] {0, 1}, new int[] {0, 0}, two, none, none, null),
                "group West has no rows");
        assertThrows(IllegalArgumentException.class,
                () -> Survey.of(ONE_SEVEN, new byte[] {0, 1}, new int[] {0, 1}, List.of("A", "A"), none, none, null));
        assertThrows(IllegalArgumentException.class,
                () -> Survey.of(ONE_SEVEN, new byte[] {0, 1}, new int[] {0, 1}, two, none, none, new double[] {1}));
        assertThrows(IllegalArgumentException.class,
                () -> Survey.of(ONE_SEVEN, new byte[] {0, 1}, new int[] {0, 1}, two, none, none, new double[] {1, -1}));
        assertThrows(IllegalArgumentException.class, () -> Survey.of(ONE_SEVEN, new byte[] {0, 1}, new int[] {0, 1},
                two, none, none, new double[] {1, Double.NaN}));
        assertThrows(IllegalArgumentException.class, () -> Survey.of(ONE_SEVEN, new byte[] {0, 1}, new int[] {0, 1},
                two, none, none, new double[] {1, 0}));
        Covariates three = Covariates.fromNumeric(List.of("x"), List.of(new double[] {1, 2, 3}));
        assertThrows(IllegalArgumentException.class,
                () -> Survey.of(ONE_SEVEN, new byte[] {0, 1}, new int[] {0, 1}, two, three, none, null));
        assertThrows(IllegalArgumentException.class,
                () -> Survey.of(ONE_SEVEN, new byte[0], new int[0], List.of(), none, none, null));
    }

    @Test
    void anUnweightedSurveyHasNoWeights() {
        Survey survey = Survey.of(ONE_SEVEN, new byte[] {2}, new int[] {0}, List.of("all"), Covariates.none(),
                Covariates.none(), null);
        assertNull(survey.weight());
    }
}
