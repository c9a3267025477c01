package org.rungs.models.survey;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** Empty cells, NA and declared codes exclude a row and are counted per column. */
class MissingValuesTest {

    @TempDir
    Path dir;

    private static final Scale ZERO_TEN = new Scale(0, 10);

    private static final String FILE = String.join("\n",
            "rating,region,income,w",
            "5,A,100,1",             // used
            ",A,200,1",              // rating empty
            "NA,B,300,1",            // rating NA
            "98,B,400,1",            // rating code 98
            "98.0,A,500,1",          // 98.0 matches the code 98 numerically
            "7,,600,1",              // region empty
            "7,99,700,1",            // region code 99 (global list applies to every column)
            "6,B,-1,1",              // income per-column code -1
            "6,B,-1.00,1",           // matches -1 numerically
            "4,B,refused,1",         // textual global code
            "99,A,NA,1",             // rating and income both missing: counted under each
            "3,B,800,\"\"",          // weight empty (quoted)
            "2,A,900, NA ",          // NA with spaces around
            "8,B,1000,2",            // used
            "");

    private SurveySpec spec() {
        return SurveySpec.builder("rating", ZERO_TEN).group("region").level("income").weight("w")
                .missingCodes("98", "99", "refused").missingCodesFor("income", "-1").build();
    }

    @Test
    void excludesRowsMissingAUsedColumnAndCountsThemPerColumn() throws Exception {
        Survey survey = SurveyReader.read(SurveyFiles.write(dir, "m.csv", FILE), spec());

        assertArrayEquals(new int[] {5, 8}, SurveyFiles.ratings(survey));
        assertArrayEquals(new double[] {1, 2}, survey.weight(), 0.0);
        assertEquals(List.of("A", "B"), survey.groupLabels());
        Exclusions exclusions = survey.exclusions();
        assertEquals(14, exclusions.rowsRead());
        assertEquals(2, exclusions.rowsUsed());
        assertEquals(12, exclusions.rowsExcluded());
        Map<String, Long> expected = new LinkedHashMap<>();
        expected.put("rating", 5L);
        expected.put("region", 2L);
        expected.put("w", 2L);
        expected.put("income", 4L);
        assertEquals(expected, exclusions.missingByColumn());
        assertEquals(List.of("rating", "region", "w", "income"), List.copyOf(exclusions.missingByColumn().keySet()));
    }

    @Test
    void describesTheExclusionsInOneParagraph() throws Exception {
        Survey survey = SurveyReader.read(SurveyFiles.write(dir, "m.csv", FILE), spec());
        assertEquals("Read 14 rows; used 2 and excluded 12 for missing values (5 missing \"rating\", 2 missing"
                + " \"region\", 2 missing \"w\", 4 missing \"income\"; a row missing several columns is counted"
                + " under each).", survey.exclusions().describe());
        assertEquals("Read 3 rows; used all of them (no missing values in the columns used).",
                Exclusions.none(3).describe());
    }

    @Test
    void ignoresMissingValuesInColumnsNotUsed() throws Exception {
        Path file = SurveyFiles.write(dir, "unused.csv", "rating,other\n1,\n2,NA\n");
        Survey survey = SurveyReader.read(file, SurveySpec.of("rating", null, ZERO_TEN));
        assertEquals(2, survey.size());
        assertEquals(Map.of("rating", 0L), survey.exclusions().missingByColumn());
        assertNull(survey.weight());
    }

    @Test
    void aCodeOutsideTheScaleIsAnErrorUnlessDeclared() throws Exception {
        Path file = SurveyFiles.write(dir, "codes.csv", "rating\n3\n88\n");
        SurveyInputException e = assertThrows(SurveyInputException.class,
                () -> SurveyReader.read(file, SurveySpec.of("rating", null, ZERO_TEN)));
        assertEquals(3, e.row());
        Survey survey = SurveyReader.read(file, SurveySpec.builder("rating", ZERO_TEN).missingCodes("88").build());
        assertEquals(1, survey.size());
        Survey perColumn = SurveyReader.read(file,
                SurveySpec.builder("rating", ZERO_TEN).missingCodesFor("rating", "88").build());
        assertEquals(1, perColumn.size());
    }

    @Test
    void aDeclaredCodeMatchesOnlyWholeValues() throws Exception {
        // "9" must not match the code 99, nor "1" the code "-1"
        Path file = SurveyFiles.write(dir, "whole.csv", "rating,x\n9,1\n2,3\n");
        Survey survey = SurveyReader.read(file,
                SurveySpec.builder("rating", ZERO_TEN).level("x").missingCodes("99", "-1").build());
        assertEquals(2, survey.size());
    }

    /**
     * Our rule, after an audit where {@code --missing 1} dropped the groups "1", "01" and "1.0"
     * (here 12, as a code for every column may not be a rating of the scale)
     * (120 of 160 rows): in a column of text a code matches only the same text, after the blanks
     * at the ends are cut; NA and empty cells stay missing.
     */
    @Test
    void aCodeMatchesGroupLabelsOnlyAsWritten() throws Exception {
        Path file = SurveyFiles.write(dir, "labels.csv",
                "rating,region\n1,12\n2,012\n3,12.0\n4, 12 \n5,+12\n6,NA\n7,\n8,012\n");
        Survey survey = SurveyReader.read(file,
                SurveySpec.builder("rating", ZERO_TEN).group("region").missingCodes("12").build());
        assertEquals(List.of("012", "12.0", "+12"), survey.groupLabels());
        assertArrayEquals(new int[] {2, 3, 5, 8}, SurveyFiles.ratings(survey));
        assertEquals(4L, survey.exclusions().missingByColumn().get("region"));
    }

    @Test
    void aCodeMatchesTheLevelsOfACategoricalCovariateOnlyAsWritten() throws Exception {
        Path file = SurveyFiles.write(dir, "levels.csv", "rating,wave\n1,12\n2,012\n3,12.0\n4,2\n5,012\n");
        Survey survey = SurveyReader.read(file,
                SurveySpec.builder("rating", ZERO_TEN).level("wave").categorical("wave").missingCodes("12").build());
        assertArrayEquals(new int[] {2, 3, 4, 5}, SurveyFiles.ratings(survey));
        assertEquals("012", survey.level().referenceLevel(0));
        assertEquals(List.of("wave=12.0", "wave=2"), List.of(survey.level().name(0), survey.level().name(1)));
    }

    @Test
    void aCodeStillMatchesNumbersInAColumnOfNumbers() throws Exception {
        Path file = SurveyFiles.write(dir, "numbers.csv", "rating,income\n1,12\n2,012\n3,12.0\n4,2\n5,3\n");
        Survey survey = SurveyReader.read(file,
                SurveySpec.builder("rating", ZERO_TEN).level("income").missingCodes("12").build());
        assertArrayEquals(new int[] {4, 5}, SurveyFiles.ratings(survey));
    }

    /**
     * An undeclared column is text only if its values in the rows used are: a number there that a
     * code matched only as a number ("012" for the code 12) would be kept if the column is text, so
     * the reader stops rather than guess.
     */
    @Test
    void aNumberThatMatchesACodeOnlyAsANumberAmongTextIsRefusedNamingItsRow() throws Exception {
        Path file = SurveyFiles.write(dir, "mixed.csv", "rating,area\n1,urban\n2,12\n3,rural\n4,012\n5,urban\n");
        SurveyInputException e = assertThrows(SurveyInputException.class, () -> SurveyReader.read(file,
                SurveySpec.builder("rating", ZERO_TEN).level("area").missingCodes("12").build()));
        assertEquals(file + ", row 5, column \"area\": \"012\" equals a missing code only as a number, but the column's"
                + " other values are text (row 2: \"urban\"), and in a column of text a missing code matches only the"
                + " same text; expected --categorical area to read \"012\" as a level, or the code as written in the file"
                + " (--missing-in area=012) to make it missing", e.getMessage());
        Survey declared = SurveyReader.read(file,
                SurveySpec.builder("rating", ZERO_TEN).level("area").missingCodes("12").categorical("area").build());
        assertArrayEquals(new int[] {1, 3, 4, 5}, SurveyFiles.ratings(declared));
        Survey asWritten = SurveyReader.read(file,
                SurveySpec.builder("rating", ZERO_TEN).level("area").missingCodes("12").missingCodesFor("area", "012").build());
        assertArrayEquals(new int[] {1, 3, 5}, SurveyFiles.ratings(asWritten));
    }

    /** Our rule: answers a code of the rating column made missing are counted per rating, for the fit's warning. */
    @Test
    void countsTheAnswersACodeOfTheRatingColumnMadeMissing() throws Exception {
        Path file = SurveyFiles.write(dir, "fives.csv", "rating\n5\n7\n5.0\n 5 \n99\nNA\n6\n");
        Survey survey = SurveyReader.read(file,
                SurveySpec.builder("rating", ZERO_TEN).missingCodesFor("rating", "5", "99").build());
        assertArrayEquals(new int[] {7, 6}, SurveyFiles.ratings(survey));
        assertEquals(Map.of(5, 3L), survey.exclusions().answersDeclaredMissing());
        Survey kept = SurveyReader.read(file, SurveySpec.builder("rating", ZERO_TEN).missingCodesFor("rating", "99").build());
        assertArrayEquals(new int[] {5, 7, 5, 5, 6}, SurveyFiles.ratings(kept));
        assertEquals(Map.of(), kept.exclusions().answersDeclaredMissing());
    }
}
