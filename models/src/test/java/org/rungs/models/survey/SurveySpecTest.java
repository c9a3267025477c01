package org.rungs.models.survey;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;

class SurveySpecTest {

    private static final Scale ZERO_TEN = new Scale(0, 10);

    @Test
    void defaultsToNoGroupNoCovariatesNoWeights() {
        SurveySpec spec = SurveySpec.of("rating", null, ZERO_TEN);
        assertNull(spec.groupColumn());
        assertNull(spec.weightColumn());
        assertEquals(List.of(), spec.levelColumns());
        assertEquals(List.of(), spec.missingCodes());
        assertEquals(Map.of(), spec.missingCodesByColumn());
        assertEquals(List.of("rating"), spec.usedColumns());
    }

    @Test
    void listsUsedColumnsOnceInReadingOrder() {
        SurveySpec spec = SurveySpec.builder("r", ZERO_TEN).group("g").weight("w").level("a", "b").style("b", "c")
                .categorical("c").reference("a", "x").missingCodes("99").missingCodesFor("a", "-1").build();
        assertEquals(List.of("r", "g", "w", "a", "b", "c"), spec.usedColumns());
        assertTrue(spec.declaredCategorical("a"));
        assertTrue(spec.declaredCategorical("c"));
        assertFalse(spec.declaredCategorical("b"));
        assertEquals(Map.of("a", List.of("-1")), spec.missingCodesByColumn());
    }

    @Test
    void rejectsInconsistentRoles() {
        assertThrows(IllegalArgumentException.class, () -> SurveySpec.builder("r", ZERO_TEN).group("r").build());
        assertThrows(IllegalArgumentException.class, () -> SurveySpec.builder("r", ZERO_TEN).level("r").build());
        assertThrows(IllegalArgumentException.class, () -> SurveySpec.builder("r", ZERO_TEN).level("a", "a").build());
        assertThrows(IllegalArgumentException.class, () -> SurveySpec.builder("r", ZERO_TEN).categorical("a").build());
        assertThrows(IllegalArgumentException.class,
                () -> SurveySpec.builder("r", ZERO_TEN).reference("a", "x").build());
        assertThrows(IllegalArgumentException.class,
                () -> SurveySpec.builder("r", ZERO_TEN).missingCodesFor("a", "1").build());
        assertThrows(NullPointerException.class, () -> SurveySpec.of("r", null, null));
    }

    /**
     * Our rule, after an audit where {@code --missing 5} on 0..10 silently dropped 28 real answers
     * of 5: a code for every column may not be a rating of the scale; the rating column's own codes
     * may, since naming the column says it is meant.
     */
    @Test
    void refusesACodeForEveryColumnThatIsARatingOfTheScale() {
        for (String code : List.of("5", "5.0", " 5 ", "05", "0", "10")) {
            IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                    () -> SurveySpec.builder("q1", ZERO_TEN).missingCodes("99", code).build(), code);
            String rating = code.strip().equals("05") ? "5" : code.strip().replace(".0", "");
            assertTrue(e.getMessage().contains("is the rating " + rating + " of the scale 0..10, so it would discard the real"
                    + " answers of " + rating + " in the rating column \"q1\"; expected missing codes off the scale, or"
                    + " --missing-in q1=" + code.strip() + " if answers of " + rating + " really mean missing"), e.getMessage());
        }
        for (String code : List.of("11", "-1", "99", "5.5", "refused")) {
            assertEquals(List.of(code), SurveySpec.builder("q1", ZERO_TEN).missingCodes(code).build().missingCodes());
        }
        assertEquals(Map.of("q1", List.of("5")),
                SurveySpec.builder("q1", ZERO_TEN).missingCodesFor("q1", "5").build().missingCodesByColumn());
    }
}
