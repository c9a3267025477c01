package org.rungs.models.survey;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** Categorical covariates become 0/1 indicators against a reference level (MODEL.md section 1). */
class CategoricalCovariatesTest {

    @TempDir
    Path dir;

    private static final Scale ZERO_TEN = new Scale(0, 10);

    @Test
    void aColumnWithTextBecomesIndicatorsAgainstTheMostFrequentLevel() throws Exception {
        Path file = SurveyFiles.write(dir, "edu.csv", "rating,education\n1,primary\n2,secondary\n3,tertiary\n"
                + "4,secondary\n5,primary\n6,secondary\n");
        Survey survey = SurveyReader.read(file, SurveySpec.builder("rating", ZERO_TEN).style("education").build());
        Covariates style = survey.style();

        assertEquals(2, style.count());
        assertEquals("education=primary", style.name(0));
        assertEquals("education=tertiary", style.name(1));
        assertArrayEquals(new double[] {1, 0, 0, 0, 1, 0}, style.column(0), 0.0);
        assertArrayEquals(new double[] {0, 0, 1, 0, 0, 0}, style.column(1), 0.0);
        for (int j = 0; j < 2; j++) {
            assertTrue(style.isIndicator(j));
            assertEquals("education", style.sourceColumn(j));
            assertEquals("secondary", style.referenceLevel(j));
            assertEquals(0.0, style.centre(j), 0.0);
            assertEquals(1.0, style.scale(j), 0.0);
        }
        assertEquals(0, survey.level().count());
    }

    @Test
    void tiesForMostFrequentGoToTheLevelSeenFirst() throws Exception {
        Path file = SurveyFiles.write(dir, "tie.csv", "rating,area\n1,rural\n2,urban\n3,urban\n4,rural\n5,town\n");
        Survey survey = SurveyReader.read(file, SurveySpec.builder("rating", ZERO_TEN).level("area").build());
        assertEquals("rural", survey.level().referenceLevel(0));
        assertEquals(List.of("area=urban", "area=town"), List.of(survey.level().name(0), survey.level().name(1)));
    }

    @Test
    void theUserMayNameTheReferenceLevel() throws Exception {
        Path file = SurveyFiles.write(dir, "ref.csv", "rating,area\n1,rural\n2,urban\n3,urban\n4,town\n");
        Survey survey = SurveyReader.read(file,
                SurveySpec.builder("rating", ZERO_TEN).level("area").reference("area", "town").build());
        assertEquals("town", survey.level().referenceLevel(0));
        assertEquals(List.of("area=rural", "area=urban"), List.of(survey.level().name(0), survey.level().name(1)));
    }

    @Test
    void anUnknownReferenceLevelListsTheLevelsFound() {
        Path file = SurveyFiles.write(dir, "ref.csv", "rating,area\n1,rural\n2,urban\n");
        SurveyInputException e = assertThrows(SurveyInputException.class, () -> SurveyReader.read(file,
                SurveySpec.builder("rating", ZERO_TEN).level("area").reference("area", "city").build()));
        assertEquals(file + ", column \"area\": the reference level \"city\" of \"area\" does not occur among its"
                + " levels \"rural\" and \"urban\"; expected one of the levels found", e.getMessage());
    }

    @Test
    void aDeclaredCategoricalNumericColumnKeepsItsLevelsAsWritten() throws Exception {
        Path file = SurveyFiles.write(dir, "codes.csv", "rating,wave\n1,2018\n2,2020\n3,2020\n4,2018.0\n");
        Survey survey = SurveyReader.read(file,
                SurveySpec.builder("rating", ZERO_TEN).level("wave").categorical("wave").build());
        assertEquals(List.of("wave=2018", "wave=2018.0"), List.of(survey.level().name(0), survey.level().name(1)));
        assertEquals("2020", survey.level().referenceLevel(0));
    }

    @Test
    void aNumberColumnWithATextValueIsRefusedNamingTheValueAndAFormerNumber() throws Exception {
        Path file = SurveyFiles.write(dir, "mixed.csv", "rating,age\n1,34\n2,51\n3,refused\n4,27\n");
        SurveyInputException e = assertThrows(SurveyInputException.class,
                () -> SurveyReader.read(file, SurveySpec.builder("rating", ZERO_TEN).level("age").build()));
        assertEquals(4, e.row());
        assertEquals("age", e.column());
        assertTrue(e.getMessage().contains("\"refused\" is text, but the column's other values are numbers (row 2: 34)"),
                e.getMessage());
        assertTrue(e.getMessage().contains("--missing-in age=refused"), e.getMessage());
        assertTrue(e.getMessage().contains("--categorical age"), e.getMessage());
    }

    @Test
    void aNumberColumnWithATextValueIsCategoricalWhenDeclared() throws Exception {
        Path file = SurveyFiles.write(dir, "mixed.csv", "rating,children\n1,0\n2,1\n3,none\n4,1\n");
        Survey survey = SurveyReader.read(file,
                SurveySpec.builder("rating", ZERO_TEN).level("children").categorical("children").build());
        assertEquals("1", survey.level().referenceLevel(0));
        assertEquals(List.of("children=0", "children=none"), List.of(survey.level().name(0), survey.level().name(1)));
    }

    @Test
    void aTextValueDeclaredMissingLeavesTheColumnNumeric() throws Exception {
        Path file = SurveyFiles.write(dir, "mixed.csv", "rating,age\n1,34\n2,51\n3,refused\n4,27\n");
        Survey survey = SurveyReader.read(file,
                SurveySpec.builder("rating", ZERO_TEN).level("age").missingCodesFor("age", "refused").build());
        assertEquals(3, survey.size());
        assertFalse(survey.level().isIndicator(0));
    }

    @Test
    void aLevelSeenOnlyInExcludedRowsIsNoLevel() throws Exception {
        Path file = SurveyFiles.write(dir, "excluded.csv", "rating,area\n1,rural\nNA,town\n3,urban\n");
        Survey survey = SurveyReader.read(file, SurveySpec.builder("rating", ZERO_TEN).level("area").build());
        assertEquals(1, survey.level().count());
        assertEquals("area=urban", survey.level().name(0));
    }

    @Test
    void levelAndStyleMayShareAColumn() throws Exception {
        Path file = SurveyFiles.write(dir, "shared.csv", "rating,education,age\n1,low,20\n2,high,30\n3,low,45\n");
        Survey survey = SurveyReader.read(file,
                SurveySpec.builder("rating", ZERO_TEN).level("age", "education").style("education").build());
        assertEquals(List.of("age", "education=high"), List.of(survey.level().name(0), survey.level().name(1)));
        assertFalse(survey.level().isIndicator(0));
        assertNull(survey.level().referenceLevel(0));
        assertArrayEquals(survey.level().column(1), survey.style().column(0), 0.0);
    }

    @Test
    void tooManyLevelsIsAnError() {
        StringBuilder text = new StringBuilder("rating,city\n");
        for (int i = 0; i <= SurveyReader.MAX_LEVELS; i++) {
            text.append(i % 11).append(",city").append(i).append('\n');
        }
        Path file = SurveyFiles.write(dir, "cities.csv", text.toString());
        SurveyInputException e = assertThrows(SurveyInputException.class,
                () -> SurveyReader.read(file, SurveySpec.builder("rating", ZERO_TEN).level("city").build()));
        assertEquals("city", e.column());
        assertEquals(SurveyReader.MAX_LEVELS + 2, e.row());
        assertTrue(e.getMessage().contains("(so it would be categorical) and more than 200 distinct values"),
                e.getMessage());
    }

    @Test
    void manyDistinctNumbersStayNumeric() throws Exception {
        StringBuilder text = new StringBuilder("rating,income\n");
        for (int i = 0; i < 3 * SurveyReader.MAX_LEVELS; i++) {
            text.append(i % 11).append(',').append(1000 + i).append('\n');
        }
        Survey survey = SurveyReader.read(SurveyFiles.write(dir, "income.csv", text.toString()),
                SurveySpec.builder("rating", ZERO_TEN).level("income").build());
        assertFalse(survey.level().isIndicator(0));
        assertEquals(1000 + (3 * SurveyReader.MAX_LEVELS - 1) / 2.0, survey.level().centre(0), 1e-9);
    }

    @Test
    void theBuilderTakesLevelCodes() {
        Covariates c = Covariates.builder()
                .categorical("education", new int[] {0, 1, 1, 2, 1, 0}, List.of("low", "mid", "high"), null)
                .build();
        assertEquals("mid", c.referenceLevel(0));
        assertEquals(List.of("education=low", "education=high"), List.of(c.name(0), c.name(1)));
        assertArrayEquals(new double[] {0, 0, 0, 1, 0, 0}, c.column(1), 0.0);
        assertEquals(6, c.rows());
        assertThrows(IllegalArgumentException.class, () -> Covariates.builder()
                .categorical("e", new int[] {0, 0}, List.of("low", "mid"), null).build());
        assertThrows(IllegalArgumentException.class, () -> Covariates.builder()
                .categorical("e", new int[] {0, 3}, List.of("low", "mid"), null).build());
    }
}
